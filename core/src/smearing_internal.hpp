// Constants and tables shared by the construction (smearing_build.cpp) and the queries
// (smearing.cpp) of the smearing mean; see powerback/smearing.hpp for what they bound.
#pragma once

#include <cstddef>
#include <limits>

namespace powerback {
namespace smearing_detail {

constexpr int K = 26;                 // series terms kept
constexpr std::size_t kLeaf = 32;     // residuals at most in a leaf
constexpr double kRho = 0.9;          // node half-width / distance to a sign change, at most
constexpr double kExpReach = 2.0;     // half-width limit for exponential-type inverses
constexpr double kLogisticReach = 0.25 * 3.141592653589793;  // a quarter of the pole distance
constexpr double kEps = 1.1102230246251565e-16;               // 2^-53
constexpr double kConditioning = 64.0;  // sum |terms| / smallest value accepted in a node
constexpr int kMaxDepth = 250;
constexpr int kZeroDegree = 10;       // degree of the Yeo-Johnson polynomials at z = 0
constexpr double kInf = std::numeric_limits<double>::infinity();

struct Tables {
  double choose[K + 1][K + 1];  // C(k, i)
  double inv_fact[K + 1];       // 1 / k!
  Tables() {
    for (int k = 0; k <= K; ++k) {
      choose[k][0] = choose[k][k] = 1.0;
      for (int i = 1; i < k; ++i) choose[k][i] = choose[k - 1][i - 1] + choose[k - 1][i];
    }
    inv_fact[0] = 1.0;
    for (int k = 1; k <= K; ++k) inv_fact[k] = inv_fact[k - 1] / k;
  }
};
inline const Tables& tables() {
  static const Tables t;
  return t;
}


}  // namespace smearing_detail
}  // namespace powerback
