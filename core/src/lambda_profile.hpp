// Internal to the core: the profile log-likelihood of lambda for one data set, evaluated many
// times by the estimators. Not part of the public headers.
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <string>

#include "powerback/family_math.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {
namespace detail {

// Validated data in the form the profile needs, prepared once:
//   Box-Cox:     t_i = log v_i - mean(log v)  (centred logs; the centre's effect on the RSS is
//                an exact factor exp(2 lambda centre), so it is added back in log space)
//   Yeo-Johnson: t_i = log1p(|v_i|), with the sign of v_i kept
// For each lambda the transformed values are written as s_i expm1(k_i t_i) / k_i, with
// k_i = lambda (v >= 0, and all of Box-Cox) or 2 - lambda (Yeo-Johnson, v < 0) and s_i = +-1.
// When the largest exponent k_i t_i exceeds kDirectLimit the values are computed divided by
// exp(m) (m that largest exponent) and the RSS gains 2 m in log space, so nothing overflows.
class LambdaProfile {
 public:
  // Univariate: RSS about the mean. `what` names the variable in messages ("x").
  LambdaProfile(const double* x, std::size_t n, Family family, const std::string& what);
  // Response: RSS about the least-squares fit of `design` (which must have an intercept).
  LambdaProfile(const double* y, const LeastSquares& design, Family family, const std::string& what);

  // Profile log-likelihood at lambda (original scale, Jacobian included).
  double loglik(double lambda) const;
  std::size_t n() const { return static_cast<std::size_t>(t_.size()); }
  Family family() const { return family_; }

 private:
  void prepare(const double* v, std::size_t n, const std::string& what);
  double log_rss(double lambda) const;

  Family family_;
  const LeastSquares* design_ = nullptr;
  Eigen::ArrayXd t_;            // log magnitudes (see above)
  Eigen::Array<bool, Eigen::Dynamic, 1> neg_;  // Yeo-Johnson: v < 0
  bool any_neg_ = false, any_pos_ = false;
  double centre_ = 0.0;         // Box-Cox: mean(log v)
  double sum_pos_ = 0.0, sum_neg_ = 0.0;  // sums of t over v >= 0 and v < 0 (Yeo-Johnson)
  double pos_min_ = 0.0, pos_max_ = 0.0, neg_min_ = 0.0, neg_max_ = 0.0;  // ranges of t per sign
  mutable Eigen::VectorXd w_;   // work space: transformed values at the current lambda
};

// Largest exponent evaluated without rescaling: exp(300)^2 * 1e12 values stays finite.
constexpr double kDirectLimit = 300.0;

}  // namespace detail
}  // namespace powerback
