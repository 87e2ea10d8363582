// Rcpp glue for residual checks: one call of pwb_model_residual_checks_with_note on a live
// model handle (the checks and their note are computed once).
#include "glue_model_handle.h"

#include <vector>

// [[Rcpp::export]]
Rcpp::List rpwb_model_checks(SEXP handle) {
  const pwb_model* m = rpwb::model_of(handle);
  pwb_residual_checks c;
  pwb_residual_checks_init(&c);
  std::vector<char> buf(512);
  std::size_t needed = 0;
  rpwb::check(pwb_model_residual_checks_with_note(m, &c, buf.data(), buf.size(), &needed));
  std::string note(buf.data());
  if (needed >= buf.size()) {  // a long note: fetch it whole (rare)
    buf.assign(needed + 1, '\0');
    rpwb::check(pwb_model_residual_checks_with_note(m, &c, buf.data(), buf.size(), nullptr));
    note = buf.data();
  }
  using rpwb::nan_to_na;
  return Rcpp::List::create(
      Rcpp::Named("n") = static_cast<double>(c.n),
      Rcpp::Named("sw_statistic") = nan_to_na(c.sw_statistic), Rcpp::Named("sw_p") = nan_to_na(c.sw_p),
      Rcpp::Named("sw_computed") = c.sw_computed != 0, Rcpp::Named("sw_note") = note,
      Rcpp::Named("skewness") = nan_to_na(c.skewness),
      Rcpp::Named("bp_statistic") = nan_to_na(c.bp_statistic), Rcpp::Named("bp_df") = nan_to_na(c.bp_df),
      Rcpp::Named("bp_p") = nan_to_na(c.bp_p), Rcpp::Named("reset_f") = nan_to_na(c.reset_f),
      Rcpp::Named("reset_df1") = nan_to_na(c.reset_df1), Rcpp::Named("reset_df2") = nan_to_na(c.reset_df2),
      Rcpp::Named("reset_p") = nan_to_na(c.reset_p));
}
