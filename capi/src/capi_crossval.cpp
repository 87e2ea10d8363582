// Cross-validation folds and held-out scores through the C ABI.
#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <memory>

#include "capi_internal.hpp"
#include "capi_sizes.hpp"
#include "capi_transform_handle.hpp"
#include "powerback/crossval.hpp"
#include "powerback/transform.hpp"

using namespace powerback;

extern "C" {

pwb_status pwb_cv_folds(size_t n, int folds, int repeats, unsigned long long seed, int* fold) {
  return capi::guarded([&] {
    capi::need(fold, "fold");
    const std::vector<int> f = make_folds(n, folds, repeats, static_cast<std::uint64_t>(seed));
    std::copy(f.begin(), f.end(), fold);
  });
}

void pwb_cv_fold_options_init(pwb_cv_fold_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_cv_fold_options);
  opt->folds = 5;
  opt->repeats = 1;
  opt->seed = 0;
  opt->strata = nullptr;
  opt->groups = nullptr;
}

pwb_status pwb_cv_folds_by(size_t n, const pwb_cv_fold_options* opt, int* fold) {
  return capi::guarded([&] {
    capi::need_sized(opt, "opt", "pwb_cv_fold_options");
    capi::need(fold, "fold");
    const std::vector<int> f = make_folds_by(n, opt->folds, opt->repeats,
                                             static_cast<std::uint64_t>(opt->seed), opt->strata,
                                             opt->groups);
    std::copy(f.begin(), f.end(), fold);
  });
}

namespace {

pwb_status holdout_score_impl(const double* y, const double* fit, const double* lwr,
                              const double* upr, size_t n, const double* w,
                              pwb_holdout_scores* out) {
  return capi::guarded([&] {
    // callers built before n_point was added pass the smaller struct: fill what it holds
    capi::need(out, "out");
    capi::need_struct(out->struct_size, offsetof(pwb_holdout_scores, n_point),
                      "pwb_holdout_scores");
    const HoldoutScores s = holdout_scores(y, fit, lwr, upr, n, w);
    out->rmse = s.rmse;
    out->mae = s.mae;
    out->r2 = s.r2;
    out->coverage = s.coverage;
    out->mean_width = s.mean_width;
    out->n = s.n;
    out->n_nonfinite = s.n_nonfinite;
    if (out->struct_size >= sizeof(pwb_holdout_scores)) {
      out->n_point = s.n_point;
      out->n_interval = s.n_interval;
      out->median_width = s.median_width;
      out->share_unbounded = s.share_unbounded;
    }
  });
}

}  // namespace

pwb_status pwb_holdout_score(const double* y, const double* fit, const double* lwr,
                             const double* upr, size_t n, pwb_holdout_scores* out) {
  return holdout_score_impl(y, fit, lwr, upr, n, nullptr, out);
}

void pwb_holdout_options_init(pwb_holdout_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_holdout_options);
  opt->weights = nullptr;
}

pwb_status pwb_holdout_score_opts(const double* y, const double* fit, const double* lwr,
                                  const double* upr, size_t n, const pwb_holdout_options* opt,
                                  pwb_holdout_scores* out) {
  const double* w = nullptr;
  if (opt) {
    const pwb_status st = capi::guarded([&] {
      capi::need_struct(opt->struct_size, offsetof(pwb_holdout_options, weights) + sizeof(w),
                        "pwb_holdout_options");
    });
    if (st != PWB_OK) return st;
    w = opt->weights;
  }
  return holdout_score_impl(y, fit, lwr, upr, n, w, out);
}

void pwb_cv_fixed_options_init(pwb_cv_fixed_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_cv_fixed_options);
  opt->intercept = 1;
  opt->level = 0.95;
  opt->weights = nullptr;
}

pwb_status pwb_cv_fixed_predict(const double* y, const double* X, size_t n, size_t p,
                                const pwb_transform* response, const int* fold, int folds,
                                const pwb_cv_fixed_options* opt, pwb_cv_fixed_result* out) {
  return capi::guarded([&] {
    capi::need(y, "y");
    capi::need(fold, "fold");
    capi::need_sized(out, "out", "pwb_cv_fixed_result");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    pwb_cv_fixed_options o;
    pwb_cv_fixed_options_init(&o);
    if (opt) {
      capi::need_sized(opt, "opt", "pwb_cv_fixed_options");
      o = *opt;
    }
    std::unique_ptr<Transform> tr;
    if (response) tr.reset(new Transform(capi::transform_of(response, "response")));
    FixedFoldOptions fo;
    fo.intercept = o.intercept != 0;
    fo.level = o.level;
    fo.weights = o.weights;
    const FixedFoldResult r = crossval_fixed(y, X, n, p, tr.get(), fold, folds, fo);
    auto put = [](const std::vector<double>& v, double* dst) {
      if (dst) std::copy(v.begin(), v.end(), dst);
    };
    put(r.median, out->median);
    put(r.mean, out->mean);
    put(r.lower, out->lower);
    put(r.upper, out->upper);
    put(r.sigma, out->sigma);
    put(r.coefficients, out->coefficients);
    if (out->flags) std::copy(r.flags.begin(), r.flags.end(), out->flags);
    if (out->fold_status) std::copy(r.status.begin(), r.status.end(), out->fold_status);
    if (out->df_residual) std::copy(r.df_residual.begin(), r.df_residual.end(), out->df_residual);
  });
}

}  // extern "C"
