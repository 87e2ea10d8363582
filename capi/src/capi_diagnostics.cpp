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
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_sized(out, "out", "pwb_residual_checks");
    const ResidualChecks c = residual_checks(m->impl);
    out->n = c.n;
    out->sw_statistic = c.sw_statistic;
    out->sw_p = c.sw_p;
    out->sw_computed = c.sw_computed ? 1 : 0;
    out->skewness = c.skewness;
    out->bp_statistic = c.bp_statistic;
    out->bp_df = c.bp_df;
    out->bp_p = c.bp_p;
    out->reset_f = c.reset_f;
    out->reset_df1 = c.reset_df1;
    out->reset_df2 = c.reset_df2;
    out->reset_p = c.reset_p;
  });
}

pwb_status pwb_model_residual_checks_note(const pwb_model* m, char* buf, size_t cap,
                                          size_t* needed) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::copy_text(residual_checks(m->impl).sw_note, buf, cap, needed);
  });
}

}  // extern "C"
