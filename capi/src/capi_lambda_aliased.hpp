// The optional aliased-column output of pwb_lambda_options (aliased_out, aliased_cap), shared by
// the single- and many-response estimators.
#pragma once

#include <cstddef>

#include "capi_internal.hpp"
#include "powerback.h"
#include "powerback/lambda.hpp"

namespace powerback {
namespace capi {

struct AliasedOut {
  std::size_t* slots = nullptr;
  std::size_t cap = 0;
};

// The caller's buffer; none when opt is NULL or its struct_size ends before aliased_cap (a header
// older than these fields). Throws Error(Argument) for a NULL buffer with a capacity above 0.
inline AliasedOut aliased_out_of(const pwb_lambda_options* opt) {
  AliasedOut a;
  if (!opt) return a;
  if (opt->struct_size < offsetof(pwb_lambda_options, aliased_cap) + sizeof(opt->aliased_cap))
    return a;
  if (opt->aliased_cap > 0) need(opt->aliased_out, "opt->aliased_out (with aliased_cap > 0)");
  a.slots = opt->aliased_out;
  a.cap = opt->aliased_cap;
  return a;
}

// The first min(cap, count) aliased design columns of e (ascending, 0 = intercept).
inline void write_aliased(const LambdaEstimate& e, const AliasedOut& a) {
  const std::size_t m = e.aliased.size() < a.cap ? e.aliased.size() : a.cap;
  for (std::size_t i = 0; i < m; ++i) a.slots[i] = e.aliased[i];
}

}  // namespace capi
}  // namespace powerback
