// Rcpp glue for the response lambdas of many responses against one design: a thin wrapper over
// pwb_estimate_response_lambdas of powerback.h. Every response's result comes back; the first
// failure (or a failure of the shared inputs) comes back as data when it names rows or a
// response, so that R words it with the caller's column names and rows.
#include "glue_common.h"

#include <vector>

// Y: the response matrix (n-by-q); X: the model matrix, its first `skip` columns not passed on
// (the intercept R puts first), the rest used in place.
// [[Rcpp::export]]
Rcpp::List rpwb_estimate_response_lambdas(Rcpp::NumericMatrix Y, Rcpp::NumericMatrix X,
                                          std::string family, double lower, double upper,
                                          double level, int n_grid,
                                          Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue,
                                          int skip = 0) {
  if (X.nrow() != Y.nrow()) Rcpp::stop("the model matrix and the responses differ in rows");
  if (skip < 0 || skip > X.ncol()) Rcpp::stop("skip must lie between 0 and the number of columns");
  const std::size_t n = static_cast<std::size_t>(Y.nrow()), q = static_cast<std::size_t>(Y.ncol());
  const std::size_t p = static_cast<std::size_t>(X.ncol() - skip);
  Rcpp::NumericVector wk;
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = lower;
  o.upper = upper;
  o.level = level;
  if (weights.isNotNull()) {
    wk = Rcpp::NumericVector(weights.get());
    if (static_cast<std::size_t>(wk.size()) != n) Rcpp::stop("the weights and the responses differ in length");
    o.weights = wk.begin();
  }
  std::vector<std::size_t> aliased(p + 1);  // the design has p + 1 columns with the intercept
  o.aliased_out = aliased.data();
  o.aliased_cap = aliased.size();
  pwb_family f;
  rpwb::check(pwb_family_from_name(family.c_str(), &f));
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<pwb_lambda_result> res(q);
  for (auto& r : res) pwb_lambda_result_init(&r);
  std::vector<pwb_status> st(q, PWB_OK);
  Rcpp::NumericMatrix grid(static_cast<int>(m), static_cast<int>(q));
  Rcpp::NumericMatrix ll(static_cast<int>(m), static_cast<int>(q));
  const pwb_status s = pwb_estimate_response_lambdas(
      Y.begin(), n, q, p > 0 ? X.begin() + static_cast<std::size_t>(skip) * n : nullptr, p, f, &o,
      q > 0 ? res.data() : nullptr, st.data(), m, grid.begin(), ll.begin());
  if (s == PWB_ERR_CANCELLED) throw Rcpp::internal::InterruptedException();
  Rcpp::List fits(static_cast<int>(q));
  int first_failed = 0;  // 1-based column of the first failing response; 0 none
  for (std::size_t j = 0; j < q; ++j) {
    if (st[j] != PWB_OK && first_failed == 0) first_failed = static_cast<int>(j) + 1;
    const int c = static_cast<int>(j);
    fits[c] = rpwb::lambda_result_list(res[j], Rcpp::NumericVector(grid(Rcpp::_, c)),
                                       Rcpp::NumericVector(ll(Rcpp::_, c)));
  }
  std::size_t n_aliased = 0;  // the shared design's count, from any estimated response
  for (std::size_t j = 0; j < q; ++j)
    if (st[j] == PWB_OK) {
      n_aliased = res[j].n_aliased;
      break;
    }
  const Rcpp::NumericVector aliased_idx = rpwb::aliased_indices(aliased, n_aliased);
  if (s == PWB_OK)
    return Rcpp::List::create(Rcpp::Named("fits") = fits, Rcpp::Named("aliased") = aliased_idx);
  const std::string message = pwb_last_error();
  std::size_t rows[8];
  int input = PWB_LAMBDA_INPUT_NONE;
  const std::size_t count = pwb_lambda_error_rows(rows, 8, &input);
  // The library names a failing response "Y column j (0-based)"; a failure of the shared inputs
  // names none and, when it names no rows either, is raised at once as the single-response glue
  // raises it.
  const int column = message.find("Y column ") != std::string::npos ? first_failed : 0;
  if (column == 0 && count == 0) throw Rcpp::exception(message.c_str(), false);
  const std::size_t listed = count < 8 ? count : 8;
  return Rcpp::List::create(
      Rcpp::Named("fits") = fits, Rcpp::Named("error") = message,
      Rcpp::Named("status") = std::string(pwb_status_name(s)), Rcpp::Named("input") = input,
      Rcpp::Named("count") = static_cast<double>(count),
      Rcpp::Named("rows") = Rcpp::NumericVector(rows, rows + listed),
      Rcpp::Named("column") = column);
}
