// Rcpp glue for comparing transforms: folds, held-out scores, fold fits of fixed transforms.
// Thin wrappers over powerback.h; the R callers validate and phrase rows.
#include "glue_common.h"

#include <memory>
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

// Held-out predictions of a model with fixed transforms in every fold of one split
// (pwb_cv_fixed_predict): per row median, mean, lwr, upr, flags; per fold status, sigma, df.
// [[Rcpp::export]]
Rcpp::List rpwb_cv_fixed_predict(Rcpp::NumericVector y, Rcpp::NumericMatrix X, bool intercept,
                                 Rcpp::Nullable<Rcpp::List> response, Rcpp::IntegerVector fold,
                                 int folds, double level,
                                 Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue) {
  const R_xlen_t n = y.size();
  if (X.nrow() != n || fold.size() != n) Rcpp::stop("y, X and fold differ in rows");
  if (folds < 2) Rcpp::stop("folds must be >= 2");
  std::unique_ptr<rpwb::Transform> tr;
  if (response.isNotNull()) tr.reset(new rpwb::Transform(Rcpp::List(response.get())));
  Rcpp::NumericVector wkeep;
  pwb_cv_fixed_options opt;
  pwb_cv_fixed_options_init(&opt);
  opt.intercept = intercept ? 1 : 0;
  opt.level = level;
  opt.weights = rpwb::weights_or_null(weights, n, &wkeep);
  const std::size_t k = static_cast<std::size_t>(folds);
  std::vector<double> med(n), mean(n), lo(n), hi(n), sigma(k);
  std::vector<unsigned> flags(n);
  std::vector<int> status(k);
  std::vector<std::size_t> df(k);
  pwb_cv_fixed_result out;
  out.struct_size = sizeof out;
  out.median = med.data();
  out.mean = mean.data();
  out.lower = lo.data();
  out.upper = hi.data();
  out.flags = flags.data();
  out.fold_status = status.data();
  out.sigma = sigma.data();
  out.df_residual = df.data();
  out.coefficients = nullptr;
  rpwb::check(pwb_cv_fixed_predict(y.begin(), X.begin(), static_cast<std::size_t>(n),
                                   static_cast<std::size_t>(X.ncol()), tr ? tr->get() : nullptr,
                                   fold.begin(), folds, &opt, &out));
  auto na = [](const std::vector<double>& v) {
    Rcpp::NumericVector r(v.size());
    for (std::size_t i = 0; i < v.size(); ++i) r[i] = rpwb::nan_to_na(v[i]);
    return r;
  };
  return Rcpp::List::create(
      Rcpp::Named("median") = na(med), Rcpp::Named("mean") = na(mean),
      Rcpp::Named("lwr") = na(lo), Rcpp::Named("upr") = na(hi),
      Rcpp::Named("flags") = Rcpp::IntegerVector(flags.begin(), flags.end()),
      Rcpp::Named("status") = Rcpp::IntegerVector(status.begin(), status.end()),
      Rcpp::Named("sigma") = na(sigma),
      Rcpp::Named("df_residual") = Rcpp::NumericVector(df.begin(), df.end()));
}
