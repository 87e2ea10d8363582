// Maximum-likelihood lambda and its likelihood-ratio interval: the shared maximiser of the
// profile (lambda_maximise.hpp), then a bracketing root search on each side for the chi-square cut.
#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <cstdint>
#include <utility>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/lambda_maximise.hpp"
#include "lambda_internal.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace {

constexpr std::uintmax_t kMaxIter = 200;
// Interval endpoints are simple roots, so they can be found much more tightly.
constexpr int kRootBits = 40;

void check_options(const LambdaOptions& opt) {
  require(std::isfinite(opt.lower) && std::isfinite(opt.upper) && opt.lower < opt.upper,
          "the lambda search range needs finite lower < upper; got [" + format_number(opt.lower) +
              ", " + format_number(opt.upper) + "]");
  require(std::fabs(opt.lower) <= kMaxLambdaMagnitude && std::fabs(opt.upper) <= kMaxLambdaMagnitude,
          "the lambda search range [" + format_number(opt.lower) + ", " + format_number(opt.upper) +
              "] reaches beyond +-" + format_number(kMaxLambdaMagnitude) +
              ", where powers only follow the most extreme values; search within it, e.g. "
              "[-3, 3] (the default) or [-10, 10]");
  require(opt.level > 0.0 && opt.level < 1.0,
          "the confidence level must lie strictly between 0 and 1; got " + format_number(opt.level));
}

struct Side {
  double end;
  bool open, converged;
};

// Where the quadratic approximation of the profile at lhat puts the interval's half-width:
// sqrt(q / curvature), the curvature from a central difference. Only a starting guess for the
// bracketing below, which never relies on it being right.
template <class G>
double predicted_half_width(G& g, double lhat, double half_q, const LambdaOptions& opt) {
  const double width = opt.upper - opt.lower;
  double d = 1e-2 * width, h = 0.25 * width;
  for (int pass = 0; pass < 2; ++pass) {
    const double a = std::max(opt.lower, lhat - d), b = std::min(opt.upper, lhat + d);
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
template <class G>
Side solve_side(G& g, double lhat, double g_hat, double h, double edge, double dir) {
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

// An exact fit at lambda-hat: the profile climbs without bound toward it, so neither the
// estimate nor its (zero-width) interval mean anything.
void check_not_exact(const detail::LambdaProfile& prof, double lhat) {
  if (prof.binned_serves(lhat)) return;  // the bins refuse fits with 1 - R^2 <= 1e-6
  const double ratio = prof.unexplained_share(lhat);
  if (ratio < kExactFitRatio)
    throw Error(ErrorCode::Singular,
                "the predictors fit the transformed response almost exactly near lambda = " +
                    format_number(lhat) + " (1 - R^2 = " + format_number(ratio) +
                    "): the likelihood climbs without bound there, so no power can be estimated; "
                    "check that the response is not computed from the predictors");
}

LambdaEstimate search(const detail::LambdaProfile& prof, const LambdaOptions& opt) {
  LambdaEstimate est;
  est.family = prof.family();
  est.n = prof.n();
  est.level = opt.level;
  est.lower = opt.lower;
  est.upper = opt.upper;
  // The one maximiser (lambda_maximise.hpp): Brent, with the range ends checked within a few of
  // its own steps.
  const ProfileMaximum best =
      maximise_profile([&](double l) { return prof.loglik(l); }, opt.lower, opt.upper);
  bool ok = best.converged;
  const double lhat = best.lambda, lmax = best.loglik;
  est.at_bound = best.at_bound;
  est.lambda = lhat;
  est.loglik = lmax;
  if (prof.response()) check_not_exact(prof, lhat);

  // Interval: the lambdas whose profile lies within chi2_1(level) / 2 of the maximum.
  const double half_q = 0.5 * boost::math::quantile(boost::math::chi_squared(1.0), opt.level);
  const double cut = lmax - half_q;
  const auto g = [&](double l) { return prof.loglik(l) - cut; };
  const double h = predicted_half_width(g, lhat, half_q, opt);
  const Side low = solve_side(g, lhat, half_q, h, opt.lower, -1.0);
  const Side high = solve_side(g, lhat, half_q, h, opt.upper, +1.0);
  est.conf_low = low.end;
  est.low_open = low.open;
  est.conf_high = high.end;
  est.high_open = high.open;
  ok = ok && low.converged && high.converged;
  est.converged = ok && std::isfinite(lmax);
  est.convenient = convenient_lambda(est.lambda, est.conf_low, est.conf_high);
  return est;
}

LambdaEstimate with_design(LambdaEstimate est, const detail::LambdaProfile& prof) {
  est.rank = prof.rank();
  est.aliased = prof.aliased();
  return est;
}

void curve_of(const detail::LambdaProfile& prof, const LambdaEstimate& est, std::size_t m,
              std::vector<double>* grid, std::vector<double>* loglik) {
  std::vector<double> g = profile_grid(est, m);
  if (loglik) {
    loglik->resize(m);
    prof.loglik_batch(g.data(), m, loglik->data());
  }
  if (grid) *grid = std::move(g);
}

}  // namespace

double convenient_lambda(double lambda, double lo, double hi) {
  static const double kValues[] = {-2.0, -1.0, -0.5, -1.0 / 3.0, 0.0, 1.0 / 3.0, 0.5, 1.0, 2.0};
  if (std::isnan(lambda) || std::isnan(lo) || std::isnan(hi)) return math::kNaN;
  double best = math::kNaN;
  for (double v : kValues)
    if (v >= lo && v <= hi && (std::isnan(best) || std::fabs(v - lambda) < std::fabs(best - lambda)))
      best = v;  // ties keep the smaller value
  return std::isnan(best) ? std::round(lambda * 100.0) / 100.0 : best;
}

LambdaEstimate estimate_lambda(const double* x, std::size_t n, Family family,
                               const LambdaOptions& opt) {
  check_options(opt);
  const detail::LambdaProfile prof(x, n, family, "x", opt.weights);
  return search(prof, opt);
}

LambdaEstimate estimate_response_lambda(const double* y, const LeastSquares& design, Family family,
                                        const LambdaOptions& opt) {
  check_options(opt);
  require(opt.weights == nullptr,
          "weights cannot be combined with a prepared design; pass the predictors instead");
  const detail::LambdaProfile prof(y, design, family, "y");
  return with_design(search(prof, opt), prof);
}

LambdaEstimate estimate_response_lambda(const double* y, const double* X, std::size_t n,
                                        std::size_t p, Family family, const LambdaOptions& opt) {
  check_options(opt);
  const detail::LambdaProfile prof(y, X, n, p, family, "y", opt.weights);
  return with_design(search(prof, opt), prof);
}

LambdaEstimate estimate_lambda_curve(const double* x, std::size_t n, Family family,
                                     const LambdaOptions& opt, std::size_t m,
                                     std::vector<double>* grid, std::vector<double>* loglik) {
  check_options(opt);
  require(m >= 2, "a profile grid needs at least 2 points");
  const detail::LambdaProfile prof(x, n, family, "x", opt.weights);
  const LambdaEstimate est = search(prof, opt);
  curve_of(prof, est, m, grid, loglik);
  return est;
}

LambdaEstimate estimate_response_lambda_curve(const double* y, const double* X, std::size_t n,
                                              std::size_t p, Family family,
                                              const LambdaOptions& opt, std::size_t m,
                                              std::vector<double>* grid,
                                              std::vector<double>* loglik) {
  check_options(opt);
  require(m >= 2, "a profile grid needs at least 2 points");
  const detail::LambdaProfile prof(y, X, n, p, family, "y", opt.weights);
  const LambdaEstimate est = with_design(search(prof, opt), prof);
  curve_of(prof, est, m, grid, loglik);
  return est;
}

}  // namespace powerback
