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
// Brent's relative tolerance for kMinimiserBits: it stops within about 2 (tol |x| + tol / 4) of
// the maximum, so an answer within a few such steps of an end is compared with the end itself.
const double kMinimiserTolerance = std::ldexp(1.0, 1 - kMinimiserBits);

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
  for (double edge : {lower, upper}) {
    const double near = 8.0 * kMinimiserTolerance * (std::fabs(edge) + 1.0);
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
