// Cross-validation folds and held-out scores through the C ABI.
#include <algorithm>
#include <cstdint>

#include "capi_internal.hpp"
#include "powerback/crossval.hpp"

using namespace powerback;

extern "C" {

pwb_status pwb_cv_folds(size_t n, int folds, int repeats, unsigned long long seed, int* fold) {
  return capi::guarded([&] {
    capi::need(fold, "fold");
    const std::vector<int> f = make_folds(n, folds, repeats, static_cast<std::uint64_t>(seed));
    std::copy(f.begin(), f.end(), fold);
  });
}

pwb_status pwb_holdout_score(const double* y, const double* fit, const double* lwr,
                             const double* upr, size_t n, pwb_holdout_scores* out) {
  return capi::guarded([&] {
    capi::need_sized(out, "out", "pwb_holdout_scores");
    const HoldoutScores s = holdout_scores(y, fit, lwr, upr, n);
    out->rmse = s.rmse;
    out->mae = s.mae;
    out->r2 = s.r2;
    out->coverage = s.coverage;
    out->mean_width = s.mean_width;
    out->n = s.n;
    out->n_nonfinite = s.n_nonfinite;
  });
}

}  // extern "C"
