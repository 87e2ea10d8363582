// Rcpp glue for the leave-one-out response lambda: a thin wrapper over
// pwb_estimate_response_lambda_loo; the
// R caller validates, builds the model frame and names rows.
#include "glue_common.h"

// [[Rcpp::export]]
Rcpp::List rpwb_lambda_influence(Rcpp::NumericVector y, Rcpp::NumericMatrix X, std::string family,
                                 double lower, double upper, double level,
                                 Rcpp::Nullable<Rcpp::NumericVector> weights) {
  const std::size_t n = static_cast<std::size_t>(y.size()), p = static_cast<std::size_t>(X.ncol());
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  const pwb_family f = rpwb::family_of(family);
  opt.lower = lower;
  opt.upper = upper;
  opt.level = level;
  Rcpp::NumericVector w;
  opt.weights = rpwb::weights_or_null(weights, y.size(), &w);
  pwb_influence_summary s;
  s.struct_size = sizeof s;
  Rcpp::NumericVector loo(n), h(n);
  Rcpp::IntegerVector out(n), bound(n);
  rpwb::check(pwb_estimate_response_lambda_loo(y.begin(), p > 0 ? X.begin() : nullptr, n, p, f,
                                               &opt, &s, loo.begin(), h.begin(), out.begin(),
                                               bound.begin()));
  return Rcpp::List::create(
      Rcpp::Named("lambda") = s.lambda,
      Rcpp::Named("conf_int") = Rcpp::NumericVector::create(s.conf_low, s.conf_high),
      Rcpp::Named("loglik") = s.loglik, Rcpp::Named("at_bound") = s.at_bound != 0,
      Rcpp::Named("converged") = s.converged != 0, Rcpp::Named("loo_lambda") = loo,
      Rcpp::Named("leverage") = h, Rcpp::Named("outside") = out, Rcpp::Named("loo_at_bound") = bound,
      Rcpp::Named("n_outside") = static_cast<double>(s.n_outside),
      Rcpp::Named("n_loo_at_bound") = static_cast<double>(s.n_loo_at_bound));
}
