// powerback/least_squares.hpp — one factorisation of a linear model's design, reused for many
// responses (profile likelihoods, leave-one-out, predictions).
//
// The design is [1 X] (an intercept column is added unless told otherwise). It is factored once
// with Eigen's Householder QR in column order. Rank is detected the way R's lm() does it: a
// column is aliased (dropped, coefficient NA) when its part orthogonal to the columns kept
// before it, |R_jj|, has norm < tol * its own norm (tol = 1e-7 as in lm). A full-rank design
// (the common case) costs one factorisation; each aliased column costs one more.
//
// References: Golub & Van Loan, Matrix Computations, 4th ed., sec. 5.4 (QR with column pivoting);
// Seber & Lee, Linear Regression Analysis, 2nd ed., ch. 3 and 10 (hat matrix, leverages).
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <vector>

namespace powerback {

// lm's tolerance for the rank decision.
constexpr double kRankTolerance = 1e-7;

class LeastSquares {
 public:
  // X: n-by-p predictors, column-major, without an intercept column (one is added first when
  // add_intercept). Throws Error(Argument) for n == 0 or non-finite entries (naming the first
  // offending row and column, 0-based), Error(Singular) when every column is aliased.
  LeastSquares(const double* X, std::size_t n, std::size_t p, bool add_intercept = true,
               double tol = kRankTolerance);
  explicit LeastSquares(const Eigen::MatrixXd& design, double tol = kRankTolerance);

  std::size_t n() const { return static_cast<std::size_t>(design_.rows()); }
  std::size_t columns() const { return static_cast<std::size_t>(design_.cols()); }  // incl. intercept
  std::size_t rank() const { return kept_.size(); }
  std::size_t df_residual() const { return n() - rank(); }
  bool has_intercept() const { return intercept_; }
  const std::vector<std::size_t>& kept() const { return kept_; }        // design columns used
  const std::vector<std::size_t>& aliased() const { return aliased_; }  // design columns dropped
  const Eigen::MatrixXd& design() const { return design_; }

  // Q1' y (rank values): the response's coordinates in the column space.
  Eigen::VectorXd project(const Eigen::VectorXd& y) const;
  // Residual sum of squares ||y - H y||^2 = ||Q2' y||^2 (no cancellation).
  double rss(const Eigen::VectorXd& y) const;
  Eigen::VectorXd fitted(const Eigen::VectorXd& y) const;
  Eigen::VectorXd residuals(const Eigen::VectorXd& y) const;
  // Coefficients for every design column; NaN for aliased ones (as lm's NA).
  Eigen::VectorXd coefficients(const Eigen::VectorXd& y) const;
  // (X_k' X_k)^{-1} over the kept columns, expanded to columns() x columns() with NaN for
  // aliased rows/columns. Multiply by sigma^2 for the coefficient covariance.
  Eigen::MatrixXd unscaled_covariance() const;
  // Diagonal of the hat matrix H = Q1 Q1'.
  Eigen::VectorXd leverages() const;
  // x0' (X_k' X_k)^{-1} x0 for each row x0 of `rows` (m-by-columns(), same column layout as the
  // design, intercept included): the variance factor of a fitted value at new points.
  Eigen::VectorXd variance_factor(const Eigen::MatrixXd& rows) const;

  // Q' y (all n values): the first rank() are the coordinates in the column space, the rest
  // span the residual space, so rss(y) is the squared norm of the tail.
  Eigen::VectorXd rotate(const Eigen::VectorXd& y) const;
  // R (rank x rank, upper triangular, positive diagonal not enforced) of the kept columns, in
  // kept order (no pivoting among them).
  const Eigen::MatrixXd& r() const { return r_; }

 private:
  void factor(double tol);
  Eigen::MatrixXd design_;
  bool intercept_ = true;
  std::vector<std::size_t> kept_, aliased_;
  Eigen::HouseholderQR<Eigen::MatrixXd> qr_;
  Eigen::MatrixXd r_;
  Eigen::MatrixXd r_inv_;  // R^{-1}, rank x rank
};

namespace detail {
// lm's rank rule on the columns of a (the design, or any matrix with the same a'a such as its R):
// columns of zero norm are aliased; the others are factored in order, and the first whose
// |R_jj| < tol * norms(j) depends on the columns before it: it is dropped and the rest factored
// again. On return qr holds the factorisation of the kept columns. Error(Singular) when none is
// left.
void apply_rank_rule(const Eigen::MatrixXd& a, const Eigen::VectorXd& norms, double tol,
                     Eigen::HouseholderQR<Eigen::MatrixXd>& qr, std::vector<std::size_t>& kept,
                     std::vector<std::size_t>& aliased);
}  // namespace detail

}  // namespace powerback
