// Effects in original units through the C ABI: percent changes, elasticities, median changes.
#include <string>

#include "capi_internal.hpp"
#include "capi_model_handle.hpp"
#include "capi_transform_handle.hpp"
#include "powerback/effects.hpp"

using namespace powerback;

namespace {

void check_columns(const Model& f, std::size_t columns) {
  require(columns == f.columns(), "columns is " + std::to_string(columns) + " but the model has " +
                                      std::to_string(f.columns()) + " coefficients");
}

void copy_effect(const Effect& e, pwb_effect* out) {
  out->estimate = e.estimate;
  out->se = e.se;
  out->lower = e.lower;
  out->upper = e.upper;
  out->median0 = e.median0;
  out->median1 = e.median1;
}

}  // namespace

extern "C" {

void pwb_effect_init(pwb_effect* out) {
  if (!out) return;
  out->struct_size = sizeof(pwb_effect);
  out->estimate = out->se = out->lower = out->upper = out->median0 = out->median1 = math::kNaN;
}

pwb_status pwb_model_effect_percent(const pwb_model* m, const double* contrast, size_t columns,
                                    double level, pwb_effect* out) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need(contrast, "contrast");
    capi::need_sized(out, "out", "pwb_effect");
    check_columns(m->impl, columns);
    copy_effect(percent_change(m->impl, contrast, level), out);
  });
}

pwb_status pwb_model_effect_elasticity(const pwb_model* m, size_t column, const pwb_transform* predictor,
                                       double level, pwb_effect* out) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_sized(out, "out", "pwb_effect");
    copy_effect(elasticity(m->impl, column, capi::transform_of(predictor, "predictor"), level), out);
  });
}

pwb_status pwb_model_effect_median_change(const pwb_model* m, const double* x0, const double* x1,
                                          size_t columns, double level, pwb_effect* out) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need(x0, "x0");
    capi::need(x1, "x1");
    capi::need_sized(out, "out", "pwb_effect");
    check_columns(m->impl, columns);
    copy_effect(median_change(m->impl, x0, x1, level), out);
  });
}

}  // extern "C"
