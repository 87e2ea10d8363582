// Rcpp glue for lambda estimation: thin wrappers over pwb_estimate_*lambda* of powerback.h.
// The library checks every value; when a failure is about particular rows, the glue returns
// them as numbers (pwb_lambda_error_rows) instead of raising, so that R names the caller's rows
// without scanning the data again.
#include "glue_common.h"

#include <vector>

namespace {

// A failure: raised at once unless it names rows, which go back to R as data.
Rcpp::List failure(pwb_status st) {
  const std::string message = pwb_last_error();
  std::size_t rows[8];
  int input = PWB_LAMBDA_INPUT_NONE;
  const std::size_t count = pwb_lambda_error_rows(rows, 8, &input);
  if (count == 0) throw Rcpp::exception(message.c_str(), false);
  const std::size_t listed = count < 8 ? count : 8;
  return Rcpp::List::create(
      Rcpp::Named("error") = message, Rcpp::Named("status") = std::string(pwb_status_name(st)),
      Rcpp::Named("input") = input, Rcpp::Named("count") = static_cast<double>(count),
      Rcpp::Named("rows") = Rcpp::NumericVector(rows, rows + listed));
}

// The result and the profile curve (at least 2 points) of one estimate.
struct CurveEstimate {
  explicit CurveEstimate(int n_grid)
      : m(n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid)), grid(m), ll(m) {
    pwb_lambda_result_init(&r);
  }
  // The R list of the call that returned st: the estimate, or the failure's rows.
  Rcpp::List list(pwb_status st) const {
    if (st != PWB_OK) return failure(st);
    return rpwb::lambda_result_list(r, grid, ll);
  }
  std::size_t m;
  std::vector<double> grid, ll;
  pwb_lambda_result r;
};

}  // namespace

// [[Rcpp::export]]
Rcpp::List rpwb_estimate_lambda(Rcpp::NumericVector x, std::string family, double lower,
                                double upper, double level, int n_grid,
                                Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue) {
  Rcpp::NumericVector wk;
  const pwb_lambda_options o =
      rpwb::lambda_options(lower, upper, level, rpwb::weights_or_null(weights, x.size(), &wk));
  CurveEstimate e(n_grid);
  return e.list(pwb_estimate_lambda_curve(x.begin(), static_cast<std::size_t>(x.size()),
                                          rpwb::family_of(family), &o, &e.r, e.m, e.grid.data(),
                                          e.ll.data()));
}

// X: the model matrix; its first `skip` columns (0, or 1 for the intercept column R puts first)
// are not passed on, so the rest is used in place, without a copy.
// [[Rcpp::export]]
Rcpp::List rpwb_estimate_response_lambda(Rcpp::NumericVector y, Rcpp::NumericMatrix X,
                                         std::string family, double lower, double upper,
                                         double level, int n_grid,
                                         Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue,
                                         int skip = 0) {
  if (X.nrow() != y.size()) Rcpp::stop("the model matrix and the response differ in rows");
  if (skip < 0 || skip > X.ncol()) Rcpp::stop("skip must lie between 0 and the number of columns");
  Rcpp::NumericVector wk;
  pwb_lambda_options o =
      rpwb::lambda_options(lower, upper, level, rpwb::weights_or_null(weights, y.size(), &wk));
  CurveEstimate e(n_grid);
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t p = static_cast<std::size_t>(X.ncol() - skip);
  std::vector<std::size_t> aliased(p + 1);  // the design has p + 1 columns with the intercept
  o.aliased_out = aliased.data();
  o.aliased_cap = aliased.size();
  Rcpp::List out = e.list(pwb_estimate_response_lambda_curve(
      y.begin(), p > 0 ? X.begin() + static_cast<std::size_t>(skip) * n : nullptr, n, p,
      rpwb::family_of(family), &o, &e.r, e.m, e.grid.data(), e.ll.data()));
  if (out.containsElementNamed("lambda"))
    out["aliased"] = rpwb::aliased_indices(aliased, e.r.n_aliased);
  return out;
}

// Profile log-likelihood at chosen lambdas; X = NULL for the univariate profile.
// [[Rcpp::export]]
Rcpp::NumericVector rpwb_lambda_profile(Rcpp::NumericVector y, Rcpp::Nullable<Rcpp::NumericMatrix> X,
                                        std::string family, Rcpp::NumericVector grid,
                                        Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue) {
  Rcpp::NumericVector out(grid.size());
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t m = static_cast<std::size_t>(grid.size());
  Rcpp::NumericVector wk;
  const double* w = rpwb::weights_or_null(weights, y.size(), &wk);
  if (X.isNull()) {
    rpwb::check(pwb_lambda_profile_weighted(y.begin(), n, rpwb::family_of(family), w, grid.begin(),
                                            m, out.begin()));
  } else {
    Rcpp::NumericMatrix Xm(X.get());
    if (static_cast<std::size_t>(Xm.nrow()) != n)
      Rcpp::stop("the model matrix and the response differ in rows");
    rpwb::check(pwb_response_lambda_profile_weighted(
        y.begin(), Xm.ncol() > 0 ? Xm.begin() : nullptr, n, static_cast<std::size_t>(Xm.ncol()),
        rpwb::family_of(family), w, grid.begin(), m, out.begin()));
  }
  return out;
}
