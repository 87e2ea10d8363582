// Factorisation and projections of powerback::LeastSquares.
#include "powerback/least_squares.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {

LeastSquares::LeastSquares(const double* X, std::size_t n, std::size_t p, bool add_intercept,
                           double tol)
    : intercept_(add_intercept) {
  require(n > 0, "the design has no rows");
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  const std::size_t cols = p + (add_intercept ? 1 : 0);
  require(cols > 0, "the design has no columns");
  design_.resize(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(cols));
  std::size_t c0 = 0;
  if (add_intercept) {
    design_.col(0).setOnes();
    c0 = 1;
  }
  for (std::size_t j = 0; j < p; ++j) {
    for (std::size_t i = 0; i < n; ++i) {
      const double v = X[j * n + i];
      if (!std::isfinite(v))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j) + " has a " +
                                              "non-finite value at row " + std::to_string(i) +
                                              " (0-based): remove or impute it first");
      design_(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j + c0)) = v;
    }
  }
  factor(tol);
}

LeastSquares::LeastSquares(const Eigen::MatrixXd& design, double tol) : design_(design) {
  require(design_.rows() > 0 && design_.cols() > 0, "the design is empty");
  require(design_.allFinite(), "the design has non-finite entries");
  intercept_ = (design_.col(0).array() == 1.0).all();
  factor(tol);
}

void LeastSquares::factor(double tol) {
  const Eigen::Index p = design_.cols();
  Eigen::VectorXd norms(p);
  for (Eigen::Index j = 0; j < p; ++j) norms(j) = design_.col(j).norm();
  detail::apply_rank_rule(design_, norms, tol, qr_, kept_, aliased_);
  const Eigen::Index k = static_cast<Eigen::Index>(kept_.size());
  r_ = qr_.matrixQR().topLeftCorner(k, k).triangularView<Eigen::Upper>();
  r_inv_ = r_.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(k, k));
}

namespace detail {

void apply_rank_rule(const Eigen::MatrixXd& a, const Eigen::VectorXd& norms, double tol,
                     Eigen::HouseholderQR<Eigen::MatrixXd>& qr, std::vector<std::size_t>& kept,
                     std::vector<std::size_t>& aliased) {
  const Eigen::Index rows = a.rows(), p = a.cols();
  std::vector<std::size_t> candidates;
  for (Eigen::Index j = 0; j < p; ++j) {
    if (norms(j) > 0) candidates.push_back(static_cast<std::size_t>(j));
    else aliased.push_back(static_cast<std::size_t>(j));
  }
  // One refactorisation per alias.
  for (;;) {
    if (candidates.empty()) throw Error(ErrorCode::Singular, "every column of the design is zero");
    const Eigen::Index k = static_cast<Eigen::Index>(candidates.size());
    Eigen::MatrixXd ak(rows, k);
    for (Eigen::Index i = 0; i < k; ++i) ak.col(i) = a.col(static_cast<Eigen::Index>(candidates[i]));
    qr.compute(ak);
    Eigen::Index bad = -1;
    const Eigen::Index m = std::min(k, rows);
    for (Eigen::Index i = 0; i < m && bad < 0; ++i)
      if (!(std::fabs(qr.matrixQR()(i, i)) >= tol * norms(static_cast<Eigen::Index>(candidates[i])))) bad = i;
    if (bad < 0 && k > rows) bad = rows;  // `rows` independent columns already span every column
    if (bad < 0) break;
    aliased.push_back(candidates[static_cast<std::size_t>(bad)]);
    candidates.erase(candidates.begin() + bad);
  }
  std::sort(aliased.begin(), aliased.end());
  kept = candidates;
}

}  // namespace detail

Eigen::VectorXd LeastSquares::rotate(const Eigen::VectorXd& y) const {
  require(y.size() == design_.rows(), "the response has " + std::to_string(y.size()) +
                                          " values but the design has " +
                                          std::to_string(design_.rows()) + " rows");
  Eigen::VectorXd w = y;
  w.applyOnTheLeft(qr_.householderQ().adjoint());
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
  w.applyOnTheLeft(qr_.householderQ());
  return w;
}

Eigen::VectorXd LeastSquares::residuals(const Eigen::VectorXd& y) const { return y - fitted(y); }

Eigen::VectorXd LeastSquares::coefficients(const Eigen::VectorXd& y) const {
  const Eigen::VectorXd bk = r_.triangularView<Eigen::Upper>().solve(project(y));
  Eigen::VectorXd b = Eigen::VectorXd::Constant(design_.cols(), std::numeric_limits<double>::quiet_NaN());
  for (std::size_t i = 0; i < kept_.size(); ++i) b(static_cast<Eigen::Index>(kept_[i])) = bk(static_cast<Eigen::Index>(i));
  return b;
}

Eigen::MatrixXd LeastSquares::unscaled_covariance() const {
  const Eigen::MatrixXd ck = r_inv_ * r_inv_.transpose();
  const Eigen::Index p = design_.cols();
  Eigen::MatrixXd c = Eigen::MatrixXd::Constant(p, p, std::numeric_limits<double>::quiet_NaN());
  for (std::size_t a = 0; a < kept_.size(); ++a)
    for (std::size_t b = 0; b < kept_.size(); ++b)
      c(static_cast<Eigen::Index>(kept_[a]), static_cast<Eigen::Index>(kept_[b])) =
          ck(static_cast<Eigen::Index>(a), static_cast<Eigen::Index>(b));
  return c;
}

Eigen::VectorXd LeastSquares::leverages() const {
  const Eigen::Index n = design_.rows(), k = static_cast<Eigen::Index>(rank());
  const Eigen::MatrixXd q1 = qr_.householderQ() * Eigen::MatrixXd::Identity(n, k);
  return q1.rowwise().squaredNorm();
}

Eigen::VectorXd LeastSquares::variance_factor(const Eigen::MatrixXd& rows) const {
  require(rows.cols() == design_.cols(), "new rows have " + std::to_string(rows.cols()) +
                                             " columns; the design has " +
                                             std::to_string(design_.cols()));
  Eigen::MatrixXd xk(rows.rows(), static_cast<Eigen::Index>(kept_.size()));
  for (std::size_t i = 0; i < kept_.size(); ++i)
    xk.col(static_cast<Eigen::Index>(i)) = rows.col(static_cast<Eigen::Index>(kept_[i]));
  // x0' (R'R)^{-1} x0 = ||R^{-T} x0||^2
  const Eigen::MatrixXd w = xk * r_inv_;
  return w.rowwise().squaredNorm();
}

}  // namespace powerback
