// Factorisation and projections of powerback::LeastSquares.
#include "powerback/least_squares.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <string>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {

namespace {

// [1 X] (or X), unscaled; Error(NonFinite) names the first non-finite entry.
Eigen::MatrixXd build_design(const double* X, std::size_t n, std::size_t p, bool add_intercept) {
  require(n > 0, "the design has no rows");
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  const std::size_t cols = p + (add_intercept ? 1 : 0);
  require(cols > 0, "the design has no columns");
  Eigen::MatrixXd design(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(cols));
  std::size_t c0 = 0;
  if (add_intercept) {
    design.col(0).setOnes();
    c0 = 1;
  }
  for (std::size_t j = 0; j < p; ++j) {
    for (std::size_t i = 0; i < n; ++i) {
      const double v = X[j * n + i];
      if (!std::isfinite(v))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j) + " has a " +
                                              "non-finite value at row " + std::to_string(i) +
                                              " (0-based): remove or impute it first");
      design(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j + c0)) = v;
    }
  }
  return design;
}

}  // namespace

LeastSquares::LeastSquares(const double* X, std::size_t n, std::size_t p, bool add_intercept,
                           double tol)
    : design_(build_design(X, n, p, add_intercept)), intercept_(add_intercept) {
  set_shape();
  factor(tol);
}

LeastSquares::LeastSquares(Deferred, const double* X, std::size_t n, std::size_t p,
                           bool add_intercept)
    : design_(build_design(X, n, p, add_intercept)), intercept_(add_intercept), qless_(true) {
  set_shape();
}

LeastSquares::LeastSquares(Deferred, Eigen::MatrixXd design)
    : design_(std::move(design)), qless_(true) {
  set_shape();
  require(design_.rows() > 0 && design_.cols() > 0, "the design is empty");
  require(design_.allFinite(), "the design has non-finite entries");
  intercept_ = (design_.col(0).array() == 1.0).all();
}

LeastSquares::LeastSquares(Deferred, Borrowed, const double* design, std::size_t n,
                           std::size_t columns, bool intercept_column)
    : intercept_(intercept_column), qless_(true) {
  require(n > 0, "the design has no rows");
  require(columns > 0, "the design has no columns");
  require(design != nullptr, "the design is NULL");
  const std::size_t c0 = intercept_column ? 1 : 0;
  for (std::size_t i = 0; i < c0 * n; ++i)
    require(design[i] == 1.0, "the first column of the design must be all ones (the intercept)"
                              ", but row " + std::to_string(i) + " (0-based) is not 1");
  for (std::size_t j = c0; j < columns; ++j)
    for (std::size_t i = 0; i < n; ++i)
      if (!std::isfinite(design[j * n + i]))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j - c0) +
                                              " has a non-finite value at row " +
                                              std::to_string(i) +
                                              " (0-based): remove or impute it first");
  borrowed_ = design;
  rows_ = static_cast<Eigen::Index>(n);
  cols_ = static_cast<Eigen::Index>(columns);
}

LeastSquares::LeastSquares(const Eigen::MatrixXd& design, double tol) : design_(design) {
  set_shape();
  require(design_.rows() > 0 && design_.cols() > 0, "the design is empty");
  require(design_.allFinite(), "the design has non-finite entries");
  intercept_ = (design_.col(0).array() == 1.0).all();
  factor(tol);
}

namespace {
using HouseholderQ = Eigen::HouseholderSequence<Eigen::MatrixXd, Eigen::VectorXd>;
}  // namespace

void LeastSquares::factor(double tol) {
  const Eigen::Index p = design().cols();
  const Eigen::VectorXd s = detail::column_scales(design());
  const Eigen::MatrixXd scaled = design() * s.asDiagonal();
  Eigen::VectorXd norms(p);
  for (Eigen::Index j = 0; j < p; ++j) norms(j) = scaled.col(j).norm();
  detail::RankedQR q = detail::apply_rank_rule(scaled, norms, tol);
  kept_ = std::move(q.kept);
  aliased_ = std::move(q.aliased);
  const Eigen::Index k = static_cast<Eigen::Index>(kept_.size());
  kscale_.resize(k);
  for (Eigen::Index i = 0; i < k; ++i) kscale_(i) = s(static_cast<Eigen::Index>(kept_[static_cast<std::size_t>(i)]));
  // The scaled design is X S, so its R is R S: R = R_s S^-1 and R^-1 = S R_s^-1 (exact scalings).
  const Eigen::MatrixXd rs = q.packed.topLeftCorner(k, k).triangularView<Eigen::Upper>();
  r_ = rs * kscale_.cwiseInverse().asDiagonal();
  r_inv_ = kscale_.asDiagonal() *
           rs.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(k, k));
  auto h = std::make_shared<Householder>();
  h->packed = std::move(q.packed);
  h->hcoeffs = std::move(q.hcoeffs);
  householder_ = std::move(h);
}

std::shared_ptr<const LeastSquares::Householder> LeastSquares::householder() const {
  std::shared_ptr<const Householder> h = std::atomic_load(&householder_);
  if (h) return h;
  // The kept columns of the scaled design, factored in order (their rank is decided already).
  const Eigen::Index n = design().rows(), k = static_cast<Eigen::Index>(kept_.size());
  auto built = std::make_shared<Householder>();
  built->packed.resize(n, k);
  for (Eigen::Index i = 0; i < k; ++i)
    built->packed.col(i) = design().col(static_cast<Eigen::Index>(kept_[static_cast<std::size_t>(i)])) * kscale_(i);
  const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(built->packed);
  built->hcoeffs = qr.hCoeffs();
  h = std::move(built);
  std::atomic_store(&householder_, h);
  return h;
}

namespace detail {

Eigen::VectorXd column_scales(const Eigen::Ref<const Eigen::MatrixXd>& a) {
  Eigen::VectorXd s(a.cols());
  for (Eigen::Index j = 0; j < a.cols(); ++j) {
    const double m = a.col(j).cwiseAbs().maxCoeff();
    int e = 0;
    if (m > 0 && std::isfinite(m)) std::frexp(m, &e);  // m = f * 2^e, f in [0.5, 1)
    s(j) = std::ldexp(1.0, -e);
  }
  return s;
}

RankedQR apply_rank_rule(const Eigen::MatrixXd& a, const Eigen::VectorXd& norms, double tol) {
  using Eigen::Index;
  const Index rows = a.rows(), p = a.cols();
  RankedQR out;
  std::vector<std::size_t> cand;
  for (Index j = 0; j < p; ++j) {
    if (norms(j) > 0) cand.push_back(static_cast<std::size_t>(j));
    else out.aliased.push_back(static_cast<std::size_t>(j));
  }
  if (cand.empty()) throw Error(ErrorCode::Singular, "every column of the design is zero");
  const Index k = static_cast<Index>(cand.size()), m = std::min(k, rows);

  // Blocked QR of every candidate; its first i reflectors are those of the first i columns alone.
  Eigen::MatrixXd ak(rows, k);
  for (Index i = 0; i < k; ++i) ak.col(i) = a.col(static_cast<Index>(cand[static_cast<std::size_t>(i)]));
  const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(ak);
  Index bad = m;
  for (Index i = 0; i < m; ++i)
    if (!(std::fabs(ak(i, i)) >= tol * norms(static_cast<Index>(cand[static_cast<std::size_t>(i)])))) {
      bad = i;
      break;
    }
  if (bad == m) {  // the common case: the first min(rows, k) candidates are kept
    out.kept.assign(cand.begin(), cand.begin() + m);
    out.aliased.insert(out.aliased.end(), cand.begin() + m, cand.end());
    out.packed = ak.leftCols(m);
    out.hcoeffs = qr.hCoeffs().head(m);
    std::sort(out.aliased.begin(), out.aliased.end());
    return out;
  }

  // Column `bad` is aliased. The candidates after it get the first `bad` reflectors applied, then
  // are factored one at a time with Eigen's Householder reflectors, each aliased one skipped.
  const Index cap = std::min(rows, k - 1);
  out.packed.resize(rows, cap);
  out.hcoeffs.resize(cap);
  out.packed.leftCols(bad) = ak.leftCols(bad);
  out.hcoeffs.head(bad) = qr.hCoeffs().head(bad);
  out.kept.assign(cand.begin(), cand.begin() + bad);
  out.aliased.push_back(cand[static_cast<std::size_t>(bad)]);
  const Index rest = k - bad - 1;
  Eigen::MatrixXd w(rows, rest);
  for (Index i = 0; i < rest; ++i) w.col(i) = a.col(static_cast<Index>(cand[static_cast<std::size_t>(bad + 1 + i)]));
  if (bad > 0 && rest > 0) {  // (an empty w has no data to offset into)
    HouseholderQ h(out.packed, out.hcoeffs);
    h.setLength(bad);
    w.applyOnTheLeft(h.adjoint());
  }
  Eigen::VectorXd workspace(std::max<Index>(rest, 1));
  Index l = bad;  // columns kept so far
  for (Index j = 0; j < rest; ++j) {
    const std::size_t col = cand[static_cast<std::size_t>(bad + 1 + j)];
    poll_cancel();
    if (l == rows || !(w.col(j).tail(rows - l).norm() >= tol * norms(static_cast<Index>(col)))) {
      out.aliased.push_back(col);
      continue;
    }
    double tau = 0, beta = 0;
    w.col(j).tail(rows - l).makeHouseholderInPlace(tau, beta);
    w(l, j) = beta;
    if (j + 1 < rest)
      w.block(l, j + 1, rows - l, rest - j - 1)
          .applyHouseholderOnTheLeft(w.col(j).tail(rows - l - 1), tau, workspace.data());
    out.packed.col(l) = w.col(j);
    out.hcoeffs(l) = tau;
    out.kept.push_back(col);
    ++l;
  }
  out.packed.conservativeResize(rows, l);
  out.hcoeffs.conservativeResize(l);
  std::sort(out.aliased.begin(), out.aliased.end());
  return out;
}

}  // namespace detail

Eigen::VectorXd LeastSquares::rotate(const Eigen::VectorXd& y) const {
  require(y.size() == design().rows(), "the response has " + std::to_string(y.size()) +
                                          " values but the design has " +
                                          std::to_string(design().rows()) + " rows");
  const auto h = householder();
  Eigen::VectorXd w = y;
  w.applyOnTheLeft(HouseholderQ(h->packed, h->hcoeffs).adjoint());
  return w;
}

Eigen::VectorXd LeastSquares::project(const Eigen::VectorXd& y) const {
  return rotate(y).head(static_cast<Eigen::Index>(rank()));
}

double LeastSquares::rss(const Eigen::VectorXd& y) const {
  return rotate(y).tail(static_cast<Eigen::Index>(n() - rank())).squaredNorm();
}

Eigen::VectorXd LeastSquares::fitted(const Eigen::VectorXd& y) const {
  Eigen::VectorXd w = rotate(y);
  w.tail(static_cast<Eigen::Index>(n() - rank())).setZero();
  const auto h = householder();
  w.applyOnTheLeft(HouseholderQ(h->packed, h->hcoeffs));
  return w;
}

Eigen::VectorXd LeastSquares::residuals(const Eigen::VectorXd& y) const { return y - fitted(y); }

Eigen::VectorXd LeastSquares::coefficients(const Eigen::VectorXd& y) const {
  // R^-1 = S R_s^-1: solved on the scaled factor, then scaled exactly.
  const Eigen::Index k = static_cast<Eigen::Index>(rank());
  const auto h = householder();
  const Eigen::VectorXd bk =
      kscale_.asDiagonal() *
      h->packed.topLeftCorner(k, k).triangularView<Eigen::Upper>().solve(project(y));
  Eigen::VectorXd b = Eigen::VectorXd::Constant(design().cols(), std::numeric_limits<double>::quiet_NaN());
  for (std::size_t i = 0; i < kept_.size(); ++i) b(static_cast<Eigen::Index>(kept_[i])) = bk(static_cast<Eigen::Index>(i));
  return b;
}

Eigen::MatrixXd LeastSquares::unscaled_covariance() const {
  const Eigen::MatrixXd ck = r_inv_ * r_inv_.transpose();
  const Eigen::Index p = design().cols();
  Eigen::MatrixXd c = Eigen::MatrixXd::Constant(p, p, std::numeric_limits<double>::quiet_NaN());
  for (std::size_t a = 0; a < kept_.size(); ++a)
    for (std::size_t b = 0; b < kept_.size(); ++b)
      c(static_cast<Eigen::Index>(kept_[a]), static_cast<Eigen::Index>(kept_[b])) =
          ck(static_cast<Eigen::Index>(a), static_cast<Eigen::Index>(b));
  return c;
}

Eigen::VectorXd LeastSquares::unscaled_variances() const {
  Eigen::VectorXd v = Eigen::VectorXd::Constant(design().cols(), std::numeric_limits<double>::quiet_NaN());
  for (std::size_t a = 0; a < kept_.size(); ++a)
    v(static_cast<Eigen::Index>(kept_[a])) = r_inv_.row(static_cast<Eigen::Index>(a)).squaredNorm();
  return v;
}

Eigen::VectorXd LeastSquares::leverages() const {
  if (qless_) {  // h_i = ||R^{-T} x_i||^2, as variance_factor at the design's own rows
    if (const auto kept = std::atomic_load(&leverages_)) return *kept;
    auto made = std::make_shared<Eigen::VectorXd>(design().rows());
    Eigen::VectorXd& h = *made;
    const Eigen::Index k = static_cast<Eigen::Index>(rank());
    constexpr Eigen::Index kBlock = 4096;  // rows per block, so X_k R^{-1} is never formed whole
    Eigen::MatrixXd xk;
    for (Eigen::Index r0 = 0; r0 < design().rows(); r0 += kBlock) {
      const Eigen::Index nr = std::min(kBlock, design().rows() - r0);
      xk.resize(nr, k);
      for (Eigen::Index i = 0; i < k; ++i)
        xk.col(i) = design().col(static_cast<Eigen::Index>(kept_[static_cast<std::size_t>(i)])).segment(r0, nr);
      h.segment(r0, nr) = (xk * r_inv_).rowwise().squaredNorm();
    }
    std::shared_ptr<const Eigen::VectorXd> done = std::move(made);
    std::atomic_store(&leverages_, done);
    return *done;
  }
  const Eigen::Index n = design().rows(), k = static_cast<Eigen::Index>(rank());
  const auto hh = householder();
  const Eigen::MatrixXd q1 = HouseholderQ(hh->packed, hh->hcoeffs) * Eigen::MatrixXd::Identity(n, k);
  return q1.rowwise().squaredNorm();
}

Eigen::VectorXd LeastSquares::variance_factor(const Eigen::Ref<const Eigen::MatrixXd>& rows) const {
  require(rows.cols() == design().cols(), "new rows have " + std::to_string(rows.cols()) +
                                             " columns; the design has " +
                                             std::to_string(design().cols()));
  Eigen::MatrixXd xk(rows.rows(), static_cast<Eigen::Index>(kept_.size()));
  for (std::size_t i = 0; i < kept_.size(); ++i)
    xk.col(static_cast<Eigen::Index>(i)) = rows.col(static_cast<Eigen::Index>(kept_[i]));
  // x0' (R'R)^{-1} x0 = ||R^{-T} x0||^2
  const Eigen::MatrixXd w = xk * r_inv_;
  return w.rowwise().squaredNorm();
}

}  // namespace powerback
