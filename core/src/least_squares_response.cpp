// LeastSquares::factor_with_response: one blocked pass over [design | y] gives R, the
// coefficients and the RSS without forming Q (see least_squares.hpp and tall_qr.hpp).
#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <string>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/tall_qr.hpp"

namespace powerback {

LeastSquares::ResponseFit LeastSquares::factor_with_response(const Eigen::VectorXd& y, double tol) {
  using Eigen::Index;
  const Index n = design().rows(), c = design().cols();
  require(y.size() == n, "the response has " + std::to_string(y.size()) +
                             " values but the design has " + std::to_string(n) + " rows");
  require(y.allFinite(), "the response has non-finite values");
  // A new factor: whatever was built from an earlier one is dropped.
  qless_ = true;
  std::atomic_store(&householder_, std::shared_ptr<const Householder>());
  std::atomic_store(&leverages_, std::shared_ptr<const Eigen::VectorXd>());

  // Exact power-of-two scales of the columns and of y (their largest magnitude in [0.5, 1)).
  const Eigen::VectorXd s = detail::column_scales(design());
  double ymax = y.cwiseAbs().maxCoeff();
  int e = 0;
  if (ymax > 0) std::frexp(ymax, &e);
  const double sy = std::ldexp(1.0, -e);

  // Each step factors [R; block] in place, R holding min(rows so far, c + 1) rows; after the
  // last block R'R = [X y]'[X y] (scaled).
  Eigen::MatrixXd r_all(0, c + 1), work;
  for (Index r0 = 0; r0 < n; r0 += static_cast<Index>(kTallBlockRows)) {
    const Index nr = std::min(static_cast<Index>(kTallBlockRows), n - r0), k = r_all.rows();
    if (work.rows() != k + nr) work.resize(k + nr, c + 1);
    work.block(k, 0, nr, c) = design().middleRows(r0, nr) * s.asDiagonal();
    work.block(k, c, nr, 1) = y.segment(r0, nr) * sy;
    work.topRows(k) = r_all;
    poll_cancel();
    const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(work);
    const Index k_new = std::min<Index>(k + nr, c + 1);
    r_all = work.topRows(k_new).triangularView<Eigen::Upper>();
  }

  // lm's rule on the design's part of R (R'R = S X'X S: the norms and inner products the rule
  // needs), exactly as factor_tall applies it.
  const Eigen::MatrixXd rx = r_all.leftCols(c);
  const Eigen::VectorXd norms = rx.colwise().norm().transpose();
  detail::RankedQR q = detail::apply_rank_rule(rx, norms, tol);
  kept_ = std::move(q.kept);
  aliased_ = std::move(q.aliased);
  const Index k = static_cast<Index>(kept_.size());
  kscale_.resize(k);
  for (Index i = 0; i < k; ++i) kscale_(i) = s(static_cast<Index>(kept_[static_cast<std::size_t>(i)]));
  const Eigen::MatrixXd rs = q.packed.topLeftCorner(k, k).triangularView<Eigen::Upper>();
  r_ = rs * kscale_.cwiseInverse().asDiagonal();
  r_inv_ = kscale_.asDiagonal() *
           rs.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(k, k));

  // The kept columns' reflectors carry y's column of R to Q_k'y (head) and the residual part
  // (tail), since R's rows span the same space as the rows of [X y].
  Eigen::VectorXd t = r_all.col(c);
  if (k > 0) {
    const Eigen::HouseholderSequence<Eigen::MatrixXd, Eigen::VectorXd> h(q.packed, q.hcoeffs);
    t.applyOnTheLeft(h.adjoint());
  }
  ResponseFit out;
  const Eigen::VectorXd bk = kscale_.asDiagonal() * rs.triangularView<Eigen::Upper>().solve(t.head(k));
  out.coefficients = Eigen::VectorXd::Constant(c, std::numeric_limits<double>::quiet_NaN());
  for (Index i = 0; i < k; ++i)
    out.coefficients(static_cast<Index>(kept_[static_cast<std::size_t>(i)])) = bk(i) / sy;
  out.rss = t.tail(t.size() - k).squaredNorm() / (sy * sy);
  return out;
}

}  // namespace powerback
