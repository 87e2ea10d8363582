// The transform handle of the C ABI.
#include "capi_transform_handle.hpp"

using namespace powerback;

namespace {

TransformSpec from_c(const pwb_transform_spec& s) {
  TransformSpec t;
  const int code = capi::enum_value(s.family);
  if (!family_is_valid(code))
    throw Error(ErrorCode::Argument, "unknown family code " + std::to_string(code));
  t.family = static_cast<Family>(code);
  t.lambda = s.lambda;
  t.shift = s.shift;
  t.reflect = s.reflect != 0;
  t.pivot = s.pivot;
  return t;
}

pwb_status map(const pwb_transform* t, const double* in, size_t n, double* out, int which) {
  return capi::guarded([&] {
    capi::need(t, "t");
    capi::need_array(in, n, which == 1 ? "z" : "x");
    capi::need_array(out, n, "out");
    if (n == 0) return;
    MapReport r;
    if (which == 0) r = t->impl.apply(in, n, out);
    else if (which == 1) r = t->impl.invert(in, n, out);
    else r = t->impl.log_abs_derivative(in, n, out);
    t->impl.throw_if_failed(r, n, which == 1 ? "z" : "x", which == 1);
  });
}

}  // namespace

extern "C" {

void pwb_transform_spec_init(pwb_transform_spec* spec) {
  if (!spec) return;
  spec->struct_size = sizeof(pwb_transform_spec);
  spec->family = PWB_IDENTITY;
  spec->lambda = math::kNaN;
  spec->shift = 0.0;
  spec->reflect = 0;
  spec->pivot = math::kNaN;
}

pwb_status pwb_transform_new(const pwb_transform_spec* spec, pwb_transform** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need_sized(spec, "spec", "pwb_transform_spec");
    capi::need(out, "out");
    *out = capi::new_transform_handle(Transform(from_c(*spec)));
  });
}

void pwb_transform_free(pwb_transform* t) { delete t; }

pwb_status pwb_transform_get_spec(const pwb_transform* t, pwb_transform_spec* spec) {
  return capi::guarded([&] {
    capi::need(t, "t");
    capi::need_sized(spec, "spec", "pwb_transform_spec");
    capi::write_spec(t->impl.spec(), spec);
  });
}

pwb_status pwb_transform_apply(const pwb_transform* t, const double* x, size_t n, double* out) {
  return map(t, x, n, out, 0);
}

pwb_status pwb_transform_invert(const pwb_transform* t, const double* z, size_t n, double* out) {
  return map(t, z, n, out, 1);
}

pwb_status pwb_transform_log_derivative(const pwb_transform* t, const double* x, size_t n,
                                        double* out) {
  return map(t, x, n, out, 2);
}

pwb_status pwb_transform_describe(const pwb_transform* t, int which, char* buf, size_t cap,
                                  size_t* needed) {
  return capi::guarded([&] {
    capi::need(t, "t");
    if (which < 0 || which > 4) throw Error(ErrorCode::Argument, "which must be 0, 1, 2, 3 or 4");
    const std::string text = which == 0   ? t->impl.domain_requirement()
                             : which == 1 ? t->impl.range_requirement()
                             : which == 2 ? t->impl.domain_remedy()
                             : which == 3 ? t->impl.describe()
                                          : t->impl.range_remedy();
    capi::copy_text(text, buf, cap, needed);
  });
}

}  // extern "C"
