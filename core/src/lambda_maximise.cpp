// The one maximiser of a lambda profile (see lambda_maximise.hpp).
#include "powerback/lambda_maximise.hpp"

#include <boost/math/tools/minima.hpp>
#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>

namespace powerback {
namespace {

constexpr std::uintmax_t kMaxIter = 200;
// Half the mantissa: the best a maximum can be located to (about 1.5e-8 relative).
constexpr int kMinimiserBits = std::numeric_limits<double>::digits / 2;
// An answer this close to an end (relative to the range's width) is compared with the end.
constexpr double kEdgeFraction = 1e-4;

}  // namespace

ProfileMaximum maximise_profile(const std::function<double(double)>& loglik, double lower,
                                double upper) {
  const auto neg = [&](double l) { return -loglik(l); };
  std::uintmax_t it = kMaxIter;
  const std::pair<double, double> best =
      boost::math::tools::brent_find_minima(neg, lower, upper, kMinimiserBits, it);
  ProfileMaximum out;
  out.converged = it < kMaxIter;
  out.lambda = best.first;
  out.loglik = -best.second;
  const double near = kEdgeFraction * (upper - lower);
  for (double edge : {lower, upper}) {
    if (std::fabs(out.lambda - edge) < near) {
      const double le = loglik(edge);
      if (le >= out.loglik) {
        out.lambda = edge;
        out.loglik = le;
      }
      out.at_bound = true;
    }
  }
  return out;
}

}  // namespace powerback
