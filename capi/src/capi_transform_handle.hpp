// The layout of the opaque pwb_transform handle, shared by the C ABI files that accept or return
// transforms (transforms, models, specs). Nothing here is exported.
#pragma once

#include "capi_internal.hpp"
#include "powerback/transform.hpp"

struct pwb_transform {
  powerback::Transform impl;
};

namespace powerback {
namespace capi {

// The transform a caller's handle holds; Error(Argument) naming `what` for NULL.
inline const Transform& transform_of(const pwb_transform* t, const char* what) {
  need(t, what);
  return t->impl;
}

// A new handle owning a copy of t (the caller frees it with pwb_transform_free).
inline pwb_transform* new_transform_handle(const Transform& t) { return new pwb_transform{t}; }

}  // namespace capi
}  // namespace powerback
