// Box-Tidwell powers through the C ABI.
#include <cmath>
#include <cstddef>
#include <vector>

#include "capi_internal.hpp"
#include "capi_sizes.hpp"
#include "powerback/box_tidwell.hpp"

using namespace powerback;

namespace {

// The 0.1 sizes: the structs before the fields appended in 0.2.
constexpr std::size_t kOptionsSize01 = offsetof(pwb_box_tidwell_options, level);
constexpr std::size_t kResultSize01 = offsetof(pwb_box_tidwell_result, alpha);

// A caller's field is present when its struct_size covers it.
template <class T>
bool has(const T* s, std::size_t offset, std::size_t size) {
  return s->struct_size >= offset + size;
}

BoxTidwellOptions options_of(const pwb_box_tidwell_options* opt) {
  BoxTidwellOptions o;
  if (!opt) return o;
  capi::need_struct(opt->struct_size, kOptionsSize01, "pwb_box_tidwell_options");
  o.max_iter = opt->max_iter;
  o.tol = opt->tol;
  o.max_abs_power = opt->max_abs_power;
  if (has(opt, offsetof(pwb_box_tidwell_options, level), sizeof opt->level)) o.level = opt->level;
  if (has(opt, offsetof(pwb_box_tidwell_options, weights), sizeof opt->weights))
    o.weights = opt->weights;
  return o;
}

struct Buffers {
  double *alpha = nullptr, *se = nullptr, *conf_low = nullptr, *conf_high = nullptr;
  double *score_t = nullptr, *score_p = nullptr, *suggested = nullptr, *history = nullptr;
  int* advice = nullptr;
};

void run(const double* y, const double* Z, size_t n, size_t q, const double* X, size_t m,
         const pwb_box_tidwell_options* opt, const Buffers& b, pwb_box_tidwell_result* out) {
  capi::need(y, "y");
  capi::need_array(Z, capi::checked_matrix_size(n, q, "Z"), "Z");
  capi::need(X, "X");
  (void)capi::checked_matrix_size(n, m, "X");
  const BoxTidwellOptions o = options_of(opt);
  const BoxTidwellResult r = box_tidwell(y, Z, n, q, X, m, o);
  const auto put = [m](double* dst, const std::vector<double>& v) {
    if (dst)
      for (std::size_t j = 0; j < m; ++j) dst[j] = v[j];
  };
  put(b.alpha, r.alpha);
  put(b.se, r.se);
  put(b.conf_low, r.conf_low);
  put(b.conf_high, r.conf_high);
  put(b.score_t, r.score_t);
  put(b.score_p, r.score_p);
  put(b.suggested, r.suggested);
  if (b.advice)
    for (std::size_t j = 0; j < m; ++j) b.advice[j] = static_cast<int>(r.advice[j]);
  if (b.history) {
    const std::size_t cols = static_cast<std::size_t>(o.max_iter) + 1;
    for (std::size_t k = 0; k < cols; ++k)
      for (std::size_t j = 0; j < m; ++j)
        b.history[k * m + j] = k < r.history.size() ? r.history[k][j] : NAN;
  }
  out->iterations = r.iterations;
  out->converged = r.converged ? 1 : 0;
  out->last_change = r.last_change;
  out->score_df = r.score_df;
  out->n = r.n;
}

}  // namespace

static_assert(static_cast<int>(BoxTidwellAdvice::Linear) == PWB_BT_LINEAR &&
                  static_cast<int>(BoxTidwellAdvice::Log) == PWB_BT_LOG &&
                  static_cast<int>(BoxTidwellAdvice::Power) == PWB_BT_POWER,
              "the C advice codes mirror the core's");

extern "C" {

void pwb_box_tidwell_options_init(pwb_box_tidwell_options* opt) {
  if (!opt) return;
  const BoxTidwellOptions d;
  opt->struct_size = sizeof(pwb_box_tidwell_options);
  opt->max_iter = d.max_iter;
  opt->tol = d.tol;
  opt->max_abs_power = d.max_abs_power;
  opt->level = d.level;
  opt->weights = nullptr;
}

pwb_status pwb_box_tidwell_fit(const double* y, const double* Z, size_t n, size_t q,
                               const double* X, size_t m, const pwb_box_tidwell_options* opt,
                               pwb_box_tidwell_result* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_box_tidwell_result");
    Buffers b;
    b.alpha = out->alpha;
    b.se = out->se;
    b.conf_low = out->conf_low;
    b.conf_high = out->conf_high;
    b.score_t = out->score_t;
    b.score_p = out->score_p;
    b.advice = out->advice;
    b.suggested = out->suggested;
    b.history = out->history;
    run(y, Z, n, q, X, m, opt, b, out);
  });
}

pwb_status pwb_box_tidwell(const double* y, const double* Z, size_t n, size_t q, const double* X,
                           size_t m, const pwb_box_tidwell_options* opt, double* alpha, double* se,
                           double* score_t, double* score_p, double* history,
                           pwb_box_tidwell_result* out) {
  return capi::guarded([&] {
    capi::need(alpha, "alpha");
    capi::need(se, "se");
    capi::need(out, "out");
    capi::need_struct(out->struct_size, kResultSize01, "pwb_box_tidwell_result");
    Buffers b;
    b.alpha = alpha;
    b.se = se;
    b.score_t = score_t;
    b.score_p = score_p;
    b.history = history;
    run(y, Z, n, q, X, m, opt, b, out);
  });
}

}  // extern "C"
