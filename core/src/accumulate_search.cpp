// The maximum and likelihood-ratio interval of a summary's profile given as a function: the
// shared maximiser and interval search of the in-memory path (lambda_maximise.hpp).
#include <cmath>

#include "powerback/accumulate_detail.hpp"
#include "powerback/cancel.hpp"
#include "powerback/lambda_maximise.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace summary_detail {

void check_lambda_options(const LambdaOptions& opt) {
  require(std::isfinite(opt.lower) && std::isfinite(opt.upper) && opt.lower < opt.upper,
          "the lambda search range needs finite lower < upper; got [" + format_number(opt.lower) +
              ", " + format_number(opt.upper) + "]");
  require(opt.level > 0.0 && opt.level < 1.0,
          "the confidence level must lie strictly between 0 and 1; got " + format_number(opt.level));
}

LambdaEstimate search_profile(const std::function<double(double)>& loglik, const LambdaOptions& opt) {
  // A summary's profile is cheap per evaluation but a search makes many: poll between them.
  const std::function<double(double)> f = [&](double l) {
    poll_cancel();
    return loglik(l);
  };
  LambdaEstimate est;
  est.level = opt.level;
  est.lower = opt.lower;
  est.upper = opt.upper;
  const ProfileMaximum best = maximise_profile(f, opt.lower, opt.upper);
  est.lambda = best.lambda;
  est.loglik = best.loglik;
  est.at_bound = best.at_bound;
  const ProfileInterval ci = likelihood_interval(f, best.lambda, best.loglik, opt.level, opt.lower, opt.upper);
  est.conf_low = ci.low;
  est.low_open = ci.low_open;
  est.conf_high = ci.high;
  est.high_open = ci.high_open;
  est.converged = best.converged && ci.converged && std::isfinite(best.loglik);
  est.convenient = convenient_lambda(est.lambda, est.conf_low, est.conf_high);
  return est;
}

}  // namespace summary_detail
}  // namespace powerback
