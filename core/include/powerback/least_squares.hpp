// powerback/least_squares.hpp — one factorisation of a linear model's design, reused for many
// responses (profile likelihoods, leave-one-out, predictions).
//
// The design is [1 X] (an intercept column is added unless told otherwise). Each column is first
// scaled by a power of two that brings its largest magnitude into [0.5, 1): the scaling is exact,
// so the results are those of the unscaled design, but columns of magnitude 1e-200 or 1e+200 are
// factored without their norms underflowing or overflowing (results do not depend on units).
//
// The scaled design is factored by Householder QR in column order, with no pivoting among the
// kept columns. Rank is decided as R's lm() decides it: a column is aliased (dropped, coefficient
// NaN as lm's NA) when the norm of its part orthogonal to the columns kept before it, |R_jj|, is
// below tol * its own norm (tol = 1e-7 as in lm); once as many columns are kept as there are
// rows, every later column is aliased. The aliased columns are moved out as the factorisation
// reaches them (lm's limited pivoting), so the whole decision costs one factorisation: Eigen's
// blocked Householder QR up to the first aliased column, then Eigen's Householder reflectors one
// column at a time from there on.
//
// References: Golub & Van Loan, Matrix Computations, 4th ed., sec. 5.2 (Householder QR) and
// sec. 5.4 (rank-revealing QR); Seber & Lee, Linear Regression Analysis, 2nd ed., ch. 3 and 10
// (hat matrix, leverages).
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <memory>
#include <vector>

namespace powerback {

// lm's tolerance for the rank decision.
constexpr double kRankTolerance = 1e-7;

class LeastSquares {
 public:
  // X: n-by-p predictors, column-major, without an intercept column (one is added first when
  // add_intercept). Throws Error(Argument) for n == 0, no columns or a NULL X with p > 0,
  // Error(NonFinite) for a non-finite entry (naming the first offending row and column,
  // 0-based), Error(Singular) when every column is aliased, Error(Cancelled) when the thread's
  // cancellation check (cancel.hpp) says stop during a long rank decision.
  LeastSquares(const double* X, std::size_t n, std::size_t p, bool add_intercept = true,
               double tol = kRankTolerance);
  // design: the full design (column 0 counts as an intercept when it is all ones). Throws
  // Error(Argument) for an empty or non-finite design; otherwise as above.
  explicit LeastSquares(const Eigen::MatrixXd& design, double tol = kRankTolerance);

  // A design kept for one response fitted by factor_with_response(), which must be called
  // before anything else: the rows are read once in blocks (the Q-less factor of [design | y],
  // see tall_qr.hpp) and Q is built only if a later call needs it. Same validation as above.
  struct Deferred {};
  LeastSquares(Deferred, const double* X, std::size_t n, std::size_t p, bool add_intercept);
  LeastSquares(Deferred, Eigen::MatrixXd design);
  // A borrowed design, read in place and never copied: `design` is the full n-by-columns design
  // (column-major; its first column all ones when `intercept_column`, checked), and the caller
  // keeps it alive and unchanged for the life of this object and of every copy of it (copies
  // share the same buffer). Throws Error(Argument) for n == 0, no columns, a NULL design or a
  // first column that is not all ones when `intercept_column`; Error(NonFinite) naming the first
  // non-finite predictor (its column counted without the intercept, 0-based).
  struct Borrowed {};
  LeastSquares(Deferred, Borrowed, const double* design, std::size_t n, std::size_t columns,
               bool intercept_column);
  // The coefficients (NaN where aliased) and the residual sum of squares of y.
  struct ResponseFit {
    Eigen::VectorXd coefficients;
    double rss = 0;
  };
  // Factors [design | y] block by block (R and Q'y of the appended column give the coefficients
  // and the RSS; lm's rank rule on the design's part of R, as factor_tall applies it). Throws
  // Error(Argument) when y's length differs from the rows or y is not finite, otherwise as the
  // constructors above.
  ResponseFit factor_with_response(const Eigen::VectorXd& y, double tol = kRankTolerance);

  std::size_t n() const { return static_cast<std::size_t>(rows_); }
  std::size_t columns() const { return static_cast<std::size_t>(cols_); }  // incl. intercept
  std::size_t rank() const { return kept_.size(); }
  std::size_t df_residual() const { return n() - rank(); }
  bool has_intercept() const { return intercept_; }
  const std::vector<std::size_t>& kept() const { return kept_; }        // design columns used
  const std::vector<std::size_t>& aliased() const { return aliased_; }  // design columns dropped
  // The unscaled design, owned or borrowed: bind it as `const auto d = ls.design();` (binding it
  // to a `const Eigen::MatrixXd&` would copy it).
  Eigen::Map<const Eigen::MatrixXd> design() const {
    return Eigen::Map<const Eigen::MatrixXd>(borrowed_ ? borrowed_ : design_.data(), rows_, cols_);
  }
  bool borrowed_design() const { return borrowed_ != nullptr; }

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
  // Its diagonal alone (NaN for aliased columns), without the columns() x columns() matrix: on
  // wide designs (10,000 columns, most of them aliased) that matrix alone is 800 MB.
  Eigen::VectorXd unscaled_variances() const;
  // Diagonal of the hat matrix H = Q1 Q1' (as ||R^{-T} x_i||^2 for a factor built by
  // factor_with_response, which keeps no Q; computed at the first call and kept).
  Eigen::VectorXd leverages() const;
  // x0' (X_k' X_k)^{-1} x0 for each row x0 of `rows` (m-by-columns(), same column layout as the
  // design, intercept included): the variance factor of a fitted value at new points.
  Eigen::VectorXd variance_factor(const Eigen::Ref<const Eigen::MatrixXd>& rows) const;

  // Q' y (all n values): the first rank() are the coordinates in the column space, the rest
  // span the residual space, so rss(y) is the squared norm of the tail.
  Eigen::VectorXd rotate(const Eigen::VectorXd& y) const;
  // R (rank x rank, upper triangular, positive diagonal not enforced) of the kept columns of the
  // unscaled design, in kept order (no pivoting among them): R'R = X_k'X_k.
  const Eigen::MatrixXd& r() const { return r_; }

 private:
  void factor(double tol);
  // Householder vectors below the diagonal (kept columns of the scaled design, as Eigen packs
  // them) and their coefficients; built at construction, or at first need after
  // factor_with_response (set once through atomic shared_ptr operations: const calls stay safe
  // from several threads).
  struct Householder {
    Eigen::MatrixXd packed;
    Eigen::VectorXd hcoeffs;
  };
  std::shared_ptr<const Householder> householder() const;
  void set_shape() {
    rows_ = design_.rows();
    cols_ = design_.cols();
  }
  Eigen::MatrixXd design_;              // the design when owned (empty when borrowed)
  const double* borrowed_ = nullptr;    // the caller's design when borrowed
  Eigen::Index rows_ = 0, cols_ = 0;    // the design's shape, owned or borrowed
  bool intercept_ = true;
  bool qless_ = false;  // factored by factor_with_response
  std::vector<std::size_t> kept_, aliased_;
  mutable std::shared_ptr<const Householder> householder_;
  mutable std::shared_ptr<const Eigen::VectorXd> leverages_;  // factor_with_response only
  Eigen::VectorXd kscale_;   // the power-of-two scale of each kept column
  Eigen::MatrixXd r_;
  Eigen::MatrixXd r_inv_;  // R^{-1}, rank x rank
};

namespace detail {

// Powers of two that bring each column's largest magnitude into [0.5, 1) (1 for a zero column).
// Multiplying by them is exact.
Eigen::VectorXd column_scales(const Eigen::Ref<const Eigen::MatrixXd>& a);

// The Householder QR of a matrix's kept columns, packed as Eigen's HouseholderQR packs it.
struct RankedQR {
  Eigen::MatrixXd packed;  // rows x rank: R on and above the diagonal, reflectors below
  Eigen::VectorXd hcoeffs;  // rank reflector coefficients
  std::vector<std::size_t> kept, aliased;  // ascending column indices of a
};

// lm's rank rule on the columns of a (the design, or any matrix with the same a'a such as its R):
// columns of zero norm are aliased; the others are factored in order, and each whose |R_jj| <
// tol * norms(j) depends on the columns kept before it and is aliased, as are all columns after
// min(rows, columns) kept ones. One factorisation in all. Error(Singular) when none is kept;
// polls the thread's cancellation check between columns once past the first aliased one.
RankedQR apply_rank_rule(const Eigen::MatrixXd& a, const Eigen::VectorXd& norms, double tol);

}  // namespace detail

}  // namespace powerback
