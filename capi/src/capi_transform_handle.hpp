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

// The C form of a transform's constants (struct_size left as it is).
inline void write_spec(const TransformSpec& s, pwb_transform_spec* out) {
  out->family = static_cast<pwb_family>(s.family);
  out->lambda = s.lambda;
  out->shift = s.shift;
  out->reflect = s.reflect ? 1 : 0;
  out->pivot = s.pivot;
}

// A new handle owning a copy of t (the caller frees it with pwb_transform_free).
inline pwb_transform* new_transform_handle(const Transform& t) { return new pwb_transform{t}; }

}  // namespace capi
}  // namespace powerback
