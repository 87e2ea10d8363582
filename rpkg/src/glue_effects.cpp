// Rcpp glue for effects in original units: thin wrappers over pwb_model_effect_* of
// powerback.h. The R side builds the contrasts and design rows; the model's live handle serves all.
#include "glue_model_handle.h"

#include <vector>

namespace {
Rcpp::NumericVector effect_vec(const pwb_effect& e) {
  return Rcpp::NumericVector::create(rpwb::nan_to_na(e.estimate), rpwb::nan_to_na(e.se),
                                     rpwb::nan_to_na(e.lower), rpwb::nan_to_na(e.upper),
                                     rpwb::nan_to_na(e.median0), rpwb::nan_to_na(e.median1));
}
}  // namespace

// contrasts: k-by-columns rows of percent-change contrasts; elast_cols: 0-based design columns
// with elast_transforms their predictor specs; rows0/rows1: design rows (intercept included)
// of median changes. Each result is a matrix with columns estimate, se, lower, upper,
// median0, median1.
// [[Rcpp::export]]
Rcpp::List rpwb_model_effects(SEXP handle, double level, Rcpp::NumericMatrix contrasts, Rcpp::IntegerVector elast_cols,
                              Rcpp::List elast_transforms, Rcpp::NumericMatrix rows0,
                              Rcpp::NumericMatrix rows1) {
  const pwb_model* m = rpwb::model_of(handle);
  const std::size_t cols = static_cast<std::size_t>(contrasts.ncol());
  auto run = [&](int k, auto&& one) {
    Rcpp::NumericMatrix out(k, 6);
    for (int i = 0; i < k; ++i) {
      pwb_effect e;
      pwb_effect_init(&e);
      rpwb::check(one(i, &e));
      out(i, Rcpp::_) = effect_vec(e);
    }
    return out;
  };
  auto row_of = [](const Rcpp::NumericMatrix& M, int i) {
    std::vector<double> r(static_cast<std::size_t>(M.ncol()));
    for (int j = 0; j < M.ncol(); ++j) r[static_cast<std::size_t>(j)] = M(i, j);
    return r;
  };
  Rcpp::NumericMatrix pc = run(contrasts.nrow(), [&](int i, pwb_effect* e) {
    const std::vector<double> c = row_of(contrasts, i);
    return pwb_model_effect_percent(m, c.data(), cols, level, e);
  });
  Rcpp::NumericMatrix el = run(elast_cols.size(), [&](int i, pwb_effect* e) {
    rpwb::Transform t(Rcpp::List(elast_transforms[i]));
    return pwb_model_effect_elasticity(m, static_cast<size_t>(elast_cols[i]), t.get(), level, e);
  });
  Rcpp::NumericMatrix ch = run(rows0.nrow(), [&](int i, pwb_effect* e) {
    const std::vector<double> a = row_of(rows0, i), b = row_of(rows1, i);
    return pwb_model_effect_median_change(m, a.data(), b.data(), static_cast<size_t>(rows0.ncol()),
                                          level, e);
  });
  return Rcpp::List::create(Rcpp::Named("percent") = pc, Rcpp::Named("elasticity") = el,
                            Rcpp::Named("change") = ch);
}
