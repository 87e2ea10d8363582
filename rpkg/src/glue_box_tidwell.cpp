// Rcpp glue for Box-Tidwell powers: a thin wrapper over pwb_box_tidwell_fit; the R caller
// validates, builds the model frame and phrases rows.
#include "glue_common.h"

// [[Rcpp::export]]
Rcpp::List rpwb_box_tidwell(Rcpp::NumericVector y, Rcpp::NumericMatrix Z, Rcpp::NumericMatrix X,
                            int max_iter, double tol, double level,
                            Rcpp::Nullable<Rcpp::NumericVector> weights) {
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t q = static_cast<std::size_t>(Z.ncol()), m = static_cast<std::size_t>(X.ncol());
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  opt.max_iter = max_iter;
  opt.tol = tol;
  opt.level = level;
  Rcpp::NumericVector w;
  opt.weights = rpwb::weights_or_null(weights, y.size(), &w);
  Rcpp::NumericVector alpha(m), se(m), lo(m), hi(m), t(m), p(m), sugg(m);
  Rcpp::IntegerVector advice(m);
  Rcpp::NumericMatrix hist(static_cast<int>(m), max_iter + 1);
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  res.alpha = alpha.begin();
  res.se = se.begin();
  res.conf_low = lo.begin();
  res.conf_high = hi.begin();
  res.score_t = t.begin();
  res.score_p = p.begin();
  res.advice = advice.begin();
  res.suggested = sugg.begin();
  res.history = hist.begin();
  rpwb::check(pwb_box_tidwell_fit(y.begin(), q > 0 ? Z.begin() : nullptr, n, q, X.begin(), m,
                                  &opt, &res));
  for (auto& v : hist) v = rpwb::nan_to_na(v);
  Rcpp::CharacterVector advice_name(m);
  for (std::size_t j = 0; j < m; ++j)
    advice_name[j] = advice[j] == PWB_BT_LINEAR ? "linear" : advice[j] == PWB_BT_LOG ? "log" : "power";
  return Rcpp::List::create(
      Rcpp::Named("alpha") = alpha, Rcpp::Named("se") = se, Rcpp::Named("conf_low") = lo,
      Rcpp::Named("conf_high") = hi, Rcpp::Named("score_t") = t, Rcpp::Named("score_p") = p,
      Rcpp::Named("advice") = advice_name, Rcpp::Named("suggested") = sugg,
      Rcpp::Named("history") = hist, Rcpp::Named("iterations") = res.iterations,
      Rcpp::Named("converged") = res.converged != 0, Rcpp::Named("last_change") = res.last_change,
      Rcpp::Named("score_df") = res.score_df, Rcpp::Named("n") = static_cast<double>(res.n));
}
