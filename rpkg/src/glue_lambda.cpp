// Rcpp glue for lambda estimation: thin wrappers over pwb_estimate_*lambda* of powerback.h.
// The R callers check rows (non-finite, out of domain) first so that their messages speak of
// 1-based rows; anything else the library rejects comes back as its own message.
#include "glue_common.h"

#include <vector>

namespace {

pwb_family lambda_family(const std::string& name) {
  pwb_family f;
  rpwb::check(pwb_family_from_name(name.c_str(), &f));
  return f;
}

pwb_lambda_options lambda_options(double lower, double upper, double level) {
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = lower;
  o.upper = upper;
  o.level = level;
  return o;
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

}  // namespace

// [[Rcpp::export]]
Rcpp::List rpwb_estimate_lambda(Rcpp::NumericVector x, std::string family, double lower,
                                double upper, double level, int n_grid) {
  const pwb_lambda_options o = lambda_options(lower, upper, level);
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<double> grid(m), ll(m);
  rpwb::check(pwb_estimate_lambda_curve(x.begin(), static_cast<std::size_t>(x.size()),
                                        lambda_family(family), &o, &r, m, grid.data(), ll.data()));
  return lambda_list(r, grid, ll);
}

// X: the model matrix without its intercept column (n x p, possibly p = 0).
// [[Rcpp::export]]
Rcpp::List rpwb_estimate_response_lambda(Rcpp::NumericVector y, Rcpp::NumericMatrix X,
                                         std::string family, double lower, double upper,
                                         double level, int n_grid) {
  if (X.nrow() != y.size()) Rcpp::stop("the model matrix and the response differ in rows");
  const pwb_lambda_options o = lambda_options(lower, upper, level);
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<double> grid(m), ll(m);
  rpwb::check(pwb_estimate_response_lambda_curve(
      y.begin(), X.ncol() > 0 ? X.begin() : nullptr, static_cast<std::size_t>(y.size()),
      static_cast<std::size_t>(X.ncol()), lambda_family(family), &o, &r, m, grid.data(),
      ll.data()));
  return lambda_list(r, grid, ll);
}

// Profile log-likelihood at chosen lambdas; X = NULL for the univariate profile.
// [[Rcpp::export]]
Rcpp::NumericVector rpwb_lambda_profile(Rcpp::NumericVector y, Rcpp::Nullable<Rcpp::NumericMatrix> X,
                                        std::string family, Rcpp::NumericVector grid) {
  Rcpp::NumericVector out(grid.size());
  const std::size_t n = static_cast<std::size_t>(y.size());
  const std::size_t m = static_cast<std::size_t>(grid.size());
  if (X.isNull()) {
    rpwb::check(pwb_lambda_profile(y.begin(), n, lambda_family(family), grid.begin(), m, out.begin()));
  } else {
    Rcpp::NumericMatrix Xm(X.get());
    if (static_cast<std::size_t>(Xm.nrow()) != n)
      Rcpp::stop("the model matrix and the response differ in rows");
    rpwb::check(pwb_response_lambda_profile(y.begin(), Xm.ncol() > 0 ? Xm.begin() : nullptr, n,
                                            static_cast<std::size_t>(Xm.ncol()),
                                            lambda_family(family), grid.begin(), m, out.begin()));
  }
  return out;
}
