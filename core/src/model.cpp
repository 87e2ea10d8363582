// Fitting powerback::Model: transform the response, least squares, sigma-hat, log-likelihood.
#include "powerback/model.hpp"

#include <cmath>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {

namespace {
constexpr double kLog2Pi = 1.837877066409345483560659472811235279;
}

Model::Model(const double* y, const double* X, std::size_t n, std::size_t p, bool intercept,
             const Transform* response, std::size_t estimated_parameters)
    : response_(response ? *response : Transform()), ls_(X, n, p, intercept) {
  require(y != nullptr, "the response y is NULL");
  const std::vector<double> yv(y, y + n);
  const std::vector<double> zv = response_.apply_checked(yv, "y");
  const std::vector<double> jac = [&] {
    std::vector<double> d(n);
    const MapReport r = response_.log_abs_derivative(yv.data(), n, d.data());
    response_.throw_if_failed(r, n, "y", false);
    return d;
  }();
  if (ls_.df_residual() == 0)
    throw Error(ErrorCode::Singular,
                "the model has " + std::to_string(ls_.rank()) + " estimable coefficients and " +
                    std::to_string(n) + " rows, which leaves no residual degrees of freedom: " +
                    "use fewer predictors or more rows");
  z_ = Eigen::Map<const Eigen::VectorXd>(zv.data(), static_cast<Eigen::Index>(n));
  coef_ = ls_.coefficients(z_);
  fitted_ = ls_.fitted(z_);
  resid_ = z_ - fitted_;
  rss_ = ls_.rss(z_);
  const double df = static_cast<double>(ls_.df_residual());
  sigma_ = std::sqrt(rss_ / df);
  const Eigen::MatrixXd cov = ls_.unscaled_covariance();
  se_.resize(cov.rows());
  for (Eigen::Index j = 0; j < cov.rows(); ++j) se_(j) = sigma_ * std::sqrt(cov(j, j));  // NaN stays NaN
  jacobian_ = 0.0;
  for (double d : jac) jacobian_ += d;
  const double nd = static_cast<double>(n);
  // Normal log-likelihood of z at the MLE variance RSS / n (as R's logLik.lm), plus the Jacobian.
  loglik_ = -0.5 * nd * (kLog2Pi + std::log(rss_ / nd) + 1.0) + jacobian_;
  loglik_df_ = static_cast<double>(ls_.rank() + 1 + estimated_parameters);
}

std::vector<bool> Model::aliased() const {
  std::vector<bool> a(columns(), false);
  for (std::size_t j : ls_.aliased()) a[j] = true;
  return a;
}

}  // namespace powerback
