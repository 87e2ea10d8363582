// Response lambdas of many responses with one factorisation of their shared design (see
// lambda_many.hpp): every response prepared, one pass over the design's rows for the R and
// every response's binned sums, then a search per response.
#include "powerback/lambda_many.hpp"

#include <memory>
#include <utility>

#include "lambda_internal.hpp"
#include "powerback/cancel.hpp"

namespace powerback {
namespace {

std::string column_name(std::size_t j) { return "Y column " + std::to_string(j) + " (0-based)"; }

// An error that belongs to one response (kept in its outcome) rather than to the shared inputs
// (rethrown): the weights are shared, and a cancellation stops everything.
bool shared_failure(const Error& e) {
  if (e.code() == ErrorCode::Cancelled) return true;
  const auto* rows = dynamic_cast<const LambdaRowsError*>(&e);
  return rows && rows->input() != LambdaInput::Response;
}

void record(const Error& e, ResponseLambdaOutcome& out) {
  out.ok = false;
  out.code = e.code();
  out.message = e.what();
  if (const auto* rows = dynamic_cast<const IndexedError*>(&e)) {
    out.count = rows->count();
    out.first_rows = rows->first_indices();
  }
  if (const auto* rows = dynamic_cast<const LambdaRowsError*>(&e)) out.input = rows->input();
}

}  // namespace

std::vector<ResponseLambdaOutcome> estimate_response_lambdas(const double* Y, std::size_t n,
                                                             std::size_t q, const double* X,
                                                             std::size_t p, Family family,
                                                             const LambdaOptions& opt,
                                                             std::size_t curve_points) {
  detail::check_lambda_options(opt);
  require(q > 0, "Y has no columns: give at least one response");
  require(Y != nullptr || n == 0, "Y is NULL");
  require(curve_points != 1, "a profile curve needs at least 2 points (or 0 for none)");
  std::vector<ResponseLambdaOutcome> out(q);
  std::vector<std::unique_ptr<detail::LambdaProfile>> prof(q);
  std::vector<detail::LambdaProfile*> live;
  live.reserve(q);
  for (std::size_t j = 0; j < q; ++j) {
    try {
      prof[j].reset(new detail::LambdaProfile(Y + j * n, X, n, p, family, column_name(j), opt.weights,
                                              detail::LambdaProfile::DeferDesign{}));
      live.push_back(prof[j].get());
    } catch (const Error& e) {
      if (shared_failure(e)) throw;
      record(e, out[j]);
    }
  }
  if (live.empty()) return out;  // every response failed on its own values

  // One pass over the design: its R, and each block handed to every response's binned sums
  // while it is in cache.
  const DesignBlockVisitor gather = [&live](std::size_t r0,
                                            const Eigen::Ref<const Eigen::MatrixXd>& block) {
    for (detail::LambdaProfile* pr : live) pr->add_design_rows(r0, block);
  };
  const TallFactor f = live.front()->factor_design(gather);
  for (detail::LambdaProfile* pr : live) pr->adopt_design(f, "Y");

  for (std::size_t j = 0; j < q; ++j) {
    if (!prof[j]) continue;
    poll_cancel();
    try {
      out[j].estimate = detail::estimate_on_profile(*prof[j], opt, curve_points, &out[j].grid,
                                                    &out[j].loglik);
      out[j].ok = true;
    } catch (const Error& e) {
      if (shared_failure(e)) throw;
      record(e, out[j]);
    }
    prof[j].reset();  // its prepared data are no longer needed
  }
  return out;
}

}  // namespace powerback
