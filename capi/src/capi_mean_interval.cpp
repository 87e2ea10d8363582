// Intervals for the original-scale mean through the C ABI (core: powerback/mean_interval.hpp).
#include <cstddef>
#include <string>

#include "capi_internal.hpp"
#include "capi_model_handle.hpp"
#include "capi_sizes.hpp"
#include "powerback/mean_interval.hpp"

using namespace powerback;

namespace {

MeanIntervalOptions options_of(const pwb_mean_interval_options* opt) {
  pwb_mean_interval_options o;
  pwb_mean_interval_options_init(&o);
  if (opt) {
    capi::need_struct(opt->struct_size, sizeof(pwb_mean_interval_options), "pwb_mean_interval_options");
    o = *opt;
  }
  MeanIntervalOptions mo;
  mo.level = o.level;
  switch (capi::enum_value(o.mean_method)) {
    case PWB_MEAN_SMEARING: mo.mean_method = MeanMethod::Smearing; break;
    case PWB_MEAN_NORMAL: mo.mean_method = MeanMethod::Normal; break;
    default: throw Error(ErrorCode::Argument, "unknown mean method " + std::to_string(capi::enum_value(o.mean_method)));
  }
  switch (capi::enum_value(o.method)) {
    case PWB_MEAN_INTERVAL_DELTA: mo.method = MeanIntervalMethod::Delta; break;
    case PWB_MEAN_INTERVAL_BOOTSTRAP: mo.method = MeanIntervalMethod::Bootstrap; break;
    default:
      throw Error(ErrorCode::Argument, "unknown mean interval method " + std::to_string(capi::enum_value(o.method)));
  }
  mo.replicates = o.replicates;
  mo.seed = static_cast<std::uint64_t>(o.seed);
  return mo;
}

void copy_out(const std::vector<double>& v, double* out) {
  if (!out) return;
  for (std::size_t i = 0; i < v.size(); ++i) out[i] = v[i];
}

}  // namespace

extern "C" {

void pwb_mean_interval_options_init(pwb_mean_interval_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_mean_interval_options);
  opt->level = 0.95;
  opt->mean_method = PWB_MEAN_SMEARING;
  opt->method = PWB_MEAN_INTERVAL_DELTA;
  opt->replicates = 999;
  opt->seed = 1;
  opt->group = nullptr;
  opt->n_groups = 0;
}

pwb_status pwb_model_predict_mean_interval(const pwb_model* m, const double* Xnew, size_t rows,
                                           size_t p, const pwb_mean_interval_options* opt,
                                           double* fit, double* se, double* lwr, double* upr,
                                           unsigned* flags, size_t outputs) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_array(fit, outputs, "fit");
    capi::need_array(Xnew, capi::checked_matrix_size(rows, p, "Xnew"), "Xnew");
    const MeanIntervalOptions mo = options_of(opt);
    const std::size_t* group = opt ? opt->group : nullptr;
    const std::size_t n_groups = opt ? opt->n_groups : 0;
    capi::need_array(group, group ? rows : 0, "group");
    const std::size_t want = group ? n_groups : rows;
    require(outputs == want, "outputs is " + std::to_string(outputs) + " but the call gives " +
                                 std::to_string(want) + (group ? " groups" : " rows"));
    const MeanIntervals r = mean_intervals(m->impl, Xnew, rows, p, group, n_groups, mo);
    copy_out(r.fit, fit);
    copy_out(r.se, se);
    copy_out(r.lower, lwr);
    copy_out(r.upper, upr);
    if (flags)
      for (std::size_t k = 0; k < r.flags.size(); ++k) flags[k] = r.flags[k];
  });
}

}  // extern "C"

static_assert(PWB_PRED_BOUNDED == powerback::kPredBounded && PWB_PRED_MISSING == powerback::kPredMissing &&
                  PWB_MEAN_LINEAR_SCALE == powerback::kMeanLinearScale &&
                  PWB_MEAN_REPLICATE_FAILED == powerback::kMeanReplicateFailed,
              "the C flags are the core's");
