// powerback/model.hpp — a linear model fitted on the transformed scale, with predictions in
// original units.
//
// The response y is transformed once, z = T(y) (T the identity when none is given), and z is
// regressed on [1 X] by LeastSquares (lm's rank rule; aliased coefficients are NaN). Every
// quantity of the fit (coefficients, standard errors, sigma-hat, residuals, leverages) is on the
// transformed scale. The log-likelihood is reported on the original scale of y:
//   loglik = -n/2 (log(2 pi) + log(RSS/n) + 1) + sum_i log |dT/dy (y_i)|,
// the normal log-likelihood of z at the MLE sigma^2 = RSS/n plus the Jacobian of T, so models
// with different response transforms of the same y are comparable by AIC. Its degrees of
// freedom are rank + 1 (sigma), plus the number of estimated transform parameters the caller
// declares (1 when lambda was estimated from these data).
//
// References: Box & Cox (1964), sec. 3 (the Jacobian term); Seber & Lee, Linear Regression
// Analysis, 2nd ed., ch. 5 (confidence and prediction intervals of a linear model).
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/transform.hpp"

namespace powerback {

enum class IntervalKind { None = 0, Confidence, Prediction };
enum class Center { Median = 0, Mean };
enum class MeanMethod { Smearing = 0, Normal };

struct PredictOptions {
  double level = 0.95;
  IntervalKind interval = IntervalKind::None;
  Center center = Center::Median;
  MeanMethod mean_method = MeanMethod::Smearing;
  bool transformed_scale = false;  // report on the transformed scale (no back-transform)
};

// Flags of one predicted row (bit set).
constexpr unsigned kPredBounded = 1u;  // a value was set to the range limit of the inverse
constexpr unsigned kPredMissing = 2u;  // the row had a non-finite predictor: outputs are NaN

struct Prediction {
  std::vector<double> fit, lower, upper;  // lower/upper NaN when interval is None
  std::vector<unsigned> flags;
  // Normal-theory mean only (else NaN): the normal mass beyond the inverse's range, cut off.
  std::vector<double> cut_mass;
};

class Model {
 public:
  // y: n raw responses; X: n-by-p predictors, column-major, no intercept column (one is added
  // when `intercept`). `response` may be null (identity). `estimated_parameters` counts the
  // transform parameters estimated from these data (added to the log-likelihood's df).
  // Throws IndexedError naming "y" and its rows when T cannot be applied to y,
  // Error(Singular) when the rank is not below n (no residual degrees of freedom).
  Model(const double* y, const double* X, std::size_t n, std::size_t p, bool intercept,
        const Transform* response, std::size_t estimated_parameters = 0);

  std::size_t n() const { return ls_.n(); }
  std::size_t columns() const { return ls_.columns(); }
  std::size_t rank() const { return ls_.rank(); }
  std::size_t df_residual() const { return ls_.df_residual(); }
  bool intercept() const { return ls_.has_intercept(); }
  const Transform& response() const { return response_; }
  const LeastSquares& least_squares() const { return ls_; }

  const Eigen::VectorXd& transformed_response() const { return z_; }
  const Eigen::VectorXd& coefficients() const { return coef_; }     // NaN where aliased
  const Eigen::VectorXd& standard_errors() const { return se_; }    // NaN where aliased
  std::vector<bool> aliased() const;                                // per design column
  const Eigen::VectorXd& residuals() const { return resid_; }       // transformed scale
  const Eigen::VectorXd& fitted() const { return fitted_; }         // transformed scale
  Eigen::VectorXd leverages() const { return ls_.leverages(); }
  double rss() const { return rss_; }
  double sigma() const { return sigma_; }
  double loglik() const { return loglik_; }
  double loglik_df() const { return loglik_df_; }
  double jacobian() const { return jacobian_; }  // sum of log |dT/dy|

  // Predictions for m new rows (column-major m-by-p, same columns as the fit's X). Rows with a
  // non-finite entry give NaN outputs flagged kPredMissing. Throws Error(Argument) for a level
  // outside (0, 1).
  Prediction predict(const double* Xnew, std::size_t m, std::size_t p,
                     const PredictOptions& opt) const;

 private:
  Transform response_;
  LeastSquares ls_;
  Eigen::VectorXd z_, coef_, se_, resid_, fitted_;
  double rss_ = 0, sigma_ = 0, loglik_ = 0, loglik_df_ = 0, jacobian_ = 0;
};

}  // namespace powerback
