// powerback/crossval.hpp — the pieces of a fair comparison of transforms: reproducible folds,
// and held-out scores in original units.
//
// Folds: repeated k-fold. Each repeat shuffles the rows (Fisher-Yates driven by a 64-bit
// Mersenne twister seeded from `seed` and the repeat number; the twister's output is fixed by
// the C++ standard and the draw below is unbiased, so folds are the same on every platform)
// and deals them in turn to folds 1..k, so fold sizes differ by at most one.
//   Stratified: the shuffled rows are ordered by stratum (stable, so rows stay shuffled within
//   a stratum) before dealing, so the rows of a stratum go to consecutive folds: a stratum of m
//   rows lands in min(m, k) folds, hence every stratum with >= 2 rows keeps at least one row in
//   every training part, and fold sizes still differ by at most one.
//   Grouped: all rows of a group share a fold. The groups are shuffled and each goes, in turn,
//   to the fold holding the fewest rows so far (the lowest-numbered fold on ties), so every fold
//   receives a group and fold sizes stay as even as the group sizes allow.
//
// Scores of predictions p of held-out responses y (n rows, original units). Each statistic uses
// the rows where it is defined:
//   point scores (rows with a finite prediction p, counted in n_point):
//     RMSE = sqrt(mean (y - p)^2),  MAE = mean |y - p|,
//     R^2 = 1 - SSE / SST with SST = sum (y - mean y)^2 over the same rows;
//   interval scores (rows whose ends are not NaN, counted in n_interval; an end may be infinite,
//   as when a back-transform's range is unbounded): coverage = share with lwr <= y <= upr (an
//   infinite end covers on its side), mean width = mean (upr - lwr) (infinite as soon as one
//   interval is unbounded), median width, and the share of unbounded intervals.
// Rows without a finite prediction are never dropped silently: they are counted (n_nonfinite).
// Weighted scores (optional precision weights w >= 0, one per row, travelling with the rows):
// every mean above becomes a weighted mean over the same rows (RMSE = sqrt(sum w e^2 / sum w),
// MAE = sum w |e| / sum w, R^2 = 1 - sum w e^2 / sum w (y - ybar_w)^2 with the weighted mean
// ybar_w, coverage, mean width and share unbounded weighted likewise, and the median width the
// weighted median: the first sorted width whose cumulative weight passes half the total, or the
// midpoint of two widths when the cumulative weight meets half exactly, so unit weights give
// the ordinary median). A zero-weight row contributes nothing, as in a weighted least-squares
// fit, but is still counted in n, n_point and n_interval; a statistic whose rows have zero
// total weight is NaN. With unit weights every score equals the unweighted one.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

namespace powerback {

// fold[r * n + i] in 1..k: the fold of row i in repeat r (r < repeats). Throws Error(Argument)
// when k < 2, repeats < 1, or n < k ("fewer rows than folds").
std::vector<int> make_folds(std::size_t n, int k, int repeats, std::uint64_t seed);

// As make_folds, stratified by `strata` or grouped by `groups` (each NULL or n codes >= 0; at
// most one of them given; both NULL gives make_folds' folds). Throws Error(Argument) as
// make_folds, for a negative code, for both given, and for fewer groups than folds.
std::vector<int> make_folds_by(std::size_t n, int k, int repeats, std::uint64_t seed,
                               const int* strata, const int* groups);

struct HoldoutScores {
  double rmse = 0, mae = 0, r2 = 0;     // NaN when no row has a finite prediction
  double coverage = 0, mean_width = 0;  // NaN when no interval was given or none is defined
  std::size_t n = 0;
  std::size_t n_nonfinite = 0;          // rows whose point prediction is not finite
  std::size_t n_point = 0;              // rows scored by rmse, mae and r2
  std::size_t n_interval = 0;           // rows scored by coverage and the widths
  double median_width = 0;              // NaN when no interval was given or none is defined
  double share_unbounded = 0;           // share of the n_interval intervals with an infinite end
};

// lwr and upr may both be NULL (no interval); w may be NULL (unit weights). Throws
// Error(Argument) for n == 0, NULL y or fit, only one of lwr/upr, IndexedError(NonFinite) for a
// non-finite y or weight and IndexedError(Domain) for a negative weight (rows named).
HoldoutScores holdout_scores(const double* y, const double* fit, const double* lwr,
                             const double* upr, std::size_t n, const double* w = nullptr);

}  // namespace powerback
