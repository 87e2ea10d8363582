// The C ABI of the normality statistics: Shapiro-Wilk and the sample moments.
#include "capi_internal.hpp"
#include "capi_lambda_result.hpp"
#include "powerback/family_math.hpp"
#include "powerback/normality.hpp"

using namespace powerback;

extern "C" {

void pwb_normality_result_init(pwb_normality_result* out) {
  if (!out) return;
  out->struct_size = sizeof(pwb_normality_result);
  out->w = out->p_value = math::kNaN;
  out->n = 0;
  out->computed = 0;
  out->note = "";
}

pwb_status pwb_shapiro_wilk(const double* x, size_t n, pwb_normality_result* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_normality_result");
    capi::need_array(x, n, "x");
    const ShapiroWilk sw = shapiro_wilk(x, n);
    out->w = sw.w;
    out->p_value = sw.p_value;
    out->n = sw.n;
    out->computed = sw.computed ? 1 : 0;
    out->note = normality_skip_text(sw.skip);
  });
}

void pwb_moments_init(pwb_moments* out) {
  if (!out) return;
  out->struct_size = sizeof(pwb_moments);
  out->n = 0;
  out->mean = out->sd = math::kNaN;
  out->skewness = out->skewness_se = out->skewness_z = math::kNaN;
  out->kurtosis = out->kurtosis_se = out->kurtosis_z = math::kNaN;
}

pwb_status pwb_sample_moments(const double* x, size_t n, pwb_moments* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_moments");
    capi::need_array(x, n, "x");
    const Moments m = sample_moments(x, n);
    out->n = m.n;
    capi::put_moments(m, out);
  });
}

}  // extern "C"
