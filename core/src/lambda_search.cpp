// Maximum-likelihood lambda and its likelihood-ratio interval: Brent's minimiser on the negated
// profile, then a bracketing root search on each side for the chi-square cut.
#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/tools/minima.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <cstdint>

#include "powerback/lambda.hpp"
#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace {

constexpr std::uintmax_t kMaxIter = 200;
// Brent's minimiser: half the mantissa is the best a minimum can be located to (the profile is
// flat to second order there), about 1.5e-8 relative.
constexpr int kMinimiserBits = std::numeric_limits<double>::digits / 2;
// Interval endpoints are simple roots, so they can be found much more tightly.
constexpr int kRootBits = 40;

void check_options(const LambdaOptions& opt) {
  require(std::isfinite(opt.lower) && std::isfinite(opt.upper) && opt.lower < opt.upper,
          "the lambda search range needs finite lower < upper; got [" + format_number(opt.lower) +
              ", " + format_number(opt.upper) + "]");
  require(opt.level > 0.0 && opt.level < 1.0,
          "the confidence level must lie strictly between 0 and 1; got " + format_number(opt.level));
}

LambdaEstimate search(const detail::LambdaProfile& prof, const LambdaOptions& opt) {
  LambdaEstimate est;
  est.family = prof.family();
  est.n = prof.n();
  est.level = opt.level;
  est.lower = opt.lower;
  est.upper = opt.upper;
  const auto neg = [&](double l) { return -prof.loglik(l); };

  std::uintmax_t it = kMaxIter;
  const std::pair<double, double> best =
      boost::math::tools::brent_find_minima(neg, opt.lower, opt.upper, kMinimiserBits, it);
  bool ok = it < kMaxIter;
  double lhat = best.first, lmax = -best.second;
  // Brent never evaluates the ends of the range; near one, compare with the end itself.
  const double width = opt.upper - opt.lower, near = 1e-4 * width;
  for (double edge : {opt.lower, opt.upper}) {
    if (std::fabs(lhat - edge) < near) {
      const double le = prof.loglik(edge);
      if (le >= lmax) {
        lhat = edge;
        lmax = le;
      }
      est.at_bound = true;
    }
  }
  est.lambda = lhat;
  est.loglik = lmax;

  // Interval: the lambdas whose profile lies within chi2_1(level) / 2 of the maximum.
  const double cut = lmax - 0.5 * boost::math::quantile(boost::math::chi_squared(1.0), opt.level);
  const auto g = [&](double l) { return prof.loglik(l) - cut; };
  const auto tol = boost::math::tools::eps_tolerance<double>(kRootBits);
  const double g_hat = lmax - cut;
  // Lower side.
  if (lhat <= opt.lower) {
    est.low_open = true;
    est.conf_low = opt.lower;
  } else {
    const double g_lo = g(opt.lower);
    if (g_lo > 0.0) {
      est.low_open = true;
      est.conf_low = opt.lower;
    } else {
      std::uintmax_t ri = kMaxIter;
      const auto r = boost::math::tools::toms748_solve(g, opt.lower, lhat, g_lo, g_hat, tol, ri);
      ok = ok && ri < kMaxIter;
      est.conf_low = 0.5 * (r.first + r.second);
    }
  }
  // Upper side.
  if (lhat >= opt.upper) {
    est.high_open = true;
    est.conf_high = opt.upper;
  } else {
    const double g_up = g(opt.upper);
    if (g_up > 0.0) {
      est.high_open = true;
      est.conf_high = opt.upper;
    } else {
      std::uintmax_t ri = kMaxIter;
      const auto r = boost::math::tools::toms748_solve(g, lhat, opt.upper, g_hat, g_up, tol, ri);
      ok = ok && ri < kMaxIter;
      est.conf_high = 0.5 * (r.first + r.second);
    }
  }
  est.converged = ok && std::isfinite(lmax);
  est.convenient = convenient_lambda(est.lambda, est.conf_low, est.conf_high);
  return est;
}

}  // namespace

double convenient_lambda(double lambda, double lo, double hi) {
  static const double kValues[] = {-2.0, -1.0, -0.5, 0.0, 0.5, 1.0, 2.0};
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
  const detail::LambdaProfile prof(x, n, family, "x");
  return search(prof, opt);
}

LambdaEstimate estimate_response_lambda(const double* y, const LeastSquares& design, Family family,
                                        const LambdaOptions& opt) {
  check_options(opt);
  const detail::LambdaProfile prof(y, design, family, "y");
  LambdaEstimate est = search(prof, opt);
  est.rank = design.rank();
  est.aliased = design.aliased();
  return est;
}

LambdaEstimate estimate_response_lambda(const double* y, const double* X, std::size_t n,
                                        std::size_t p, Family family, const LambdaOptions& opt) {
  check_options(opt);
  const LeastSquares design(X, n, p, true);
  return estimate_response_lambda(y, design, family, opt);
}

}  // namespace powerback
