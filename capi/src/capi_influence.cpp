// Leave-one-out lambda through the C ABI.
#include <cstddef>

#include "capi_internal.hpp"
#include "capi_lambda_result.hpp"
#include "capi_sizes.hpp"
#include "powerback/influence.hpp"

using namespace powerback;

namespace {

// Both entry points: the family as an int code (checked here), the rest as documented.
void influence(const double* y, const double* X, size_t n, size_t p, int f,
               const pwb_influence_options* opt, pwb_influence_summary* summary,
               double* loo_lambda, double* leverage, int* outside, int* at_bound) {
  capi::need(y, "y");
  capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
  capi::need_sized(summary, "summary", "pwb_influence_summary");
  LambdaOptions o;
  const double* weights = nullptr;
  if (f != PWB_BOX_COX && f != PWB_YEO_JOHNSON)
    throw Error(ErrorCode::Argument, "lambda influence needs family PWB_BOX_COX or PWB_YEO_JOHNSON");
  const Family fam = static_cast<Family>(f);
  if (opt) {
    // 0.1 callers' struct ends before the appended weights, which are then absent.
    capi::need_struct(opt->struct_size, offsetof(pwb_influence_options, weights),
                      "pwb_influence_options");
    o.lower = opt->lower;
    o.upper = opt->upper;
    o.level = opt->level;
    if (opt->struct_size >= offsetof(pwb_influence_options, weights) + sizeof opt->weights)
      weights = opt->weights;
  }
  const LambdaInfluence r = lambda_influence(y, X, n, p, fam, o, weights);
  capi::put_lambda_estimate(r.full, summary);
  summary->converged = r.full.converged ? 1 : 0;
  summary->n = n;
  summary->n_outside = r.n_outside;
  summary->n_loo_at_bound = r.n_at_bound;
  for (std::size_t i = 0; i < n; ++i) {
    if (loo_lambda) loo_lambda[i] = r.loo_lambda[i];
    if (leverage) leverage[i] = r.leverage[i];
    if (outside) outside[i] = r.outside[i];
    if (at_bound) at_bound[i] = r.at_bound[i];
  }
}

}  // namespace

extern "C" {

void pwb_influence_options_init(pwb_influence_options* opt) {
  if (!opt) return;
  const LambdaOptions d;
  opt->struct_size = sizeof(pwb_influence_options);
  opt->family = PWB_BOX_COX;
  opt->lower = d.lower;
  opt->upper = d.upper;
  opt->level = d.level;
  opt->weights = nullptr;
}

pwb_status pwb_lambda_influence(const double* y, const double* X, size_t n, size_t p,
                                const pwb_influence_options* opt, pwb_influence_summary* summary,
                                double* loo_lambda, double* leverage, int* outside, int* at_bound) {
  return capi::guarded([&] {
    // The family is read as an int: a caller's out-of-range value is never loaded as an enum.
    if (opt)
      capi::need_struct(opt->struct_size, offsetof(pwb_influence_options, weights),
                        "pwb_influence_options");
    const int f = opt ? capi::enum_value(opt->family) : PWB_BOX_COX;
    influence(y, X, n, p, f, opt, summary, loo_lambda, leverage, outside, at_bound);
  });
}

pwb_status pwb_estimate_response_lambda_loo(const double* y, const double* X, size_t n, size_t p,
                                            pwb_family family, const pwb_influence_options* opt,
                                            pwb_influence_summary* summary, double* loo_lambda,
                                            double* leverage, int* outside, int* at_bound) {
  return capi::guarded([&] {
    influence(y, X, n, p, capi::enum_value(family), opt, summary, loo_lambda, leverage, outside,
              at_bound);
  });
}

}  // extern "C"
