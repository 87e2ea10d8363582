// Rcpp glue for models: thin wrappers over pwb_model_* of powerback.h. The R side builds the
// design matrix (model.matrix without the intercept column) and refits the handle per call, so a
// saved pwb_model needs no live pointer.
#include "glue_model_handle.h"

#include <vector>

namespace {
Rcpp::NumericVector vec(const std::vector<double>& v) {
  Rcpp::NumericVector out(v.size());
  for (std::size_t i = 0; i < v.size(); ++i) out[i] = rpwb::nan_to_na(v[i]);
  return out;
}
}  // namespace

// [[Rcpp::export]]
Rcpp::List rpwb_model_fit(Rcpp::NumericVector y, Rcpp::NumericMatrix X, bool intercept,
                          Rcpp::Nullable<Rcpp::List> response, int estimated) {
  rpwb::Model m(y, X, intercept, response, estimated);
  pwb_model_info info;
  info.struct_size = sizeof info;
  rpwb::check(pwb_model_get_info(m.get(), &info));
  const std::size_t k = info.columns, n = info.n;
  std::vector<double> coef(k), se(k);
  std::vector<int> al(k);
  rpwb::check(pwb_model_coefficients(m.get(), coef.data(), se.data(), al.data(), k));
  std::vector<double> resid(n), fitted(n), lev(n), z(n);
  rpwb::check(pwb_model_vector_get(m.get(), PWB_MODEL_RESIDUALS, resid.data(), n));
  rpwb::check(pwb_model_vector_get(m.get(), PWB_MODEL_FITTED, fitted.data(), n));
  rpwb::check(pwb_model_vector_get(m.get(), PWB_MODEL_LEVERAGES, lev.data(), n));
  rpwb::check(pwb_model_vector_get(m.get(), PWB_MODEL_TRANSFORMED_RESPONSE, z.data(), n));
  return Rcpp::List::create(
      Rcpp::Named("coefficients") = vec(coef), Rcpp::Named("se") = vec(se),
      Rcpp::Named("aliased") = Rcpp::LogicalVector(al.begin(), al.end()),
      Rcpp::Named("sigma") = info.sigma, Rcpp::Named("df_residual") = static_cast<double>(info.df_residual),
      Rcpp::Named("rank") = static_cast<double>(info.rank), Rcpp::Named("rss") = info.rss,
      Rcpp::Named("residuals") = vec(resid), Rcpp::Named("fitted") = vec(fitted),
      Rcpp::Named("leverages") = vec(lev), Rcpp::Named("z") = vec(z),
      Rcpp::Named("loglik") = info.loglik, Rcpp::Named("loglik_df") = info.loglik_df,
      Rcpp::Named("jacobian") = info.jacobian);
}

// interval: 0 none, 1 confidence, 2 prediction; center: 0 median, 1 mean; mean_method: 0
// smearing, 1 normal. Rows of Xnew with NA come back NA with flag 2 (PWB_PRED_MISSING).
// [[Rcpp::export]]
Rcpp::List rpwb_model_predict(Rcpp::NumericVector y, Rcpp::NumericMatrix X, bool intercept,
                              Rcpp::Nullable<Rcpp::List> response, int estimated,
                              Rcpp::NumericMatrix Xnew, double level, int interval, int center,
                              int mean_method, bool transformed) {
  rpwb::Model m(y, X, intercept, response, estimated);
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  o.level = level;
  o.interval = static_cast<pwb_interval>(interval);
  o.center = static_cast<pwb_center>(center);
  o.mean_method = static_cast<pwb_mean_method>(mean_method);
  o.transformed_scale = transformed ? 1 : 0;
  const std::size_t rows = static_cast<std::size_t>(Xnew.nrow());
  // R's NA_real_ is a NaN, which the library treats as a missing row.
  std::vector<double> fit(rows), lwr(rows), upr(rows), cut(rows);
  std::vector<unsigned> flags(rows);
  o.tail_mass = cut.data();
  rpwb::check(pwb_model_predict(m.get(), Xnew.ncol() > 0 ? Xnew.begin() : nullptr, rows,
                                static_cast<size_t>(Xnew.ncol()), &o, fit.data(), lwr.data(),
                                upr.data(), flags.data()));
  Rcpp::IntegerVector fl(rows);
  for (std::size_t i = 0; i < rows; ++i) fl[i] = static_cast<int>(flags[i]);
  return Rcpp::List::create(Rcpp::Named("fit") = vec(fit), Rcpp::Named("lwr") = vec(lwr),
                            Rcpp::Named("upr") = vec(upr), Rcpp::Named("flags") = fl,
                            Rcpp::Named("cut_mass") = vec(cut));
}
