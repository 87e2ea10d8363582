// Box-Tidwell powers through the C ABI.
#include <cmath>
#include <vector>

#include "capi_internal.hpp"
#include "capi_sizes.hpp"
#include "powerback/box_tidwell.hpp"

using namespace powerback;

extern "C" {

void pwb_box_tidwell_options_init(pwb_box_tidwell_options* opt) {
  if (!opt) return;
  const BoxTidwellOptions d;
  opt->struct_size = sizeof(pwb_box_tidwell_options);
  opt->max_iter = d.max_iter;
  opt->tol = d.tol;
  opt->max_abs_power = d.max_abs_power;
}

pwb_status pwb_box_tidwell(const double* y, const double* Z, size_t n, size_t q, const double* X,
                           size_t m, const pwb_box_tidwell_options* opt, double* alpha, double* se,
                           double* score_t, double* score_p, double* history,
                           pwb_box_tidwell_result* out) {
  return capi::guarded([&] {
    capi::need(y, "y");
    capi::need_array(Z, capi::checked_matrix_size(n, q, "Z"), "Z");
    capi::need(X, "X");
    (void)capi::checked_matrix_size(n, m, "X");
    capi::need(alpha, "alpha");
    capi::need(se, "se");
    capi::need_sized(out, "out", "pwb_box_tidwell_result");
    BoxTidwellOptions o;
    if (opt) {
      capi::need_struct(opt->struct_size, sizeof(pwb_box_tidwell_options), "pwb_box_tidwell_options");
      o.max_iter = opt->max_iter;
      o.tol = opt->tol;
      o.max_abs_power = opt->max_abs_power;
    }
    const BoxTidwellResult r = box_tidwell(y, Z, n, q, X, m, o);
    for (std::size_t j = 0; j < m; ++j) {
      alpha[j] = r.alpha[j];
      se[j] = r.se[j];
      if (score_t) score_t[j] = r.score_t[j];
      if (score_p) score_p[j] = r.score_p[j];
    }
    if (history) {
      const std::size_t cols = static_cast<std::size_t>(o.max_iter) + 1;
      for (std::size_t k = 0; k < cols; ++k)
        for (std::size_t j = 0; j < m; ++j)
          history[k * m + j] = k < r.history.size() ? r.history[k][j] : NAN;
    }
    out->iterations = r.iterations;
    out->converged = r.converged ? 1 : 0;
    out->last_change = r.last_change;
    out->score_df = r.score_df;
    out->n = r.n;
  });
}

}  // extern "C"
