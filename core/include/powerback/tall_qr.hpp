// powerback/tall_qr.hpp — the triangular factor R of a tall design [1 X], without Q, in one
// pass over the rows.
//
// The rows are taken in blocks; each block is stacked under the R found so far and the stack is
// factored with Eigen's Householder QR, whose leading rows are the new R. After the last block
// R'R = X'X (a tall-skinny QR: the design is read once and the working set is one block, so the
// factorisation runs in cache instead of sweeping the whole matrix once per column). Q is never
// formed: callers that need projections of one response use R and X'z, or LeastSquares.
//
// Each column is scaled by the power of two that brings its largest magnitude into [0.5, 1)
// before it is factored (exact, so R is that of the unscaled design; no norm underflows or
// overflows for columns of magnitude 1e-200 or 1e+200). Fewer rows than columns leave R with as
// many rows as the design: a wide design costs one QR of n x columns.
//
// Rank is then decided on R exactly as LeastSquares decides it on the full design (lm's rule): a
// column is aliased when its part orthogonal to the columns kept before it has norm below
// tol * its own norm. Both norms are functions of X'X = R'R alone, so R gives the same answer,
// in one more factorisation of the small matrix R (detail::apply_rank_rule).
//
// References: Golub & Van Loan, Matrix Computations, 4th ed., sec. 5.2 (Householder QR);
//   Demmel, Grigori, Hoemmen & Langou (2012),
//   Communication-optimal parallel and sequential QR and LU factorizations, SIAM J. Sci.
//   Comput. 34, A206-A239 (the tall-skinny QR).
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <functional>
#include <vector>

#include "powerback/least_squares.hpp"

namespace powerback {

struct TallFactor {
  std::size_t n = 0;         // rows
  std::size_t columns = 0;   // design columns, intercept included
  bool intercept = true;     // column 0 is the added intercept
  std::vector<std::size_t> kept, aliased;  // design columns used / dropped (ascending)
  Eigen::MatrixXd r;         // rank x rank, upper triangular, the kept columns in design order
  std::size_t rank() const { return kept.size(); }
};

// Called with each block of design rows [r0, r0 + block.rows()), every column (the intercept
// first when one is added), before the block is factored; the block is valid during the call only.
using DesignBlockVisitor =
    std::function<void(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block)>;

// Rows per block: a block of a few hundred kilobytes stays in cache while it is factored.
constexpr std::size_t kTallBlockRows = 4096;

// X: n-by-p predictors, column-major, without an intercept column (one is added first when
// add_intercept). Errors as LeastSquares: Error(Argument) for n == 0 or no columns,
// Error(NonFinite) naming the first non-finite entry's column and row (0-based),
// Error(Singular) when every column is aliased, Error(Cancelled) when the thread's cancellation
// check says stop (polled once per block). visit (optional) sees every block once, in order.
TallFactor factor_tall(const double* X, std::size_t n, std::size_t p, bool add_intercept = true,
                       double tol = kRankTolerance,
                       const DesignBlockVisitor& visit = {});

}  // namespace powerback
