// The blocked, Q-less QR of a tall design and lm's rank rule applied to its R (see tall_qr.hpp).
#include "powerback/tall_qr.hpp"

#include <algorithm>
#include <cmath>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {
namespace {

[[noreturn]] void non_finite_at(const double* X, std::size_t n, std::size_t p, std::size_t r0,
                                std::size_t rows) {
  for (std::size_t j = 0; j < p; ++j)
    for (std::size_t i = r0; i < r0 + rows; ++i)
      if (!std::isfinite(X[j * n + i]))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j) + " has a " +
                                              "non-finite value at row " + std::to_string(i) +
                                              " (0-based): remove or impute it first");
  throw Error(ErrorCode::NonFinite, "the predictors have a non-finite value");
}

// lm's rule on R (c x c, R'R = X'X), which needs only the columns' norms and inner products.
void decide_rank(const Eigen::MatrixXd& r_all, double tol, TallFactor& out) {
  const Eigen::VectorXd norms = r_all.colwise().norm().transpose();  // ||R e_j|| = ||X e_j||
  Eigen::HouseholderQR<Eigen::MatrixXd> qr;
  detail::apply_rank_rule(r_all, norms, tol, qr, out.kept, out.aliased);
  const Eigen::Index k = static_cast<Eigen::Index>(out.kept.size());
  out.r = qr.matrixQR().topLeftCorner(k, k).triangularView<Eigen::Upper>();
}

}  // namespace

TallFactor factor_tall(const double* X, std::size_t n, std::size_t p, bool add_intercept, double tol,
                       const DesignBlockVisitor& visit) {
  require(n > 0, "the design has no rows");
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  const std::size_t cols = p + (add_intercept ? 1 : 0);
  require(cols > 0, "the design has no columns");
  const Eigen::Index c = static_cast<Eigen::Index>(cols), c0 = add_intercept ? 1 : 0;

  // Each step factors [R; block]: (c + rows) x c. R starts at zero, so the first step is the
  // plain QR of the first block; fewer than c rows in all leave zero rows at the bottom of R.
  Eigen::MatrixXd r_all = Eigen::MatrixXd::Zero(c, c);
  Eigen::MatrixXd work;
  for (std::size_t r0 = 0; r0 < n; r0 += kTallBlockRows) {
    const std::size_t rows = std::min(kTallBlockRows, n - r0);
    const Eigen::Index nr = static_cast<Eigen::Index>(rows);
    if (work.rows() != c + nr) work.resize(c + nr, c);
    if (add_intercept) work.block(c, 0, nr, 1).setOnes();
    for (std::size_t j = 0; j < p; ++j)
      work.block(c, static_cast<Eigen::Index>(j) + c0, nr, 1) =
          Eigen::Map<const Eigen::VectorXd>(X + j * n + r0, nr);
    if (!work.bottomRows(nr).allFinite()) non_finite_at(X, n, p, r0, rows);
    if (visit) visit(r0, work.bottomRows(nr));
    work.topRows(c) = r_all;
    // Factored in place (no copy of the block); R is left in the upper triangle.
    const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(work);
    r_all = work.topRows(c).triangularView<Eigen::Upper>();
  }

  TallFactor out;
  out.n = n;
  out.columns = cols;
  out.intercept = add_intercept;
  decide_rank(r_all, tol, out);
  return out;
}

}  // namespace powerback
