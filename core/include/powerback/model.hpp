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
// Precision weights w_i >= 0 (optional; variance sigma^2 / w_i, as R's lm): rows of positive
// weight are fitted by least squares on sqrt(w) [1 X] and sqrt(w) z; a zero weight drops the
// row from the fit (it still gets a fitted value and a residual, leverage 0), as lm does. With
// weights, RSS = sum w e^2 over the kept rows, df = (rows of positive weight) - rank, and
//   loglik = 1/2 sum log w_i - N/2 (log(2 pi) + 1 - log N + log RSS) + sum_i log |dT/dy (y_i)|
// over the N rows of positive weight: the weighted normal log-likelihood of z (R's logLik.lm of
// a weighted fit) plus the unweighted Jacobian. A new row predicted has weight 1.
//
// References: Box & Cox (1964), sec. 3 (the Jacobian term); Seber & Lee, Linear Regression
// Analysis, 2nd ed., ch. 5 (confidence and prediction intervals of a linear model) and sec. 3.10
// (weighted least squares).
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <memory>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/transform.hpp"

namespace powerback {

class Smearing;

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
// x'b (or its interval half-width) overflowed the double range although every predictor was
// finite (predictors or coefficients of extreme magnitude): the overflowed outputs are NaN.
constexpr unsigned kPredOverflow = 4u;

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
  // `weights` (n values, or null for none) are precision weights, each finite and >= 0.
  // Throws IndexedError naming "y" and its rows when T cannot be applied to y,
  // IndexedError(Domain) naming the rows of negative or non-finite weights,
  // Error(Singular) when the rank is not below the rows of positive weight (no residual
  // degrees of freedom) or no row has a positive weight.
  //
  // borrow_design: X is then the full design, n-by-(p + 1) with a first column of ones when
  // `intercept` (checked: Error(Argument) otherwise), n-by-p without; an unweighted model reads
  // it in place for its whole life instead of keeping a copy (leverages, residual checks, mean
  // intervals and predictions at its own rows read it later), so the caller keeps X alive and
  // unchanged until the model and every copy of it are destroyed (copies share the buffer).
  // A weighted model factors sqrt(w) [1 X] over its rows of positive weight, which it builds
  // and keeps as before; it reads the borrowed X only during construction. Results are the
  // same bit for bit as with a copied design.
  Model(const double* y, const double* X, std::size_t n, std::size_t p, bool intercept,
        const Transform* response, std::size_t estimated_parameters = 0,
        const double* weights = nullptr, bool borrow_design = false);

  std::size_t n() const { return static_cast<std::size_t>(z_.size()); }  // every row given
  std::size_t nobs() const { return ls_.n(); }  // rows in the fit (positive weight)
  std::size_t columns() const { return ls_.columns(); }
  std::size_t rank() const { return ls_.rank(); }
  std::size_t df_residual() const { return ls_.df_residual(); }
  bool intercept() const { return intercept_; }
  bool weighted() const { return weights_.size() > 0; }
  const Eigen::VectorXd& weights() const { return weights_; }  // empty when unweighted
  const Transform& response() const { return response_; }
  // The factorisation of the fitted design: [1 X] (unweighted; the caller's buffer when
  // borrowed), or sqrt(w) [1 X] over the rows of positive weight.
  const LeastSquares& least_squares() const { return ls_; }

  const Eigen::VectorXd& transformed_response() const { return z_; }
  const Eigen::VectorXd& coefficients() const { return coef_; }     // NaN where aliased
  const Eigen::VectorXd& standard_errors() const { return se_; }    // NaN where aliased
  std::vector<bool> aliased() const;                                // per design column
  const Eigen::VectorXd& residuals() const { return resid_; }       // transformed scale
  const Eigen::VectorXd& fitted() const { return fitted_; }         // transformed scale
  // Hat-matrix diagonal (of the weighted design when weighted; 0 for zero-weight rows).
  Eigen::VectorXd leverages() const;
  // sigma^2 (X'WX)^{-1}, columns() x columns(), NaN rows and columns where aliased.
  Eigen::MatrixXd covariance() const;
  // Residuals the smearing mean averages over: e (unweighted), sqrt(w) e over the rows of
  // positive weight (weighted), so each has variance sigma^2 like a new row of weight 1.
  const Eigen::VectorXd& smearing_residuals() const { return weighted() ? smear_ : resid_; }
  double rss() const { return rss_; }  // sum of w e^2 (w = 1 when unweighted)
  double sigma() const { return sigma_; }
  double loglik() const { return loglik_; }
  double loglik_df() const { return loglik_df_; }
  double jacobian() const { return jacobian_; }  // sum of log |dT/dy|

  // Predictions for m new rows (column-major m-by-p, same columns as the fit's X). Rows with a
  // non-finite entry give NaN outputs flagged kPredMissing. Throws Error(Argument) for a level
  // outside (0, 1).
  Prediction predict(const double* Xnew, std::size_t m, std::size_t p,
                     const PredictOptions& opt) const;

  // Predictions at the model's own rows (as predict() of the training design, without the
  // caller rebuilding it). Unweighted models read the stored design; a weighted model rebuilds
  // its rows from the weighted design (zero-weight rows, which it does not store, come back
  // NaN and flagged kPredMissing).
  Prediction predict_fitted(const PredictOptions& opt) const;

  // Standard errors of the fitted values x0'b at m new rows (transformed scale):
  // sigma sqrt(x0' (X'WX)^{-1} x0); NaN for rows with a non-finite entry. Same layout and errors
  // as predict().
  std::vector<double> fit_standard_errors(const double* Xnew, std::size_t m, std::size_t p) const;

  // The unweighted regression a weighted model amounts to: sqrt(w) z on sqrt(w) [1 X] (no added
  // intercept) over the rows of positive weight, identity response. Its residuals are the
  // weighted residuals sqrt(w) e. Residual checks of a weighted model are those of this one.
  Model weighted_regression() const;

 private:
  struct PreTransformed {};
  Model(PreTransformed, const Eigen::VectorXd& z, Eigen::MatrixXd design);
  // Factors ls_ with z_ and sets the coefficients, fitted values, residuals, RSS, sigma and
  // standard errors.
  void finish_unweighted();
  // The rows [1 x] of new data (intercept column when the model has one); non-finite rows are
  // zero and flagged kPredMissing in flags.
  Eigen::MatrixXd design_rows(const double* Xnew, std::size_t m, std::size_t p,
                              std::vector<unsigned>& flags) const;
  // Predictions at the rows of a design (intercept column included when the model has one).
  Prediction predict_rows(const Eigen::Ref<const Eigen::MatrixXd>& rows,
                          std::vector<unsigned> flags,
                          const PredictOptions& opt) const;

  Transform response_;
  std::vector<std::size_t> kept_rows_;  // rows of positive weight (empty when unweighted);
                                        // declared before ls_, whose construction fills it
  LeastSquares ls_;
  bool intercept_ = true;
  Eigen::VectorXd weights_;  // empty when unweighted
  Eigen::VectorXd z_, coef_, se_, resid_, fitted_, smear_;
  double rss_ = 0, sigma_ = 0, loglik_ = 0, loglik_df_ = 0, jacobian_ = 0;
  // The smearing mean's residual summary, built at the first prediction that needs it and kept
  // (it depends only on the fit), so later predictions cost O(rows predicted), not O(n log n).
  // Set once through atomic shared_ptr operations: concurrent const predictions stay safe.
  std::shared_ptr<const Smearing> smearing() const;
  mutable std::shared_ptr<const Smearing> smearing_cache_;
};

}  // namespace powerback
