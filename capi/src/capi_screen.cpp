// The C ABI of the ladder of powers and the variable screen.
#include <cstring>

#include "capi_internal.hpp"
#include "capi_lambda_result.hpp"
#include "capi_transform_handle.hpp"
#include "powerback/family_math.hpp"
#include "powerback/ladder.hpp"
#include "powerback/screen.hpp"

using namespace powerback;

namespace {

void identity_spec(pwb_transform_spec* out) {
  out->struct_size = sizeof(pwb_transform_spec);
  capi::write_spec(TransformSpec{}, out);
}

// The screen's ML estimate fields under pwb_lambda_result's names, so that the one copy of an
// estimate (capi_lambda_result.hpp) fills them.
struct MlFields {
  double &lambda, &conf_low, &conf_high, &loglik, &convenient;
  int &at_bound, &converged, &low_open, &high_open;
};

// The whole screen of x into *out (checked by the caller); returns the note's full text.
std::string screen_into(const double* x, size_t n, const pwb_screen_options* opt,
                        pwb_screen_result* out) {
  ScreenOptions o;
  if (opt) {
    capi::need_struct(opt->struct_size, sizeof(pwb_screen_options), "pwb_screen_options");
    o.level = opt->level;
    o.lower = opt->lower;
    o.upper = opt->upper;
  }
  const VariableScreen s = screen_variable(x, n, o);
  const size_t keep = out->struct_size;
  pwb_screen_result_init(out);
  out->struct_size = keep;
  out->n = s.n;
  out->usable = s.usable ? 1 : 0;
  capi::put_moments(s.moments, out);
  // The fixed field keeps a copy cut to its size; the full text goes through the _with_note form.
  std::strncpy(out->note, s.note.c_str(), sizeof out->note - 1);
  out->note[sizeof out->note - 1] = '\0';
  if (!s.usable) return s.note;
  out->sw_w = s.sw.w;
  out->sw_p = s.sw.p_value;
  out->sw_note = normality_skip_text(s.sw.skip);
  capi::write_spec(s.ladder.spec, &out->ladder);
  out->ladder_step = static_cast<pwb_ladder_step>(s.ladder.step);
  out->ladder_by_size = s.ladder.by_size ? 1 : 0;
  out->ladder_skewness = s.after_ladder.skewness;
  out->ladder_sw_w = s.after_ladder.sw.w;
  out->ladder_sw_p = s.after_ladder.sw.p_value;
  out->ladder_sw_note = normality_skip_text(s.after_ladder.sw.skip);
  out->ml_done = s.ml_done ? 1 : 0;
  if (!s.ml_done) return s.note;
  capi::write_spec(s.ml_spec, &out->ml);
  MlFields ml{out->ml_lambda,     out->ml_conf_low,  out->ml_conf_high,
              out->ml_loglik,     out->ml_convenient, out->ml_at_bound,
              out->ml_converged,  out->ml_low_open,   out->ml_high_open};
  capi::put_lambda_estimate(s.ml, &ml);
  capi::put_lambda_outcome(s.ml, &ml);
  out->ml_skewness = s.after_ml.skewness;
  out->ml_sw_w = s.after_ml.sw.w;
  out->ml_sw_p = s.after_ml.sw.p_value;
  out->ml_sw_note = normality_skip_text(s.after_ml.sw.skip);
  return s.note;
}

}  // namespace

extern "C" {

void pwb_ladder_info_init(pwb_ladder_info* info) {
  if (!info) return;
  info->struct_size = sizeof(pwb_ladder_info);
  info->step = PWB_LADDER_NONE;
  info->skewed = 0;
  info->by_size = 0;
  info->skewness = info->skewness_z = math::kNaN;
  info->n = 0;
}

pwb_status pwb_ladder_rule_get(pwb_ladder_rule* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_ladder_rule");
    out->large_n = LadderRule::kLargeN;
    out->z_cut = LadderRule::kZCut;
    out->size_cut = LadderRule::kSizeCut;
    out->log10_cut = LadderRule::kLog10Cut;
    out->reciprocal_cut = LadderRule::kReciprocalCut;
  });
}

pwb_status pwb_ladder_recommend(const double* x, size_t n, pwb_transform_spec* spec,
                                pwb_ladder_info* info) {
  return capi::guarded([&] {
    capi::need_sized(spec, "spec", "pwb_transform_spec");
    if (info) capi::need_struct(info->struct_size, sizeof(pwb_ladder_info), "pwb_ladder_info");
    capi::need_array(x, n, "x");
    const LadderAdvice a = ladder_recommend(x, n);
    capi::write_spec(a.spec, spec);
    if (info) {
      info->step = static_cast<pwb_ladder_step>(a.step);
      info->skewed = a.skewed ? 1 : 0;
      info->by_size = a.by_size ? 1 : 0;
      info->skewness = a.skewness;
      info->skewness_z = a.skewness_z;
      info->n = a.n;
    }
  });
}

void pwb_screen_options_init(pwb_screen_options* opt) {
  if (!opt) return;
  const ScreenOptions d;
  opt->struct_size = sizeof(pwb_screen_options);
  opt->level = d.level;
  opt->lower = d.lower;
  opt->upper = d.upper;
}

void pwb_screen_result_init(pwb_screen_result* out) {
  if (!out) return;
  const double nan = math::kNaN;
  std::memset(out, 0, sizeof *out);
  out->struct_size = sizeof(pwb_screen_result);
  out->mean = out->sd = out->skewness = out->skewness_se = out->skewness_z = nan;
  out->kurtosis = out->kurtosis_se = out->kurtosis_z = nan;
  out->sw_w = out->sw_p = nan;
  out->sw_note = out->ladder_sw_note = out->ml_sw_note = "";
  identity_spec(&out->ladder);
  out->ladder_step = PWB_LADDER_NONE;
  out->ladder_skewness = out->ladder_sw_w = out->ladder_sw_p = nan;
  identity_spec(&out->ml);
  out->ml_lambda = out->ml_conf_low = out->ml_conf_high = out->ml_convenient = out->ml_loglik = nan;
  out->ml_skewness = out->ml_sw_w = out->ml_sw_p = nan;
  out->note[0] = '\0';
}

pwb_status pwb_screen_variable(const double* x, size_t n, const pwb_screen_options* opt,
                               pwb_screen_result* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_screen_result");
    capi::need_array(x, n, "x");
    screen_into(x, n, opt, out);
  });
}

pwb_status pwb_screen_variable_with_note(const double* x, size_t n, const pwb_screen_options* opt,
                                         pwb_screen_result* out, char* buf, size_t cap,
                                         size_t* needed) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_screen_result");
    capi::need_array(x, n, "x");
    capi::copy_text(screen_into(x, n, opt, out), buf, cap, needed);
  });
}

}  // extern "C"
