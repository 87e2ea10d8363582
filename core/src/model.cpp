// Fitting powerback::Model: transform the response, (weighted) least squares, sigma-hat,
// log-likelihood; the coefficient covariance and the weighted-regression twin.
#include "powerback/model.hpp"

#include <cmath>
#include <string>
#include <utility>

#include "powerback/errors.hpp"

namespace powerback {

namespace {
constexpr double kLog2Pi = 1.837877066409345483560659472811235279;

// The predictors of X: X itself, or the columns after its intercept column when X is a borrowed
// full design with one (whose first column must then be all ones).
const double* predictors_of(const double* X, std::size_t n, bool intercept, bool borrowed) {
  if (!borrowed || !intercept) return X;
  require(X != nullptr, "the design is NULL");
  for (std::size_t i = 0; i < n; ++i)
    require(X[i] == 1.0, "the first column of the design must be all ones (the intercept), but "
                         "row " + std::to_string(i) + " (0-based) is not 1");
  return X + n;
}

// The factorisation of [1 X] (unweighted; X read in place when borrowed) or of sqrt(w) [1 X]
// over the rows of positive weight.
LeastSquares factor_design(const double* X, std::size_t n, std::size_t p, bool intercept,
                           const double* w, std::vector<std::size_t>& kept_rows, bool borrowed) {
  if (!w && borrowed)
    return LeastSquares(LeastSquares::Deferred{}, LeastSquares::Borrowed{}, X, n,
                        p + (intercept ? 1 : 0), intercept);
  if (!w) return LeastSquares(LeastSquares::Deferred{}, X, n, p, intercept);
  require(n > 0, "the design has no rows");
  X = predictors_of(X, n, intercept, borrowed);
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  require_model_weights(w, n);
  for (std::size_t j = 0; j < p; ++j)
    for (std::size_t i = 0; i < n; ++i)
      if (!std::isfinite(X[j * n + i]))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j) + " has a " +
                                              "non-finite value at row " + std::to_string(i) +
                                              " (0-based): remove or impute it first");
  for (std::size_t i = 0; i < n; ++i)
    if (w[i] > 0.0) kept_rows.push_back(i);
  if (kept_rows.empty())
    throw Error(ErrorCode::Singular, "every weight is zero: no row is left to fit");
  const std::size_t c0 = intercept ? 1 : 0;
  const Eigen::Index nk = static_cast<Eigen::Index>(kept_rows.size());
  Eigen::MatrixXd d(nk, static_cast<Eigen::Index>(p + c0));
  for (Eigen::Index r = 0; r < nk; ++r) {
    const std::size_t i = kept_rows[static_cast<std::size_t>(r)];
    const double s = std::sqrt(w[i]);
    if (c0) d(r, 0) = s;
    for (std::size_t j = 0; j < p; ++j) d(r, static_cast<Eigen::Index>(j + c0)) = s * X[j * n + i];
  }
  return LeastSquares(LeastSquares::Deferred{}, std::move(d));
}

void require_residual_df(const LeastSquares& ls) {
  if (ls.df_residual() == 0)
    throw Error(ErrorCode::Singular,
                "the model has " + std::to_string(ls.rank()) + " estimable coefficients and " +
                    std::to_string(ls.n()) + " rows, which leaves no residual degrees of freedom: " +
                    "use fewer predictors or more rows");
}
}  // namespace

Model::Model(const double* y, const double* X, std::size_t n, std::size_t p, bool intercept,
             const Transform* response, std::size_t estimated_parameters, const double* weights,
             bool borrow_design)
    : response_(response ? *response : Transform()),
      ls_(factor_design(X, n, p, intercept, weights, kept_rows_, borrow_design)),
      intercept_(intercept) {
  require(y != nullptr, "the response y is NULL");
  // z = T(y) written in place, and log |dT/dy|, from the caller's y (no copies of it).
  z_.resize(static_cast<Eigen::Index>(n));
  response_.throw_if_failed(response_.apply(y, n, z_.data()), n, "y", false);
  std::vector<double> jac(n);
  const MapReport r = response_.log_abs_derivative(y, n, jac.data());
  response_.throw_if_failed(r, n, "y", false);
  double sum_log_w = 0.0;
  jacobian_ = 0.0;
  if (!weights) {
    finish_unweighted();
    for (double d : jac) jacobian_ += d;
  } else {
    weights_ = Eigen::Map<const Eigen::VectorXd>(weights, static_cast<Eigen::Index>(n));
    const Eigen::Index nk = static_cast<Eigen::Index>(kept_rows_.size());
    Eigen::VectorXd zw(nk);
    for (Eigen::Index k = 0; k < nk; ++k) {
      const std::size_t i = kept_rows_[static_cast<std::size_t>(k)];
      zw(k) = std::sqrt(weights[i]) * z_(static_cast<Eigen::Index>(i));
      sum_log_w += std::log(weights[i]);
      jacobian_ += jac[i];
    }
    LeastSquares::ResponseFit f = ls_.factor_with_response(zw);
    require_residual_df(ls_);
    coef_ = std::move(f.coefficients);
    rss_ = f.rss;
    // Fitted values x'b for every row (zero-weight rows included, as lm reports them).
    const std::size_t c0 = intercept ? 1 : 0;
    fitted_ = Eigen::VectorXd::Zero(static_cast<Eigen::Index>(n));
    for (std::size_t j = 0; j < columns(); ++j) {
      const double b = coef_(static_cast<Eigen::Index>(j));
      if (std::isnan(b)) continue;  // aliased
      if (c0 && j == 0) {
        fitted_.array() += b;
        continue;
      }
      const double* col = (borrow_design ? X + c0 * n : X) + (j - c0) * n;
      for (std::size_t i = 0; i < n; ++i) fitted_(static_cast<Eigen::Index>(i)) += b * col[i];
    }
    resid_ = z_ - fitted_;
    smear_.resize(nk);
    for (Eigen::Index k = 0; k < nk; ++k) {
      const std::size_t i = kept_rows_[static_cast<std::size_t>(k)];
      smear_(k) = std::sqrt(weights[i]) * resid_(static_cast<Eigen::Index>(i));
    }
    sigma_ = std::sqrt(rss_ / static_cast<double>(ls_.df_residual()));
    se_ = sigma_ * ls_.unscaled_variances().array().sqrt().matrix();  // NaN stays NaN
  }
  const double nd = static_cast<double>(ls_.n());
  // Normal log-likelihood of z at the MLE variance RSS / N (as R's logLik.lm, weighted or not),
  // plus the Jacobian of T over the same rows.
  loglik_ = 0.5 * sum_log_w - 0.5 * nd * (kLog2Pi + std::log(rss_ / nd) + 1.0) + jacobian_;
  loglik_df_ = static_cast<double>(ls_.rank() + 1 + estimated_parameters);
}

Model::Model(PreTransformed, const Eigen::VectorXd& z, Eigen::MatrixXd design)
    : ls_(LeastSquares::Deferred{}, std::move(design)), intercept_(ls_.has_intercept()) {
  z_ = z;
  finish_unweighted();
  const double nd = static_cast<double>(ls_.n());
  loglik_ = -0.5 * nd * (kLog2Pi + std::log(rss_ / nd) + 1.0);
  loglik_df_ = static_cast<double>(ls_.rank() + 1);
}

void Model::finish_unweighted() {
  LeastSquares::ResponseFit f = ls_.factor_with_response(z_);
  require_residual_df(ls_);
  coef_ = std::move(f.coefficients);
  rss_ = f.rss;
  // Fitted values X b in one pass over the design (aliased columns contribute nothing).
  Eigen::VectorXd b = coef_;
  for (Eigen::Index j = 0; j < b.size(); ++j)
    if (std::isnan(b(j))) b(j) = 0.0;
  fitted_.noalias() = ls_.design() * b;
  resid_ = z_ - fitted_;
  sigma_ = std::sqrt(rss_ / static_cast<double>(ls_.df_residual()));
  se_ = sigma_ * ls_.unscaled_variances().array().sqrt().matrix();  // NaN stays NaN
}

std::vector<bool> Model::aliased() const {
  std::vector<bool> a(columns(), false);
  for (std::size_t j : ls_.aliased()) a[j] = true;
  return a;
}

Eigen::VectorXd Model::leverages() const {
  if (!weighted()) return ls_.leverages();
  const Eigen::VectorXd h = ls_.leverages();
  Eigen::VectorXd out = Eigen::VectorXd::Zero(static_cast<Eigen::Index>(n()));
  for (std::size_t k = 0; k < kept_rows_.size(); ++k)
    out(static_cast<Eigen::Index>(kept_rows_[k])) = h(static_cast<Eigen::Index>(k));
  return out;
}

Eigen::MatrixXd Model::covariance() const {
  return (sigma_ * sigma_) * ls_.unscaled_covariance();  // NaN where aliased stays NaN
}

Model Model::weighted_regression() const {
  const Eigen::Index nk = static_cast<Eigen::Index>(ls_.n());
  Eigen::VectorXd zw(nk);
  for (Eigen::Index k = 0; k < nk; ++k) {
    const std::size_t i = weighted() ? kept_rows_[static_cast<std::size_t>(k)]
                                     : static_cast<std::size_t>(k);
    const double s = weighted() ? std::sqrt(weights_(static_cast<Eigen::Index>(i))) : 1.0;
    zw(k) = s * z_(static_cast<Eigen::Index>(i));
  }
  return Model(PreTransformed{}, zw, ls_.design());
}

}  // namespace powerback
