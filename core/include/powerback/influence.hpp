// powerback/influence.hpp — how much each row moves the response's maximum-likelihood lambda.
//
// For each row i, lambda-hat_(i) maximises the profile log-likelihood of the data without row i
// (see lambda.hpp for the profile). The design is factored once: at each lambda the residuals e
// of the full fit give every leave-one-out residual sum of squares by the deletion identity
//   RSS_(i) = RSS - e_i^2 / (1 - h_ii)
// (Cook & Weisberg, Residuals and Influence in Regression, 1982, sec. 2.2; h the leverages), so
// no design is refitted. When h_ii = 1 the row's residual is 0 and RSS_(i) = RSS. Each row's
// maximisation uses Brent's minimiser over the same range and precision as the full estimate.
// Box-Cox values are divided by their geometric mean first, which multiplies every RSS at a
// given lambda by the same known factor, added back in log space.
#pragma once

#include <cstddef>
#include <vector>

#include "powerback/lambda.hpp"

namespace powerback {

struct LambdaInfluence {
  LambdaEstimate full;                  // the estimate from every row
  std::vector<double> loo_lambda;       // lambda-hat without row i
  std::vector<double> leverage;         // h_ii of the design
  std::vector<unsigned char> outside;   // 1 when loo_lambda[i] lies outside [conf_low, conf_high]
  std::vector<unsigned char> at_bound;  // 1 when loo_lambda[i] is at (or next to) a range end
  std::vector<unsigned char> converged; // 1 when the minimiser met its tolerance
};

// y: n responses; X: n-by-p predictors column-major, no intercept column (one is added).
// family: BoxCox or YeoJohnson. Errors as estimate_response_lambda; Error(Singular) when
// n - 1 <= rank + 1 (a left-out fit would have no residual degrees of freedom).
LambdaInfluence lambda_influence(const double* y, const double* X, std::size_t n, std::size_t p,
                                 Family family, const LambdaOptions& opt = {});

}  // namespace powerback
