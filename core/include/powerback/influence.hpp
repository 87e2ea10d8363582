// powerback/influence.hpp — how much each row moves the response's maximum-likelihood lambda.
//
// For each row i, lambda-hat_(i) maximises the profile log-likelihood of the data without row i
// (see lambda.hpp for the profile). With m = N - 1 (N the rows used), d_i the slope of row i's
// Jacobian term (log psi'(y_i; lambda) = (lambda - 1) d_i for both families), D = sum d_i,
// h_ii the leverages and u_i(lambda) = e_i / ||e|| the normalised residuals of the full fit at
// lambda, the deletion identity RSS_(i) = RSS (1 - u_i^2 / (1 - h_ii)) (Cook & Weisberg,
// Residuals and Influence in Regression, 1982, sec. 2.2) gives, up to a constant,
//
//   l_(i)(lambda) = (m / N) l(lambda) + (lambda - 1) (D / N - d_i) - (m / 2) log(1 - u_i^2 / (1 - h_ii))
//
// with l the full-data profile of lambda.hpp. So no design is refitted, and the profile is the one
// the full estimate uses. Weighted (precision weights w_i): the same with the weighted fit, whose
// normalised residuals are sqrt(w_i) e_i / ||sqrt(w) e|| and leverages those of sqrt(w) X; a
// zero-weight row is not used (its leave-one-out estimate is the full one, its leverage 0).
//
// Cost O(n): l and every u_i are computed at a few Chebyshev nodes of a window around lambda-hat
// (1.5 times the interval's half-width on each side) and interpolated; the nodes per panel are
// chosen so that the interpolation error of a power e^(lambda t) is below 1e-17 relative
// (Chebyshev coefficients of e^(b x) on [-1, 1] are 2 I_k(b), below 2 (b/2)^k / k!; Trefethen,
// Approximation Theory and Approximation Practice, 2013, ch. 8). Each row's maximum over the window
// comes from the one maximiser (lambda_maximise.hpp); a row whose maximum lies on an inner edge of
// the window is solved again over the whole search range on the exact profile (one pass over the
// data per evaluation), so every row's answer is the maximiser of its own profile.
#pragma once

#include <cstddef>
#include <vector>

#include "powerback/lambda.hpp"

namespace powerback {

struct LambdaInfluence {
  LambdaEstimate full;                  // the estimate from every row used
  std::vector<double> loo_lambda;       // lambda-hat without row i
  std::vector<double> leverage;         // h_ii of the (weighted) design; 0 for a zero-weight row
  std::vector<unsigned char> outside;   // 1 when loo_lambda[i] lies outside [conf_low, conf_high]
  std::vector<unsigned char> at_bound;  // 1 when loo_lambda[i] is at (or next to) a range end
  std::vector<unsigned char> converged; // 1 when the maximiser met its tolerance
  std::size_t n_outside = 0;            // rows with outside[i] == 1
  std::size_t n_at_bound = 0;           // rows with at_bound[i] == 1
  std::size_t n_exact = 0;              // rows solved on the exact profile (outside the window)
};

// y: n responses; X: n-by-p predictors column-major, no intercept column (one is added).
// family: BoxCox or YeoJohnson. weights: n precision weights >= 0, or NULL: then the options'
// own weights where LambdaOptions carries them, else none.
// Errors as estimate_response_lambda; IndexedError(NonFinite / Domain) for non-finite or
// negative weights (count and first rows); Error(Singular) when N - 1 <= rank + 1 (a left-out fit
// would have no residual degrees of freedom for the profile).
LambdaInfluence lambda_influence(const double* y, const double* X, std::size_t n, std::size_t p,
                                 Family family, const LambdaOptions& opt = {},
                                 const double* weights = nullptr);

}  // namespace powerback
