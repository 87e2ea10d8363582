// Rcpp glue for residual checks: a thin wrapper over pwb_model_residual_checks.
#include "glue_model_handle.h"

#include <vector>

// [[Rcpp::export]]
Rcpp::List rpwb_model_checks(Rcpp::NumericVector y, Rcpp::NumericMatrix X, bool intercept,
                             Rcpp::Nullable<Rcpp::List> response) {
  rpwb::Model m(y, X, intercept, response, 0);
  pwb_residual_checks c;
  pwb_residual_checks_init(&c);
  rpwb::check(pwb_model_residual_checks(m.get(), &c));
  std::size_t needed = 0;
  rpwb::check(pwb_model_residual_checks_note(m.get(), nullptr, 0, &needed));
  std::vector<char> buf(needed + 1);
  rpwb::check(pwb_model_residual_checks_note(m.get(), buf.data(), buf.size(), nullptr));
  using rpwb::nan_to_na;
  return Rcpp::List::create(
      Rcpp::Named("n") = static_cast<double>(c.n),
      Rcpp::Named("sw_statistic") = nan_to_na(c.sw_statistic), Rcpp::Named("sw_p") = nan_to_na(c.sw_p),
      Rcpp::Named("sw_computed") = c.sw_computed != 0, Rcpp::Named("sw_note") = std::string(buf.data()),
      Rcpp::Named("skewness") = nan_to_na(c.skewness),
      Rcpp::Named("bp_statistic") = nan_to_na(c.bp_statistic), Rcpp::Named("bp_df") = nan_to_na(c.bp_df),
      Rcpp::Named("bp_p") = nan_to_na(c.bp_p), Rcpp::Named("reset_f") = nan_to_na(c.reset_f),
      Rcpp::Named("reset_df1") = nan_to_na(c.reset_df1), Rcpp::Named("reset_df2") = nan_to_na(c.reset_df2),
      Rcpp::Named("reset_p") = nan_to_na(c.reset_p));
}
