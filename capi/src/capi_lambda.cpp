// The lambda estimators of the C ABI: options and result structs, estimates, profile curves.
#include <cstddef>
#include <vector>

#include "capi_internal.hpp"
#include "capi_lambda_aliased.hpp"
#include "capi_lambda_guard.hpp"
#include "capi_lambda_result.hpp"
#include "capi_sizes.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;

namespace {

Family lambda_family(pwb_family f) {
  if (f != PWB_BOX_COX && f != PWB_YEO_JOHNSON)
    throw Error(ErrorCode::Argument, "lambda can be estimated for PWB_BOX_COX and "
                                     "PWB_YEO_JOHNSON only; got family code " +
                                         std::to_string(static_cast<int>(f)));
  return static_cast<Family>(f);
}

// The fields of pwb_lambda_options up to (and without) weights: a struct of that size comes from
// a header older than the weights, which then count as absent.
constexpr std::size_t kOptionsBeforeWeights = offsetof(pwb_lambda_options, weights);


void check_out(const pwb_lambda_result* out) {
  capi::need_sized(out, "out", "pwb_lambda_result");
}

void write_result(const LambdaEstimate& e, pwb_lambda_result* out) {
  capi::write_lambda_result(e, out);
}

// The rows behind this thread's last failing lambda call.
struct ErrorRows {
  std::size_t count = 0;
  int input = PWB_LAMBDA_INPUT_NONE;
  std::vector<std::size_t> first;
};
thread_local ErrorRows last_rows;

// capi::guarded, keeping the rows of a LambdaRowsError as numbers.
template <class Body>
pwb_status lambda_guarded(Body&& body) noexcept {
  last_rows.count = 0;
  last_rows.input = PWB_LAMBDA_INPUT_NONE;
  last_rows.first.clear();
  return capi::guarded([&] {
    try {
      body();
    } catch (const LambdaRowsError& e) {
      last_rows.count = e.count();
      last_rows.input = static_cast<int>(e.input());
      last_rows.first = e.first_indices();
      throw;
    }
  });
}

void check_weights_array(const double* w, std::size_t n) { capi::need_array(w, w ? n : 0, "weights"); }

void write_curve(const std::vector<double>& grid, const std::vector<double>& ll, double* grid_out,
                 double* loglik_out) {
  for (std::size_t i = 0; i < grid.size(); ++i) {
    grid_out[i] = grid[i];
    loglik_out[i] = ll[i];
  }
}

void check_curve(std::size_t n_grid, const double* grid_out, const double* loglik_out) {
  if (n_grid < 2) throw Error(ErrorCode::Argument, "n_grid must be at least 2");
  capi::need(grid_out, "grid_out");
  capi::need(loglik_out, "loglik_out");
}

}  // namespace

namespace powerback {
namespace capi {

LambdaOptions lambda_options_of(const pwb_lambda_options* opt) {
  LambdaOptions o;
  if (!opt) return o;
  capi::need_struct(opt->struct_size, kOptionsBeforeWeights, "pwb_lambda_options");
  o.lower = opt->lower;
  o.upper = opt->upper;
  o.level = opt->level;
  if (opt->struct_size >= offsetof(pwb_lambda_options, weights) + sizeof(opt->weights))
    o.weights = opt->weights;
  return o;
}

}  // namespace capi
}  // namespace powerback

extern "C" {

void pwb_lambda_options_init(pwb_lambda_options* opt) {
  if (!opt) return;
  const LambdaOptions d;
  opt->struct_size = sizeof(pwb_lambda_options);
  opt->lower = d.lower;
  opt->upper = d.upper;
  opt->level = d.level;
  opt->weights = nullptr;
  opt->aliased_out = nullptr;
  opt->aliased_cap = 0;
  opt->threads = 1;
}

void pwb_lambda_result_init(pwb_lambda_result* res) {
  if (!res) return;
  res->struct_size = sizeof(pwb_lambda_result);
  res->lambda = res->conf_low = res->conf_high = res->convenient = res->loglik = math::kNaN;
  res->at_bound = res->converged = res->low_open = res->high_open = 0;
  res->n = res->rank = res->n_aliased = 0;
}

pwb_status pwb_estimate_lambda(const double* x, size_t n, pwb_family family,
                               const pwb_lambda_options* opt, pwb_lambda_result* out) {
  return lambda_guarded([&] {
    check_out(out);
    capi::need_array(x, n, "x");
    write_result(estimate_lambda(x, n, lambda_family(family), capi::lambda_options_of(opt)), out);
  });
}

pwb_status pwb_estimate_response_lambda(const double* y, const double* X, size_t n, size_t p,
                                        pwb_family family, const pwb_lambda_options* opt,
                                        pwb_lambda_result* out) {
  return lambda_guarded([&] {
    check_out(out);
    capi::need_array(y, n, "y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    const capi::AliasedOut aliased = capi::aliased_out_of(opt);
    const LambdaEstimate e = estimate_response_lambda(y, X, n, p, lambda_family(family), capi::lambda_options_of(opt));
    write_result(e, out);
    capi::write_aliased(e, aliased);
  });
}

pwb_status pwb_lambda_profile(const double* x, size_t n, pwb_family family, const double* grid,
                              size_t n_grid, double* loglik_out) {
  return lambda_guarded([&] {
    capi::need_array(x, n, "x");
    capi::need_array(grid, n_grid, "grid");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const std::vector<double> ll = lambda_profile(x, n, lambda_family(family), grid, n_grid);
    for (std::size_t i = 0; i < n_grid; ++i) loglik_out[i] = ll[i];
  });
}

pwb_status pwb_response_lambda_profile(const double* y, const double* X, size_t n, size_t p,
                                       pwb_family family, const double* grid, size_t n_grid,
                                       double* loglik_out) {
  return lambda_guarded([&] {
    capi::need_array(y, n, "y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    capi::need_array(grid, n_grid, "grid");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const std::vector<double> ll =
        response_lambda_profile(y, X, n, p, lambda_family(family), grid, n_grid);
    for (std::size_t i = 0; i < n_grid; ++i) loglik_out[i] = ll[i];
  });
}

pwb_status pwb_estimate_lambda_curve(const double* x, size_t n, pwb_family family,
                                     const pwb_lambda_options* opt, pwb_lambda_result* out,
                                     size_t n_grid, double* grid_out, double* loglik_out) {
  return lambda_guarded([&] {
    check_out(out);
    capi::need_array(x, n, "x");
    check_curve(n_grid, grid_out, loglik_out);
    std::vector<double> grid, loglik;
    const LambdaEstimate e =
        estimate_lambda_curve(x, n, lambda_family(family), capi::lambda_options_of(opt), n_grid, &grid, &loglik);
    write_curve(grid, loglik, grid_out, loglik_out);
    write_result(e, out);
  });
}

pwb_status pwb_estimate_response_lambda_curve(const double* y, const double* X, size_t n, size_t p,
                                              pwb_family family, const pwb_lambda_options* opt,
                                              pwb_lambda_result* out, size_t n_grid,
                                              double* grid_out, double* loglik_out) {
  return lambda_guarded([&] {
    check_out(out);
    capi::need_array(y, n, "y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    check_curve(n_grid, grid_out, loglik_out);
    const capi::AliasedOut aliased = capi::aliased_out_of(opt);
    std::vector<double> grid, loglik;
    const LambdaEstimate e = estimate_response_lambda_curve(
        y, X, n, p, lambda_family(family), capi::lambda_options_of(opt), n_grid, &grid, &loglik);
    write_curve(grid, loglik, grid_out, loglik_out);
    write_result(e, out);
    capi::write_aliased(e, aliased);
  });
}

double pwb_convenient_lambda(double lambda, double lo, double hi) {
  return convenient_lambda(lambda, lo, hi);
}

pwb_status pwb_lambda_profile_weighted(const double* x, size_t n, pwb_family family,
                                       const double* weights, const double* grid, size_t n_grid,
                                       double* loglik_out) {
  return lambda_guarded([&] {
    capi::need_array(x, n, "x");
    check_weights_array(weights, n);
    capi::need_array(grid, n_grid, "grid");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const std::vector<double> ll =
        lambda_profile(x, n, lambda_family(family), weights, grid, n_grid);
    for (std::size_t i = 0; i < n_grid; ++i) loglik_out[i] = ll[i];
  });
}

pwb_status pwb_response_lambda_profile_weighted(const double* y, const double* X, size_t n,
                                                size_t p, pwb_family family, const double* weights,
                                                const double* grid, size_t n_grid,
                                                double* loglik_out) {
  return lambda_guarded([&] {
    capi::need_array(y, n, "y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    check_weights_array(weights, n);
    capi::need_array(grid, n_grid, "grid");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const std::vector<double> ll =
        response_lambda_profile(y, X, n, p, lambda_family(family), weights, grid, n_grid);
    for (std::size_t i = 0; i < n_grid; ++i) loglik_out[i] = ll[i];
  });
}

size_t pwb_lambda_error_rows(size_t* rows, size_t cap, int* input) {
  if (input) *input = last_rows.input;
  if (rows)
    for (std::size_t i = 0; i < cap && i < last_rows.first.size(); ++i) rows[i] = last_rows.first[i];
  return last_rows.count;
}

}  // extern "C"

pwb_status powerback::capi::lambda_guarded_call(const std::function<void()>& body) noexcept {
  return lambda_guarded(body);
}
