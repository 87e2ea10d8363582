// Rcpp glue for models: thin wrappers over pwb_model_* of powerback.h. A fit returns a live
// handle (an external pointer); accessors and predictions read it without refitting.
#include "glue_model_handle.h"

#include <vector>

namespace {
Rcpp::NumericVector vec(const std::vector<double>& v) {
  Rcpp::NumericVector out(v.size());
  for (std::size_t i = 0; i < v.size(); ++i) out[i] = rpwb::nan_to_na(v[i]);
  return out;
}

pwb_model_info info_of(const pwb_model* m) {
  pwb_model_info info;
  info.struct_size = sizeof info;
  rpwb::check(pwb_model_get_info(m, &info));
  return info;
}
}  // namespace

// borrow = TRUE: X is the full design (its intercept column included when `intercept`), read
// in place by the model and kept alive by the returned handle (no copy in the core).
// [[Rcpp::export]]
SEXP rpwb_model_new(Rcpp::NumericVector y, Rcpp::NumericMatrix X, bool intercept,
                    Rcpp::Nullable<Rcpp::List> response, int estimated,
                    Rcpp::Nullable<Rcpp::NumericVector> weights, bool borrow = false) {
  return rpwb::fit_model(y, X, intercept, response, estimated, weights, borrow);
}

// TRUE when the handle points at a model (FALSE after saveRDS/readRDS or serialize).
// [[Rcpp::export]]
bool rpwb_model_is_live(SEXP handle) {
  return TYPEOF(handle) == EXTPTRSXP && R_ExternalPtrAddr(handle) != nullptr;
}

// The model's scalars, coefficients, standard errors, aliasing and covariance.
// [[Rcpp::export]]
Rcpp::List rpwb_model_summary(SEXP handle) {
  const pwb_model* m = rpwb::model_of(handle);
  const pwb_model_info info = info_of(m);
  const std::size_t k = info.columns;
  std::vector<double> coef(k), se(k), cov(k * k);
  std::vector<int> al(k);
  rpwb::check(pwb_model_coefficients(m, coef.data(), se.data(), al.data(), k));
  rpwb::check(pwb_model_covariance(m, cov.data(), k));
  Rcpp::NumericMatrix v(static_cast<int>(k), static_cast<int>(k));
  for (std::size_t i = 0; i < k * k; ++i) v[i] = rpwb::nan_to_na(cov[i]);
  return Rcpp::List::create(
      Rcpp::Named("coefficients") = vec(coef), Rcpp::Named("se") = vec(se),
      Rcpp::Named("aliased") = Rcpp::LogicalVector(al.begin(), al.end()),
      Rcpp::Named("vcov") = v, Rcpp::Named("sigma") = info.sigma,
      Rcpp::Named("df_residual") = static_cast<double>(info.df_residual),
      Rcpp::Named("rank") = static_cast<double>(info.rank), Rcpp::Named("rss") = info.rss,
      Rcpp::Named("loglik") = info.loglik, Rcpp::Named("loglik_df") = info.loglik_df,
      Rcpp::Named("jacobian") = info.jacobian,
      Rcpp::Named("nobs") = static_cast<double>(info.nobs),
      Rcpp::Named("n") = static_cast<double>(info.n));
}

// One per-row vector: 0 residuals, 1 fitted, 2 leverages, 3 transformed response.
// [[Rcpp::export]]
Rcpp::NumericVector rpwb_model_vector(SEXP handle, int which) {
  const pwb_model* m = rpwb::model_of(handle);
  const std::size_t n = info_of(m).n;
  std::vector<double> out(n);
  rpwb::check(pwb_model_vector_get(m, static_cast<pwb_model_vector>(which), out.data(), n));
  return vec(out);
}

namespace {

// Options and caller-owned outputs of one prediction call. interval: 0 none, 1 confidence,
// 2 prediction; center: 0 median, 1 mean; mean_method: 0 smearing, 1 normal.
struct PredictBuffers {
  PredictBuffers(std::size_t rows, double level, int interval, int center, int mean_method,
                 bool transformed)
      : fit(rows), lwr(rows), upr(rows), cut(rows), flags(rows) {
    pwb_predict_options_init(&opt);
    opt.level = level;
    opt.interval = static_cast<pwb_interval>(interval);
    opt.center = static_cast<pwb_center>(center);
    opt.mean_method = static_cast<pwb_mean_method>(mean_method);
    opt.transformed_scale = transformed ? 1 : 0;
    opt.tail_mass = cut.data();
  }
  Rcpp::List as_list() const {
    Rcpp::IntegerVector fl(flags.size());
    for (std::size_t i = 0; i < flags.size(); ++i) fl[i] = static_cast<int>(flags[i]);
    return Rcpp::List::create(Rcpp::Named("fit") = vec(fit), Rcpp::Named("lwr") = vec(lwr),
                              Rcpp::Named("upr") = vec(upr), Rcpp::Named("flags") = fl,
                              Rcpp::Named("cut_mass") = vec(cut));
  }
  pwb_predict_options opt;
  std::vector<double> fit, lwr, upr, cut;
  std::vector<unsigned> flags;
};

}  // namespace

// Rows of Xnew with NA come back NA with flag 2 (PWB_PRED_MISSING); R's NA_real_ is a NaN,
// which the library treats as a missing row. With se_fit, `se` holds the transformed-scale
// standard errors of the fit.
// [[Rcpp::export]]
Rcpp::List rpwb_model_predict(SEXP handle, Rcpp::NumericMatrix Xnew, double level, int interval,
                              int center, int mean_method, bool transformed, bool se_fit) {
  const pwb_model* m = rpwb::model_of(handle);
  const std::size_t rows = static_cast<std::size_t>(Xnew.nrow());
  const std::size_t p = static_cast<std::size_t>(Xnew.ncol());
  const double* x = p > 0 && rows > 0 ? Xnew.begin() : nullptr;
  PredictBuffers b(rows, level, interval, center, mean_method, transformed);
  rpwb::check(pwb_model_predict(m, x, rows, p, &b.opt, b.fit.data(), b.lwr.data(), b.upr.data(),
                                b.flags.data()));
  Rcpp::List out = b.as_list();
  if (se_fit) {
    std::vector<double> se(rows);
    rpwb::check(pwb_model_predict_se(m, x, rows, p, se.data()));
    out["se"] = vec(se);
  }
  return out;
}

// Predictions at the model's own rows (no design from R); arguments as rpwb_model_predict.
// [[Rcpp::export]]
Rcpp::List rpwb_model_predict_fitted(SEXP handle, double level, int interval, int center,
                                     int mean_method, bool transformed) {
  const pwb_model* m = rpwb::model_of(handle);
  const std::size_t rows = info_of(m).n;
  PredictBuffers b(rows, level, interval, center, mean_method, transformed);
  rpwb::check(pwb_model_predict_fitted(m, &b.opt, b.fit.data(), b.lwr.data(), b.upr.data(),
                                       b.flags.data(), rows));
  return b.as_list();
}
