// powerback/crossval.hpp — the pieces of a fair comparison of transforms: reproducible folds,
// and held-out scores in original units.
//
// Folds: repeated k-fold. Each repeat shuffles the rows (Fisher-Yates driven by a 64-bit
// Mersenne twister seeded from `seed` and the repeat number; the twister's output is fixed by
// the C++ standard and the draw below is unbiased, so folds are the same on every platform)
// and deals them in turn to folds 1..k, so fold sizes differ by at most one.
//
// Scores of predictions p of held-out responses y (n rows, original units):
//   RMSE = sqrt(mean (y - p)^2),  MAE = mean |y - p|,
//   R^2 = 1 - SSE / SST with SST = sum (y - mean y)^2 over the same held-out rows,
//   interval coverage = share of rows with lwr <= y <= upr, mean width = mean (upr - lwr).
// A non-finite prediction (a back-transform beyond its range) is never dropped: it makes the
// scores non-finite and is counted.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

namespace powerback {

// fold[r * n + i] in 1..k: the fold of row i in repeat r (r < repeats). Throws Error(Argument)
// when k < 2, repeats < 1, or n < k ("fewer rows than folds").
std::vector<int> make_folds(std::size_t n, int k, int repeats, std::uint64_t seed);

struct HoldoutScores {
  double rmse = 0, mae = 0, r2 = 0;
  double coverage = 0, mean_width = 0;  // NaN when no interval was given
  std::size_t n = 0;
  std::size_t n_nonfinite = 0;          // rows whose prediction (or interval end) is not finite
};

// lwr and upr may both be NULL (no interval). Throws Error(Argument) for n == 0, NULL y or fit,
// only one of lwr/upr, and IndexedError(NonFinite) for a non-finite y.
HoldoutScores holdout_scores(const double* y, const double* fit, const double* lwr,
                             const double* upr, std::size_t n);

}  // namespace powerback
