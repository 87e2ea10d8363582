// Response lambdas of many responses against one shared design, for the C ABI (see
// pwb_estimate_response_lambdas in powerback.h).
#include <cstddef>
#include <cstring>
#include <vector>

#include "capi_internal.hpp"
#include "capi_lambda_aliased.hpp"
#include "capi_lambda_guard.hpp"
#include "capi_lambda_result.hpp"
#include "capi_sizes.hpp"
#include "powerback/lambda_many.hpp"

using namespace powerback;

namespace {

Family many_family(pwb_family f) {
  const int v = capi::enum_value(f);
  if (v != PWB_BOX_COX && v != PWB_YEO_JOHNSON)
    throw Error(ErrorCode::Argument, "lambda can be estimated for PWB_BOX_COX and "
                                     "PWB_YEO_JOHNSON only; got family code " + std::to_string(v));
  return static_cast<Family>(v);
}

// out[j] at the caller's stride (out[0].struct_size), every element checked to carry it.
std::size_t result_stride(pwb_lambda_result* out, std::size_t q) {
  capi::need_sized(out, "out", "pwb_lambda_result");
  const std::size_t stride = out->struct_size;
  for (std::size_t j = 1; j < q; ++j) {
    const auto* e = reinterpret_cast<const pwb_lambda_result*>(reinterpret_cast<const char*>(out) + j * stride);
    if (e->struct_size != stride)
      throw Error(ErrorCode::Argument,
                  "out[" + std::to_string(j) + "].struct_size is " + std::to_string(e->struct_size) +
                      ", not out[0]'s " + std::to_string(stride) +
                      ": set every element's struct_size (pwb_lambda_result_init on each)");
  }
  return stride;
}

// opt->threads: 1 when opt is NULL or its struct_size ends before the field (an older header);
// 0 means 1; more than the core's unsigned can hold is capped (far beyond any machine's).
unsigned threads_of(const pwb_lambda_options* opt) {
  if (!opt || opt->struct_size < offsetof(pwb_lambda_options, threads) + sizeof(opt->threads)) return 1;
  if (opt->threads == 0) return 1;
  return opt->threads > 1024 ? 1024u : static_cast<unsigned>(opt->threads);
}

}  // namespace

extern "C" pwb_status pwb_estimate_response_lambdas(const double* Y, size_t n, size_t q,
                                                    const double* X, size_t p, pwb_family family,
                                                    const pwb_lambda_options* opt,
                                                    pwb_lambda_result* out, pwb_status* status_out,
                                                    size_t n_grid, double* grid_out,
                                                    double* loglik_out) {
  bool per_response = false;  // past the shared inputs: status_out already holds each response's
  const pwb_status s = capi::lambda_guarded_call([&] {
    if (q == 0) throw Error(ErrorCode::Argument, "q is 0: Y needs at least one column");
    capi::need_array(Y, capi::checked_matrix_size(n, q, "Y"), "Y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    const std::size_t stride = result_stride(out, q);
    if (n_grid == 1) throw Error(ErrorCode::Argument, "n_grid must be 0 (no curves) or at least 2");
    if (n_grid > 0) {
      const std::size_t cells = capi::checked_matrix_size(q, n_grid, "the curves");
      capi::need_array(grid_out, cells, "grid_out");
      capi::need_array(loglik_out, cells, "loglik_out");
    }
    const capi::AliasedOut aliased = capi::aliased_out_of(opt);
    const std::vector<ResponseLambdaOutcome> res =
        estimate_response_lambdas(Y, n, q, X, p, many_family(family), capi::lambda_options_of(opt), n_grid,
                                  threads_of(opt));
    per_response = true;
    const ResponseLambdaOutcome* first_failure = nullptr;
    bool aliased_written = false;  // the design is shared: its aliased columns go out once
    for (std::size_t j = 0; j < q; ++j) {
      const ResponseLambdaOutcome& r = res[j];
      if (status_out) status_out[j] = r.ok ? PWB_OK : capi::status_of(r.code);
      if (r.ok && !aliased_written) {
        capi::write_aliased(r.estimate, aliased);
        aliased_written = true;
      }
      if (r.ok) {
        capi::write_lambda_result(
            r.estimate,
            reinterpret_cast<pwb_lambda_result*>(reinterpret_cast<char*>(out) + j * stride));
      } else if (!first_failure) {
        first_failure = &r;
      }
      for (std::size_t k = 0; k < n_grid; ++k) {
        grid_out[j * n_grid + k] = r.ok ? r.grid[k] : math::kNaN;
        loglik_out[j * n_grid + k] = r.ok ? r.loglik[k] : math::kNaN;
      }
    }
    if (!first_failure) return;
    if (first_failure->count > 0)
      throw LambdaRowsError(first_failure->code, first_failure->message, first_failure->count,
                            first_failure->first_rows, first_failure->input);
    throw Error(first_failure->code, first_failure->message);
  });
  if (s != PWB_OK && !per_response && status_out)
    for (std::size_t j = 0; j < q; ++j) status_out[j] = s;
  return s;
}
