// powerback/crossval.hpp — the pieces of a fair comparison of transforms: reproducible folds,
// held-out scores in original units, and the fits of every fold for fixed transforms from one
// factor per fold (crossval_fixed, at the end).
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

#include "powerback/least_squares.hpp"
#include "powerback/transform.hpp"

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

// Fits in every training part of one k-fold split for a model whose transforms are fixed (they
// learn nothing from the rows, so transforming every row once leaks nothing between folds).
//
// z = T(y) regressed on [1 X] as Model does (lm's rank rule; precision weights as in model.hpp).
// Instead of one factorisation of each training part, each fold's block of rows is factored
// once: the Q-less R_b of its rows of [X | z] (sqrt(w)-weighted rows of positive weight; blocked
// Householder QR with exact power-of-two column scales, as LeastSquares::factor_with_response
// does). The training part of fold j is the union of the other blocks, and the QR of the
// stacked R_b (b != j: k - 1 triangles of (columns + 1) rows) has R'R = [X z]'[X z] over the
// training rows, so it is a QR of the training rows: same coefficients, RSS and rank decision as
// a fit on those rows, up to rounding. Sigma, the smearing residuals (e, or sqrt(w) e over rows
// of positive weight) and the held-out predictions (back-transformed median, smearing mean and
// the prediction interval of a new row of weight 1 at `level`) then follow as in Model::predict.
// Cost: one pass over the rows per fold for residuals and predictions, O(k n columns) in all.
//
// A fold is fitted (FoldFit::Ok) only when a fit on its training part would succeed unchanged;
// otherwise its held-out outputs stay NaN and its status says why, so a caller can refit that
// fold the slow way and report the failure in its own words:
//   InvalidTraining: a training row has a non-finite predictor, or T cannot be applied to its
//     y, or no training row has a positive weight;
//   RankDeficient: lm's rule drops a column of the training design;
//   NoResidualDf: the training rows of positive weight are no more than the columns.
enum class FoldFit : int { Ok = 0, RankDeficient = 1, NoResidualDf = 2, InvalidTraining = 3 };

struct FixedFoldOptions {
  bool intercept = true;            // add an intercept column
  double level = 0.95;              // of the prediction intervals
  const double* weights = nullptr;  // n precision weights >= 0, or null for none
  double tol = kRankTolerance;      // lm's rank tolerance
};

struct FixedFoldResult {
  std::size_t columns = 0;  // design columns, intercept included
  // n values each: the prediction of every row from the fit without its fold (NaN where the
  // fold was not fitted or the row has a non-finite predictor).
  std::vector<double> median, mean, lower, upper;
  // n: kPredMissing (non-finite predictor), kPredOverflow (x'b or the interval overflowed),
  // kPredBounded (the median or an interval end met the back-transform's range limit).
  std::vector<unsigned> flags;
  // k values each (fold j at j - 1): FoldFit, rank, residual df, sigma-hat; k * columns
  // coefficients (fold-major, NaN for a fold not fitted).
  std::vector<int> status;
  std::vector<std::size_t> rank, df_residual;
  std::vector<double> sigma, coefficients;
};

// y: n raw responses; X: n-by-p predictors, column-major, no intercept column (NaN marks a row
// whose predictor transform failed); response: T (null for the identity); fold: n ids in 1..k.
// Throws Error(Argument) for n == 0, k < 2, a NULL array, a fold id outside 1..k or an empty
// fold, a level outside (0, 1); IndexedError(Domain) naming rows of negative or non-finite
// weights; Error(Cancelled) when the thread's cancellation check says stop.
FixedFoldResult crossval_fixed(const double* y, const double* X, std::size_t n, std::size_t p,
                               const Transform* response, const int* fold, int k,
                               const FixedFoldOptions& opt = {});

}  // namespace powerback
