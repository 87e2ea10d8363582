// Rcpp glue for comparing transforms: folds, held-out scores.
// Thin wrappers over powerback.h; the R callers validate and phrase rows.
#include "glue_common.h"

#include <vector>

// Fold ids as an n-by-repeats integer matrix, stratified (strata: n codes >= 0) or grouped
// (groups: n codes >= 0); both NULL gives the plain folds of rpwb_cv_folds.
// [[Rcpp::export]]
Rcpp::IntegerMatrix rpwb_cv_folds_by(int n, int folds, int repeats, double seed,
                                     Rcpp::Nullable<Rcpp::IntegerVector> strata,
                                     Rcpp::Nullable<Rcpp::IntegerVector> groups) {
  if (n < 0 || repeats < 1) Rcpp::stop("n must be >= 0 and repeats >= 1");
  Rcpp::IntegerVector st, gr;
  pwb_cv_fold_options opt;
  pwb_cv_fold_options_init(&opt);
  opt.folds = folds;
  opt.repeats = repeats;
  opt.seed = static_cast<unsigned long long>(seed);
  if (strata.isNotNull()) {
    st = Rcpp::IntegerVector(strata.get());
    if (st.size() != n) Rcpp::stop("strata and rows differ in length");
    opt.strata = st.begin();
  }
  if (groups.isNotNull()) {
    gr = Rcpp::IntegerVector(groups.get());
    if (gr.size() != n) Rcpp::stop("groups and rows differ in length");
    opt.groups = gr.begin();
  }
  Rcpp::IntegerMatrix f(n, repeats);
  rpwb::check(pwb_cv_folds_by(static_cast<std::size_t>(n), &opt, f.begin()));
  return f;
}

// [[Rcpp::export]]
Rcpp::NumericVector rpwb_holdout_score(Rcpp::NumericVector y, Rcpp::NumericVector fit,
                                       Rcpp::Nullable<Rcpp::NumericVector> lwr,
                                       Rcpp::Nullable<Rcpp::NumericVector> upr,
                                       Rcpp::Nullable<Rcpp::NumericVector> w = R_NilValue) {
  const std::size_t n = static_cast<std::size_t>(y.size());
  if (static_cast<std::size_t>(fit.size()) != n) Rcpp::stop("fit and y differ in length");
  Rcpp::NumericVector lo, hi;
  const bool interval = lwr.isNotNull() && upr.isNotNull();
  if (interval) {
    lo = Rcpp::NumericVector(lwr.get());
    hi = Rcpp::NumericVector(upr.get());
    if (static_cast<std::size_t>(lo.size()) != n || static_cast<std::size_t>(hi.size()) != n)
      Rcpp::stop("interval ends and y differ in length");
  }
  // R's NA in a prediction is a non-finite prediction: pass it on as NaN
  std::vector<double> fv(fit.begin(), fit.end());
  Rcpp::NumericVector wv;
  pwb_holdout_options opt;
  pwb_holdout_options_init(&opt);
  if (w.isNotNull()) {
    wv = Rcpp::NumericVector(w.get());
    if (static_cast<std::size_t>(wv.size()) != n) Rcpp::stop("weights and y differ in length");
    opt.weights = wv.begin();
  }
  pwb_holdout_scores s;
  s.struct_size = sizeof s;
  rpwb::check(pwb_holdout_score_opts(y.begin(), fv.data(), interval ? lo.begin() : nullptr,
                                     interval ? hi.begin() : nullptr, n, &opt, &s));
  return Rcpp::NumericVector::create(
      Rcpp::Named("rmse") = rpwb::nan_to_na(s.rmse), Rcpp::Named("mae") = rpwb::nan_to_na(s.mae),
      Rcpp::Named("r2") = rpwb::nan_to_na(s.r2),
      Rcpp::Named("coverage") = rpwb::nan_to_na(s.coverage),
      Rcpp::Named("width") = rpwb::nan_to_na(s.mean_width),
      Rcpp::Named("n") = static_cast<double>(s.n),
      Rcpp::Named("n_nonfinite") = static_cast<double>(s.n_nonfinite),
      Rcpp::Named("n_point") = static_cast<double>(s.n_point),
      Rcpp::Named("n_interval") = static_cast<double>(s.n_interval),
      Rcpp::Named("width_median") = rpwb::nan_to_na(s.median_width),
      Rcpp::Named("unbounded") = rpwb::nan_to_na(s.share_unbounded));
}
