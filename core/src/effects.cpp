// Effects on the original-scale median: percent changes, elasticities, changes between rows.
#include "powerback/effects.hpp"

#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

double t_quantile(const Model& m, double level) {
  require(std::isfinite(level) && level > 0.0 && level < 1.0,
          "level must lie strictly between 0 and 1 (e.g. 0.95), not " + format_number(level));
  const boost::math::students_t td(static_cast<double>(m.df_residual()));
  return boost::math::quantile(boost::math::complement(td, (1.0 - level) / 2.0));
}

// Coefficients with aliased ones set to 0, and sigma^2 (X'X)^{-1} with their rows/columns 0.
void coef_and_cov(const Model& m, Eigen::VectorXd* b, Eigen::MatrixXd* V) {
  *b = m.coefficients();
  *V = m.least_squares().unscaled_covariance() * (m.sigma() * m.sigma());
  for (Eigen::Index j = 0; j < b->size(); ++j)
    if (std::isnan((*b)(j))) {
      (*b)(j) = 0.0;
      V->row(j).setZero();
      V->col(j).setZero();
    }
}

Eigen::VectorXd as_vector(const double* v, std::size_t n) {
  Eigen::VectorXd out(static_cast<Eigen::Index>(n));
  for (std::size_t j = 0; j < n; ++j) out(static_cast<Eigen::Index>(j)) = v[j];
  return out;
}

// dg/dz at z for g = T^{-1}: 1 / |T'(x)| at x = g(z), negative when T reflects. NaN beyond
// the range.
double inverse_slope(const Transform& t, double z) {
  const double x = t.invert(z);
  if (std::isnan(x)) return math::kNaN;
  const double s = std::exp(-t.log_abs_derivative(x));
  return t.spec().reflect ? -s : s;
}

}  // namespace

bool log_type(const Transform& t, double* a) {
  const TransformSpec& s = t.spec();
  if (s.shift != 0.0 || s.reflect) return false;
  const double scale = family_traits(s.family).log_scale(s.lambda);
  if (scale <= 0.0) return false;
  *a = scale;
  return true;
}

Effect percent_change(const Model& m, const double* contrast, double level) {
  require(contrast != nullptr, "the contrast is NULL");
  double a = 1.0;
  require(log_type(m.response(), &a),
          "a percent change of the median needs a log response without shift or reflection; the "
          "response is " + m.response().describe() + ": use the change in the median between two rows");
  const double q = t_quantile(m, level);
  Eigen::VectorXd b;
  Eigen::MatrixXd V;
  coef_and_cov(m, &b, &V);
  const Eigen::VectorXd c = as_vector(contrast, m.columns());
  const double est = c.dot(b), se = std::sqrt(std::max(0.0, c.dot(V * c)));
  Effect e;
  e.estimate = 100.0 * std::expm1(a * est);
  e.se = 100.0 * std::exp(a * est) * a * se;
  e.lower = 100.0 * std::expm1(a * (est - q * se));
  e.upper = 100.0 * std::expm1(a * (est + q * se));
  return e;
}

Effect elasticity(const Model& m, std::size_t column, const Transform& predictor, double level) {
  require(column < m.columns(), "column " + std::to_string(column) + " is beyond the model's " +
                                    std::to_string(m.columns()) + " coefficients");
  double ay = 1.0, ax = 1.0;
  require(log_type(m.response(), &ay) && log_type(predictor, &ax),
          "an elasticity needs log transforms without shift or reflection on both the response (" +
              m.response().describe() + ") and the predictor (" + predictor.describe() + ")");
  const double q = t_quantile(m, level);
  const Eigen::Index j = static_cast<Eigen::Index>(column);
  const double b = m.coefficients()(j), se = m.standard_errors()(j);
  Effect e;
  const double k = ay / ax;
  e.estimate = k * b;
  e.se = k * se;
  e.lower = k * (b - q * se);
  e.upper = k * (b + q * se);
  return e;
}

Effect median_change(const Model& m, const double* x0, const double* x1, double level) {
  require(x0 != nullptr && x1 != nullptr, "a design row is NULL");
  const double q = t_quantile(m, level);
  Eigen::VectorXd b;
  Eigen::MatrixXd V;
  coef_and_cov(m, &b, &V);
  const Eigen::VectorXd r0 = as_vector(x0, m.columns()), r1 = as_vector(x1, m.columns());
  const double mu0 = r0.dot(b), mu1 = r1.dot(b);
  const Transform& t = m.response();
  Effect e;
  e.median0 = t.invert(mu0);
  e.median1 = t.invert(mu1);
  e.estimate = e.median1 - e.median0;
  const Eigen::VectorXd grad = inverse_slope(t, mu1) * r1 - inverse_slope(t, mu0) * r0;
  e.se = std::sqrt(std::max(0.0, grad.dot(V * grad)));
  e.lower = e.estimate - q * e.se;
  e.upper = e.estimate + q * e.se;
  return e;
}

}  // namespace powerback
