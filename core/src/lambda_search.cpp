// Maximum-likelihood lambda and its likelihood-ratio interval: the shared maximiser of the
// profile and the shared interval search (lambda_maximise.hpp).
#include <algorithm>
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

  const ProfileInterval ci = likelihood_interval([&](double l) { return prof.loglik(l); }, lhat, lmax,
                                                  opt.level, opt.lower, opt.upper);
  est.conf_low = ci.low;
  est.low_open = ci.low_open;
  est.conf_high = ci.high;
  est.high_open = ci.high_open;
  est.converged = ok && ci.converged && std::isfinite(lmax);
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

namespace detail {

void check_lambda_options(const LambdaOptions& opt) { check_options(opt); }

LambdaEstimate estimate_on_profile(const LambdaProfile& prof, const LambdaOptions& opt,
                                   std::size_t m, std::vector<double>* grid,
                                   std::vector<double>* loglik) {
  check_options(opt);
  const LambdaEstimate est = prof.response() ? with_design(search(prof, opt), prof) : search(prof, opt);
  if (m >= 2) curve_of(prof, est, m, grid, loglik);
  return est;
}

}  // namespace detail
}  // namespace powerback
