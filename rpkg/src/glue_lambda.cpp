// Rcpp glue for lambda estimation: thin wrappers over pwb_estimate_*lambda* of powerback.h.
// The library checks every value; when a failure is about particular rows, the glue returns
// them as numbers (pwb_lambda_error_rows) instead of raising, so that R names the caller's rows
// without scanning the data again.
#include "glue_common.h"

#include <vector>

namespace {

pwb_family lambda_family(const std::string& name) {
  pwb_family f;
  rpwb::check(pwb_family_from_name(name.c_str(), &f));
  return f;
}

pwb_lambda_options lambda_options(double lower, double upper, double level, const double* w) {
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = lower;
  o.upper = upper;
  o.level = level;
  o.weights = w;
  return o;
}

const double* weights_of(const Rcpp::Nullable<Rcpp::NumericVector>& w, R_xlen_t n,
                         Rcpp::NumericVector* keep) {
  if (w.isNull()) return nullptr;
  *keep = Rcpp::NumericVector(w.get());
  if (keep->size() != n) Rcpp::stop("the weights and the response differ in length");
  return keep->begin();
}

Rcpp::List lambda_list(const pwb_lambda_result& r, const std::vector<double>& grid,
                       const std::vector<double>& ll) {
  return Rcpp::List::create(
      Rcpp::Named("lambda") = r.lambda, Rcpp::Named("conf_low") = r.conf_low,
      Rcpp::Named("conf_high") = r.conf_high, Rcpp::Named("convenient") = r.convenient,
      Rcpp::Named("loglik") = r.loglik, Rcpp::Named("at_bound") = r.at_bound != 0,
      Rcpp::Named("converged") = r.converged != 0, Rcpp::Named("n") = static_cast<double>(r.n),
      Rcpp::Named("low_open") = r.low_open != 0, Rcpp::Named("high_open") = r.high_open != 0,
      Rcpp::Named("rank") = static_cast<double>(r.rank),
      Rcpp::Named("n_aliased") = static_cast<double>(r.n_aliased),
      Rcpp::Named("grid") = Rcpp::NumericVector(grid.begin(), grid.end()),
      Rcpp::Named("grid_loglik") = Rcpp::NumericVector(ll.begin(), ll.end()));
}

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

}  // namespace

// [[Rcpp::export]]
Rcpp::List rpwb_estimate_lambda(Rcpp::NumericVector x, std::string family, double lower,
                                double upper, double level, int n_grid,
                                Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue) {
  Rcpp::NumericVector wk;
  const pwb_lambda_options o = lambda_options(lower, upper, level, weights_of(weights, x.size(), &wk));
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<double> grid(m), ll(m);
  const pwb_status st = pwb_estimate_lambda_curve(x.begin(), static_cast<std::size_t>(x.size()),
                                                  lambda_family(family), &o, &r, m, grid.data(),
                                                  ll.data());
  if (st != PWB_OK) return failure(st);
  return lambda_list(r, grid, ll);
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
  const pwb_lambda_options o = lambda_options(lower, upper, level, weights_of(weights, y.size(), &wk));
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<double> grid(m), ll(m);
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t p = static_cast<std::size_t>(X.ncol() - skip);
  const pwb_status st = pwb_estimate_response_lambda_curve(
      y.begin(), p > 0 ? X.begin() + static_cast<std::size_t>(skip) * n : nullptr, n, p,
      lambda_family(family), &o, &r, m, grid.data(), ll.data());
  if (st != PWB_OK) return failure(st);
  return lambda_list(r, grid, ll);
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
  const double* w = weights_of(weights, y.size(), &wk);
  if (X.isNull()) {
    rpwb::check(pwb_lambda_profile_weighted(y.begin(), n, lambda_family(family), w, grid.begin(),
                                            m, out.begin()));
  } else {
    Rcpp::NumericMatrix Xm(X.get());
    if (static_cast<std::size_t>(Xm.nrow()) != n)
      Rcpp::stop("the model matrix and the response differ in rows");
    rpwb::check(pwb_response_lambda_profile_weighted(
        y.begin(), Xm.ncol() > 0 ? Xm.begin() : nullptr, n, static_cast<std::size_t>(Xm.ncol()),
        lambda_family(family), w, grid.begin(), m, out.begin()));
  }
  return out;
}
