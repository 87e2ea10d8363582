// The blocked, Q-less QR of a tall design and lm's rank rule applied to its R (see tall_qr.hpp).
#include "powerback/tall_qr.hpp"

#include <algorithm>
#include <cmath>
#include <string>

#include "powerback/cancel.hpp"
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

// lm's rule on R_s (c x c, the R of the scaled design: R_s'R_s = S X'X S), which needs only the
// columns' norms and inner products; the scaling does not change the decision. out.r is unscaled.
void decide_rank(const Eigen::MatrixXd& r_all, const Eigen::VectorXd& scale, double tol,
                 TallFactor& out) {
  const Eigen::VectorXd norms = r_all.colwise().norm().transpose();  // ||R e_j|| = ||X e_j||
  detail::RankedQR q = detail::apply_rank_rule(r_all, norms, tol);
  out.kept = std::move(q.kept);
  out.aliased = std::move(q.aliased);
  const Eigen::Index k = static_cast<Eigen::Index>(out.kept.size());
  Eigen::VectorXd inv(k);
  for (Eigen::Index i = 0; i < k; ++i)
    inv(i) = 1.0 / scale(static_cast<Eigen::Index>(out.kept[static_cast<std::size_t>(i)]));
  const Eigen::MatrixXd rs = q.packed.topLeftCorner(k, k).triangularView<Eigen::Upper>();
  out.r = rs * inv.asDiagonal();
}

// The power-of-two scale of each design column (see detail::column_scales), from one read of X.
Eigen::VectorXd tall_scales(const double* X, std::size_t n, std::size_t p, bool add_intercept) {
  const Eigen::Index c0 = add_intercept ? 1 : 0;
  Eigen::VectorXd s(static_cast<Eigen::Index>(p) + c0);
  if (add_intercept) s(0) = 0.5;  // 1 = 0.5 * 2^1
  for (std::size_t j = 0; j < p; ++j) {
    double m = 0;
    for (std::size_t i = 0; i < n; ++i) m = std::max(m, std::fabs(X[j * n + i]));  // NaN skipped
    int e = 0;
    if (m > 0 && std::isfinite(m)) std::frexp(m, &e);
    s(static_cast<Eigen::Index>(j) + c0) = std::ldexp(1.0, -e);
  }
  return s;
}

}  // namespace

TallFactor factor_tall(const double* X, std::size_t n, std::size_t p, bool add_intercept, double tol,
                       const DesignBlockVisitor& visit) {
  require(n > 0, "the design has no rows");
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  const std::size_t cols = p + (add_intercept ? 1 : 0);
  require(cols > 0, "the design has no columns");
  const Eigen::Index c = static_cast<Eigen::Index>(cols), c0 = add_intercept ? 1 : 0;

  // Each step factors [R; block]: (k + rows) x c, where R holds k = min(rows so far, c) rows
  // (upper trapezoidal while fewer than c rows have been seen). The first step is the plain QR
  // of the first block, so a wide design (n < c) costs one QR of n x c, never of c x c.
  const Eigen::VectorXd scale = tall_scales(X, n, p, add_intercept);
  Eigen::MatrixXd r_all(0, c);
  Eigen::MatrixXd work;
  for (std::size_t r0 = 0; r0 < n; r0 += kTallBlockRows) {
    const std::size_t rows = std::min(kTallBlockRows, n - r0);
    const Eigen::Index nr = static_cast<Eigen::Index>(rows), k = r_all.rows();
    if (work.rows() != k + nr) work.resize(k + nr, c);
    if (add_intercept) work.block(k, 0, nr, 1).setOnes();
    for (std::size_t j = 0; j < p; ++j)
      work.block(k, static_cast<Eigen::Index>(j) + c0, nr, 1) =
          Eigen::Map<const Eigen::VectorXd>(X + j * n + r0, nr);
    if (!work.bottomRows(nr).allFinite()) non_finite_at(X, n, p, r0, rows);
    if (visit) visit(r0, work.bottomRows(nr));
    work.bottomRows(nr).array().rowwise() *= scale.transpose().array();
    work.topRows(k) = r_all;
    poll_cancel();
    // Factored in place (no copy of the block); R is left in the upper triangle.
    const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(work);
    const Eigen::Index k_new = std::min<Eigen::Index>(k + nr, c);
    r_all = work.topRows(k_new).triangularView<Eigen::Upper>();
  }

  TallFactor out;
  out.n = n;
  out.columns = cols;
  out.intercept = add_intercept;
  decide_rank(r_all, scale, tol, out);
  return out;
}

}  // namespace powerback
