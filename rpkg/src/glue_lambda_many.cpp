// Rcpp glue for the response lambdas of many responses against one design: a thin wrapper over
// pwb_estimate_response_lambdas of powerback.h. The results come back as columns (one value per
// response), the curves as matrices (one column per response) when asked for; the first failure
// (or a failure of the shared inputs) comes back as data when it names rows or a response, so
// that R words it with the caller's column names and rows.
#include "glue_common.h"

#include <vector>

// Y: the response matrix (n-by-q); X: the model matrix, its first `skip` columns not passed on
// (the intercept R puts first), the rest used in place. n_grid: 0 for no curves, else >= 2.
// threads: for the library's threads (the interrupt check stays on this, R's, thread).
// [[Rcpp::export]]
Rcpp::List rpwb_estimate_response_lambdas(Rcpp::NumericMatrix Y, Rcpp::NumericMatrix X,
                                          std::string family, double lower, double upper,
                                          double level, int n_grid,
                                          Rcpp::Nullable<Rcpp::NumericVector> weights = R_NilValue,
                                          int skip = 0, int threads = 1) {
  if (X.nrow() != Y.nrow()) Rcpp::stop("the model matrix and the responses differ in rows");
  if (skip < 0 || skip > X.ncol()) Rcpp::stop("skip must lie between 0 and the number of columns");
  if (n_grid < 0 || n_grid == 1) Rcpp::stop("n_grid must be 0 (no curves) or at least 2");
  if (threads < 1) Rcpp::stop("threads must be at least 1");
  const std::size_t n = static_cast<std::size_t>(Y.nrow()), q = static_cast<std::size_t>(Y.ncol());
  const std::size_t p = static_cast<std::size_t>(X.ncol() - skip);
  Rcpp::NumericVector wk;
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = lower;
  o.upper = upper;
  o.level = level;
  o.threads = static_cast<std::size_t>(threads);
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
  const std::size_t m = static_cast<std::size_t>(n_grid);
  std::vector<pwb_lambda_result> res(q);
  for (auto& r : res) pwb_lambda_result_init(&r);
  std::vector<pwb_status> st(q, PWB_OK);
  Rcpp::NumericMatrix grid(static_cast<int>(m), static_cast<int>(q));
  Rcpp::NumericMatrix ll(static_cast<int>(m), static_cast<int>(q));
  const pwb_status s = pwb_estimate_response_lambdas(
      Y.begin(), n, q, p > 0 ? X.begin() + static_cast<std::size_t>(skip) * n : nullptr, p, f, &o,
      q > 0 ? res.data() : nullptr, st.data(), m, m > 0 ? grid.begin() : nullptr,
      m > 0 ? ll.begin() : nullptr);
  if (s == PWB_ERR_CANCELLED) throw Rcpp::internal::InterruptedException();
  const int nq = static_cast<int>(q);
  Rcpp::NumericVector lambda(nq), conf_low(nq), conf_high(nq), convenient(nq), loglik(nq),
      n_used(nq), rank(nq);
  Rcpp::LogicalVector at_bound(nq), converged(nq), low_open(nq), high_open(nq);
  int first_failed = 0;  // 1-based column of the first failing response; 0 none
  std::size_t n_aliased = 0;  // the shared design's count, from any estimated response
  bool any_ok = false;
  for (std::size_t j = 0; j < q; ++j) {
    const pwb_lambda_result& r = res[j];
    const int c = static_cast<int>(j);
    if (st[j] != PWB_OK && first_failed == 0) first_failed = c + 1;
    if (st[j] == PWB_OK && !any_ok) {
      n_aliased = r.n_aliased;
      any_ok = true;
    }
    lambda[c] = r.lambda;
    conf_low[c] = r.conf_low;
    conf_high[c] = r.conf_high;
    convenient[c] = r.convenient;
    loglik[c] = r.loglik;
    n_used[c] = static_cast<double>(r.n);
    rank[c] = static_cast<double>(r.rank);
    at_bound[c] = r.at_bound != 0;
    converged[c] = r.converged != 0;
    low_open[c] = r.low_open != 0;
    high_open[c] = r.high_open != 0;
  }
  Rcpp::List fits = Rcpp::List::create(
      Rcpp::Named("lambda") = lambda, Rcpp::Named("conf_low") = conf_low,
      Rcpp::Named("conf_high") = conf_high, Rcpp::Named("convenient") = convenient,
      Rcpp::Named("loglik") = loglik, Rcpp::Named("at_bound") = at_bound,
      Rcpp::Named("converged") = converged, Rcpp::Named("n") = n_used,
      Rcpp::Named("low_open") = low_open, Rcpp::Named("high_open") = high_open,
      Rcpp::Named("rank") = rank);
  if (m > 0) {
    fits["grid"] = grid;
    fits["grid_loglik"] = ll;
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
