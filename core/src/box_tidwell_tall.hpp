// Box-Tidwell fits from one Q-less factor (internal): the triangular factor R of [X | y] gives
// the least-squares coefficients of y on every leading block of X's columns (lm's rank rule
// depends only on the columns before each one, so a leading block's R is R's leading block),
// and, by one small QR of some of R's columns, the fit on any subset of the columns. Used only
// when no column is aliased; otherwise the callers fall back to LeastSquares, whose errors and
// aliasing rules they report.
#pragma once

#include <Eigen/Dense>

namespace powerback {
namespace detail {

// R (K + 1 square, upper triangular) of [x | y] by factor_tall, K = x.cols(); false (r
// untouched) when an entry is not finite, a column is aliased, or the factorisation fails.
bool box_tidwell_tall_r(const Eigen::MatrixXd& x, const Eigen::VectorXd& y, Eigen::MatrixXd& r);

// Coefficients of y on the first c columns of x, from R of [x | y].
Eigen::VectorXd box_tidwell_leading_coefficients(const Eigen::MatrixXd& r, Eigen::Index c);

}  // namespace detail
}  // namespace powerback
