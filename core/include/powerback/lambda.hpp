// powerback/lambda.hpp — maximum-likelihood estimation of a power-family parameter lambda.
//
// Under the model "psi(v; lambda) is normal" (univariate) or "psi(y; lambda) = X b + e with normal
// e" (response given predictors), the profile log-likelihood of lambda, with the MLE of the
// variance (divisor n) and the Jacobian of the transform included, is
//
//   l(lambda) = -n/2 [log(2 pi) + 1 + log(RSS(lambda) / n)] + sum_i log |psi'(v_i; lambda)|,
//
// where RSS is the residual sum of squares of the transformed values about their mean
// (univariate) or about the least-squares fit (response). It is on the original scale of the
// data, so log-likelihoods of different lambdas (and of untransformed fits) compare directly.
// lambda-hat maximises l over [lower, upper]; the likelihood-ratio interval holds the lambdas with
// l(lambda) >= l(lambda-hat) - chi2_1(level) / 2.
//
// With precision weights w_i (variance sigma^2 / w_i, as R's lm) rows of weight 0 are dropped
// (not counted in n, not in the Jacobian), RSS becomes the weighted sum sum w_i e_i^2 and
//
//   l(lambda) = 1/2 sum log w_i - n/2 [log(2 pi) + 1 - log n + log RSS_w(lambda)]
//               + sum_i log |psi'(v_i; lambda)|,
//
// so that at a fixed lambda it is the weighted normal log-likelihood of the transformed fit
// (what logLik() of a weighted lm gives) plus the unweighted Jacobian.
//
// References: Box, G. E. P. & Cox, D. R. (1964). An analysis of transformations. JRSS B 26,
//   211-252 (sec. 3, the maximised log-likelihood and the approximate confidence region).
//   Yeo, I.-K. & Johnson, R. A. (2000). Biometrika 87, 954-959 (sec. 3, the same profile for
//   their family).
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/family_math.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

// The largest |lambda| a search range may reach. Beyond it a power is no transform anyone
// reports, and the transformed values are dominated by the one or two most extreme
// observations, so the profile says nothing about the bulk of the data.
constexpr double kMaxLambdaMagnitude = 100.0;

struct LambdaOptions {
  double lower = -3.0, upper = 3.0;  // search range, within +-kMaxLambdaMagnitude
  double level = 0.95;               // confidence level of the likelihood-ratio interval
  // Optional precision weights, one per observation (finite, >= 0; 0 drops the row); NULL for
  // equal weights. Not owned; read during the call only.
  const double* weights = nullptr;
};

// Which input an error about particular rows refers to.
enum class LambdaInput { Response = 0, Predictors = 1, Weights = 2 };

// An error about particular rows of the estimators' inputs: the offending input, the number of
// rows and the first few of their 0-based indices (in the caller's numbering, zero-weight rows
// included), so that front ends can name the rows in their own convention.
class LambdaRowsError : public IndexedError {
 public:
  LambdaRowsError(ErrorCode code, const std::string& message, std::size_t count,
                  std::vector<std::size_t> first_indices, LambdaInput input)
      : IndexedError(code, message, count, std::move(first_indices)), input_(input) {}
  LambdaInput input() const noexcept { return input_; }

 private:
  LambdaInput input_;
};

struct LambdaEstimate {
  Family family = Family::BoxCox;
  double lambda = math::kNaN;      // lambda-hat
  double conf_low = math::kNaN;    // interval endpoints; the range edge when that side is open
  double conf_high = math::kNaN;
  double convenient = math::kNaN;  // see convenient_lambda()
  double loglik = math::kNaN;      // profile log-likelihood at lambda-hat (original scale, Jacobian included)
  bool at_bound = false;           // lambda-hat within a small tolerance of lower or upper
  bool converged = false;          // the maximiser and both root searches met their tolerances
  bool low_open = false;           // the profile does not drop enough below lambda-hat inside the range
  bool high_open = false;          // same above lambda-hat
  std::size_t n = 0;               // observations used
  std::size_t rank = 0;            // rank of the design (response case, intercept included); 0 otherwise
  std::vector<std::size_t> aliased;  // design columns dropped as aliased (0 = intercept), response case
  double level = 0.95;             // the interval's level
  double lower = -3.0, upper = 3.0;  // the search range used
};

// Univariate ML lambda (Box-Cox needs x > 0; Yeo-Johnson any finite x) with a likelihood-ratio CI.
// Throws LambdaRowsError(NonFinite) for NaN/Inf values, LambdaRowsError(Domain) for x <= 0 with
// Box-Cox (rows of weight 0 are not checked), LambdaRowsError(NonFinite / Argument, Weights) for
// non-finite / negative weights, Error(Argument) for fewer than 3 rows of positive weight, a
// constant x, a bad family, lower >= upper, a bound beyond +-kMaxLambdaMagnitude or level
// outside (0, 1).
LambdaEstimate estimate_lambda(const double* x, std::size_t n, Family family,
                               const LambdaOptions& opt = {});

// Response lambda given predictors: X n-by-p column-major, no intercept column (one is added).
// The design is factored once, without Q (factor_tall), in the same pass that gathers the binned
// sums; with weights, a copy of the design's rows of positive weight scaled by sqrt(w) is
// factored instead. Same errors for y and the weights (checked first); LambdaRowsError(NonFinite,
// Predictors) naming the rows of X with a non-finite value; Error(Singular) when n <= rank + 1,
// and when the predictors fit the transformed y exactly at lambda-hat (1 - R^2 below
// kExactFitRatio: the likelihood has no interior maximum there).
LambdaEstimate estimate_response_lambda(const double* y, const double* X, std::size_t n,
                                        std::size_t p, Family family,
                                        const LambdaOptions& opt = {});

// Same, reusing a factorised design (for leave-one-out and other callers). y has design.n() values.
// opt.weights must be NULL (a prepared design carries no weights).
LambdaEstimate estimate_response_lambda(const double* y, const LeastSquares& design, Family family,
                                        const LambdaOptions& opt = {});

// The estimate and its profile curve on profile_grid(estimate, m), from one preparation of the
// data: grid and loglik receive m values each (m >= 2). Errors as the estimators.
LambdaEstimate estimate_lambda_curve(const double* x, std::size_t n, Family family,
                                     const LambdaOptions& opt, std::size_t m,
                                     std::vector<double>* grid, std::vector<double>* loglik);
LambdaEstimate estimate_response_lambda_curve(const double* y, const double* X, std::size_t n,
                                              std::size_t p, Family family,
                                              const LambdaOptions& opt, std::size_t m,
                                              std::vector<double>* grid,
                                              std::vector<double>* loglik);

// The convenient value: of {-2, -1, -1/2, -1/3, 0, 1/3, 1/2, 1, 2} the one nearest lambda inside
// [lo, hi] (ties: the smaller); else lambda rounded to 2 decimals.
double convenient_lambda(double lambda, double lo, double hi);

// ---- profile curves ------------------------------------------------------------------------
// The profile log-likelihood at each of the m values in grid (no CI, no search). Same input
// checks as the estimators; a grid value outside what the family accepts is an Error(Argument).
std::vector<double> lambda_profile(const double* x, std::size_t n, Family family,
                                   const double* grid, std::size_t m);
std::vector<double> response_lambda_profile(const double* y, const LeastSquares& design,
                                            Family family, const double* grid, std::size_t m);
std::vector<double> response_lambda_profile(const double* y, const double* X, std::size_t n,
                                            std::size_t p, Family family, const double* grid,
                                            std::size_t m);
// Weighted forms (weights as in LambdaOptions; NULL for equal weights). Every grid value the
// binned series cannot serve is evaluated in one batch: one pass over the rows for all of them.
std::vector<double> lambda_profile(const double* x, std::size_t n, Family family,
                                   const double* weights, const double* grid, std::size_t m);
std::vector<double> response_lambda_profile(const double* y, const double* X, std::size_t n,
                                            std::size_t p, Family family, const double* weights,
                                            const double* grid, std::size_t m);

// 1 - R^2 of the transformed response at lambda-hat below this is an exact fit (residual spread
// below 1e-6 of the response's spread: far beyond any measured relationship, and where the
// profile climbs without bound as lambda approaches the exact power).
constexpr double kExactFitRatio = 1e-12;

// A grid of m points (m >= 2) for plotting an estimate's profile: it spans the interval with a
// margin of 1.5 times its width on each side (at least 0.1 each side), clipped to the search range.
std::vector<double> profile_grid(const LambdaEstimate& est, std::size_t m = 101);

}  // namespace powerback
