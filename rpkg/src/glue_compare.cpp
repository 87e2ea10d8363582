// Rcpp glue for comparing transforms: Box-Tidwell, leave-one-out lambda, folds, held-out scores.
// Thin wrappers over powerback.h; the R callers validate and phrase rows.
#include "glue_common.h"

#include <vector>

// [[Rcpp::export]]
Rcpp::List rpwb_box_tidwell(Rcpp::NumericVector y, Rcpp::NumericMatrix Z, Rcpp::NumericMatrix X,
                            int max_iter, double tol) {
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t q = static_cast<std::size_t>(Z.ncol()), m = static_cast<std::size_t>(X.ncol());
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  opt.max_iter = max_iter;
  opt.tol = tol;
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  Rcpp::NumericVector alpha(m), se(m), t(m), p(m);
  Rcpp::NumericMatrix hist(static_cast<int>(m), max_iter + 1);
  rpwb::check(pwb_box_tidwell(y.begin(), q > 0 ? Z.begin() : nullptr, n, q, X.begin(), m, &opt,
                              alpha.begin(), se.begin(), t.begin(), p.begin(), hist.begin(), &res));
  for (auto& v : hist) v = rpwb::nan_to_na(v);
  return Rcpp::List::create(
      Rcpp::Named("alpha") = alpha, Rcpp::Named("se") = se, Rcpp::Named("score_t") = t,
      Rcpp::Named("score_p") = p, Rcpp::Named("history") = hist,
      Rcpp::Named("iterations") = res.iterations, Rcpp::Named("converged") = res.converged != 0,
      Rcpp::Named("last_change") = res.last_change, Rcpp::Named("score_df") = res.score_df);
}

// [[Rcpp::export]]
Rcpp::List rpwb_lambda_influence(Rcpp::NumericVector y, Rcpp::NumericMatrix X, std::string family,
                                 double lower, double upper, double level) {
  const std::size_t n = static_cast<std::size_t>(y.size()), p = static_cast<std::size_t>(X.ncol());
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  pwb_family f;
  rpwb::check(pwb_family_from_name(family.c_str(), &f));
  opt.family = f;
  opt.lower = lower;
  opt.upper = upper;
  opt.level = level;
  pwb_influence_summary s;
  s.struct_size = sizeof s;
  Rcpp::NumericVector loo(n), h(n);
  Rcpp::IntegerVector out(n), bound(n);
  rpwb::check(pwb_lambda_influence(y.begin(), p > 0 ? X.begin() : nullptr, n, p, &opt, &s,
                                   loo.begin(), h.begin(), out.begin(), bound.begin()));
  return Rcpp::List::create(
      Rcpp::Named("lambda") = s.lambda,
      Rcpp::Named("conf_int") = Rcpp::NumericVector::create(s.conf_low, s.conf_high),
      Rcpp::Named("loglik") = s.loglik, Rcpp::Named("at_bound") = s.at_bound != 0,
      Rcpp::Named("converged") = s.converged != 0, Rcpp::Named("loo_lambda") = loo,
      Rcpp::Named("leverage") = h, Rcpp::Named("outside") = out, Rcpp::Named("loo_at_bound") = bound);
}

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
