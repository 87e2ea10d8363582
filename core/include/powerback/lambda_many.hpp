// powerback/lambda_many.hpp — response lambdas of many responses against one shared design.
//
// Each of q responses (the columns of Y) gets the estimate estimate_response_lambda would give it
// alone, but the design [1 X] is factored once: every response's data are prepared first, then
// one blocked pass over X's rows builds the design's R (and decides its rank); then the responses
// go in groups, each group's binned sums gathered in one more pass over the rows (a block once
// for the whole group) before its searches. The R, the rank decision and every sum are computed
// from the same blocks in the same order as in the single-response estimator, so each
// response's result is the same to rounding, and the same bit for bit whatever the thread count.
//
// threads: 0 or 1 runs everything on the calling thread; more prepares, gathers and searches
// the responses on up to that many threads (powerback::parallel_for), the calling thread
// included. Only the calling thread asks its installed cancel check; the others stop when it
// says stop. Y, X and the weights are only read, so they may be shared with other readers.
//
// Failures that concern one response (values outside the family's domain, NaN/Inf, a constant
// column, an exact fit) are kept in that response's outcome and the others proceed; failures of
// the shared inputs (options, weights, predictors, a design with too few rows for its rank) and
// cancellation are thrown as the single-response estimator throws them.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"

namespace powerback {

struct ResponseLambdaOutcome {
  bool ok = false;
  LambdaEstimate estimate;                 // valid when ok
  ErrorCode code = ErrorCode::Argument;    // when !ok: what went wrong
  std::string message;                     // when !ok: names the column ("Y column 2 (0-based)")
  std::size_t count = 0;                   // when !ok and about rows: how many rows
  std::vector<std::size_t> first_rows;     // and the first few (0-based, caller's numbering)
  LambdaInput input = LambdaInput::Response;
  std::vector<double> grid, loglik;        // the profile curve when curve_points >= 2 and ok
};

// Y: n-by-q column-major responses; X: n-by-p column-major predictors without an intercept
// column (one is added). opt as estimate_response_lambda (weights shared by every response).
// curve_points = 0 for no curves, else >= 2: each estimate's profile on
// profile_grid(estimate, curve_points), as estimate_response_lambda_curve gives it. Returns q
// outcomes in column order. Throws Error(Argument) for q == 0, bad options, a NULL Y or X, a
// curve_points of 1; the shared-input errors of estimate_response_lambda (LambdaRowsError for
// weights and for non-finite predictors, Error(Singular) when n <= rank + 1 or every column is
// aliased) and Error(Cancelled). Which of several failures is thrown does not depend on threads.
std::vector<ResponseLambdaOutcome> estimate_response_lambdas(const double* Y, std::size_t n,
                                                             std::size_t q, const double* X,
                                                             std::size_t p, Family family,
                                                             const LambdaOptions& opt = {},
                                                             std::size_t curve_points = 0,
                                                             unsigned threads = 1);

}  // namespace powerback
