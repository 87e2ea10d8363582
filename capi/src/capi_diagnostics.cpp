// Residual checks of a model handle through the C ABI.
#include "capi_internal.hpp"
#include "capi_model_handle.hpp"
#include "powerback/diagnostics.hpp"
#include "powerback/model.hpp"


using namespace powerback;

extern "C" {

void pwb_residual_checks_init(pwb_residual_checks* out) {
  if (!out) return;
  out->struct_size = sizeof(pwb_residual_checks);
  out->n = 0;
  out->sw_statistic = out->sw_p = math::kNaN;
  out->sw_computed = 0;
  out->skewness = math::kNaN;
  out->bp_statistic = out->bp_df = out->bp_p = math::kNaN;
  out->reset_f = out->reset_df1 = out->reset_df2 = out->reset_p = math::kNaN;
}

pwb_status pwb_model_residual_checks(const pwb_model* m, pwb_residual_checks* out) {
  // The same checks without their note (one copy of the struct filling, in capi_model_extras).
  return pwb_model_residual_checks_with_note(m, out, nullptr, 0, nullptr);
}

pwb_status pwb_model_residual_checks_note(const pwb_model* m, char* buf, size_t cap,
                                          size_t* needed) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::copy_text(residual_checks(m->impl).sw_note, buf, cap, needed);
  });
}

}  // extern "C"
