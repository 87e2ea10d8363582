// The one maximiser of a lambda profile (see lambda_maximise.hpp).
#include "powerback/lambda_maximise.hpp"

#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/tools/minima.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <cstdint>
#include <limits>
#include <utility>

#include "powerback/cancel.hpp"

namespace powerback {
namespace {

constexpr std::uintmax_t kMaxIter = 200;
// Half the mantissa: the best a maximum can be located to (about 1.5e-8 relative).
constexpr int kMinimiserBits = std::numeric_limits<double>::digits / 2;
// Brent's relative tolerance for kMinimiserBits: it stops within about 2 (tol |x| + tol / 4) of
// the maximum, so an answer within a few such steps of an end is compared with the end itself.
const double kMinimiserTolerance = std::ldexp(1.0, 1 - kMinimiserBits);
// Interval endpoints are simple roots, so they can be found much more tightly.
constexpr int kRootBits = 40;

using Fn = std::function<double(double)>;

struct Side {
  double end;
  bool open, converged;
};

// Where the quadratic approximation of the profile at lhat puts the interval's half-width:
// sqrt(q / curvature), the curvature from a central difference. Only a starting guess for the
// bracketing below, which never relies on it being right.
double predicted_half_width(const Fn& g, double lhat, double half_q, double lower, double upper) {
  const double width = upper - lower;
  double d = 1e-2 * width, h = 0.25 * width;
  for (int pass = 0; pass < 2; ++pass) {
    const double a = std::max(lower, lhat - d), b = std::min(upper, lhat + d);
    if (!(b > a)) break;
    const double ga = g(a), gb = g(b), gm = half_q;  // g(lhat) = half_q
    // second difference on possibly uneven steps
    const double da = lhat - a, db = b - lhat;
    double curv = 0.0;
    if (da > 0 && db > 0) curv = -2.0 * (ga * db + gb * da - gm * (da + db)) / (da * db * (da + db));
    else if (da > 0) curv = -2.0 * (ga - gm) / (da * da);
    else curv = -2.0 * (gb - gm) / (db * db);
    if (!(curv > 0.0) || !std::isfinite(curv)) break;
    h = std::sqrt(2.0 * half_q / curv);
    if (h >= 0.25 * d) break;  // the difference step was on the scale of the interval
    d = h;                      // far too coarse: measure again on the interval's scale
  }
  return std::min(h, width);
}

// One side of the interval (dir = -1 below lhat, +1 above): probe just inside and just outside
// the predicted endpoint, widen geometrically until the profile falls below the cut or the
// range ends (an open side), then solve on the bracket with TOMS 748.
Side solve_side(const Fn& g, double lhat, double g_hat, double h, double edge, double dir) {
  if (dir * (edge - lhat) <= 0.0) return {edge, true, true};
  double x_in = lhat, g_in = g_hat;
  const double steps[] = {0.95, 1.05};
  double step = steps[0] * h;
  for (int k = 0; k < 200; ++k) {
    poll_cancel();
    double x = lhat + dir * step;
    const bool at_edge = dir * (x - edge) >= 0.0;
    if (at_edge) x = edge;
    const double gx = g(x);
    if (!(gx > 0.0)) {
      if (gx == 0.0) return {x, false, true};
      std::uintmax_t it = kMaxIter;
      const auto tol = boost::math::tools::eps_tolerance<double>(kRootBits);
      const auto r = dir < 0 ? boost::math::tools::toms748_solve(g, x, x_in, gx, g_in, tol, it)
                             : boost::math::tools::toms748_solve(g, x_in, x, g_in, gx, tol, it);
      return {0.5 * (r.first + r.second), false, it < kMaxIter};
    }
    if (at_edge) return {edge, true, true};
    x_in = x;
    g_in = gx;
    step = k == 0 ? steps[1] * h : step * 1.6;
  }
  return {x_in, false, false};
}

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

namespace powerback {

ProfileInterval likelihood_interval(const std::function<double(double)>& loglik, double lhat, double lmax,
                                    double level, double lower, double upper) {
  const double half_q = 0.5 * boost::math::quantile(boost::math::chi_squared(1.0), level);
  const double cut = lmax - half_q;
  const Fn g = [&](double l) { return loglik(l) - cut; };
  const double h = predicted_half_width(g, lhat, half_q, lower, upper);
  const Side low = solve_side(g, lhat, half_q, h, lower, -1.0);
  const Side high = solve_side(g, lhat, half_q, h, upper, +1.0);
  ProfileInterval out;
  out.low = low.end;
  out.low_open = low.open;
  out.high = high.end;
  out.high_open = high.open;
  out.converged = low.converged && high.converged;
  return out;
}

}  // namespace powerback
