// Box-Tidwell fits from one Q-less factor of [X | y] (see box_tidwell_tall.hpp).
#include "box_tidwell_tall.hpp"

#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/tall_qr.hpp"

namespace powerback {
namespace detail {

bool box_tidwell_tall_r(const Eigen::MatrixXd& x, const Eigen::VectorXd& y, Eigen::MatrixXd& r) {
  const Eigen::Index n = x.rows(), k = x.cols();
  if (n <= k + 1 || y.size() != n || !x.allFinite() || !y.allFinite()) return false;
  Eigen::MatrixXd xy(n, k + 1);
  xy.leftCols(k) = x;
  xy.col(k) = y;
  try {
    TallFactor f = factor_tall(xy.data(), static_cast<std::size_t>(n),
                               static_cast<std::size_t>(k + 1), false, kRankTolerance);
    if (!f.aliased.empty()) return false;
    r = std::move(f.r);
  } catch (const Error& e) {
    if (e.code() == ErrorCode::Cancelled) throw;  // a stop request is not a reason to fall back
    return false;
  }
  return true;
}

Eigen::VectorXd box_tidwell_leading_coefficients(const Eigen::MatrixXd& r, Eigen::Index c) {
  const Eigen::Index y = r.cols() - 1;
  return r.topLeftCorner(c, c).triangularView<Eigen::Upper>().solve(r.col(y).head(c));
}

}  // namespace detail
}  // namespace powerback
