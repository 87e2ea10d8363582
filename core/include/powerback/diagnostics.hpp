// powerback/diagnostics.hpp — checks of a linear model's residuals on its own scale.
//
//   Koenker's studentized Breusch-Pagan test: regress the squared residuals e_i^2 on the
//     model's regressors (the kept design columns) and an intercept; the statistic is n R^2 of
//     that auxiliary regression, chi-square with as many df as regressors besides the intercept
//     (rank - 1 for a model with one) under homoscedasticity.
//     Breusch, T. S. & Pagan, A. R. (1979). Econometrica 47, 1287-1294;
//     Koenker, R. (1981). A note on studentizing a test for heteroscedasticity. J. Econometrics
//     17, 107-112.
//   Ramsey's RESET: add fitted^2 and fitted^3 to the design; F test of the added columns,
//     F = ((RSS0 - RSS1) / q) / (RSS1 / (n - rank1)).
//     Ramsey, J. B. (1969). Tests for specification errors in classical linear least-squares
//     regression analysis. JRSS B 31, 350-371.
//   Shapiro-Wilk on the residuals (Royston's algorithm) and their adjusted sample skewness G1,
//   both from normality.hpp. Residuals of a fit are not independent, so the Shapiro-Wilk p-value
//   is approximate.
#pragma once

#include <cstddef>
#include <string>

#include "powerback/family_math.hpp"
#include "powerback/model.hpp"

namespace powerback {

struct ResidualChecks {
  std::size_t n = 0;
  double sw_statistic = math::kNaN, sw_p = math::kNaN;
  bool sw_computed = false;
  std::string sw_note;  // why Shapiro-Wilk was not computed, or a caveat
  double skewness = math::kNaN;
  double bp_statistic = math::kNaN, bp_df = math::kNaN, bp_p = math::kNaN;
  double reset_f = math::kNaN, reset_df1 = math::kNaN, reset_df2 = math::kNaN,
         reset_p = math::kNaN;
};

// The checks of one fitted model, on the transformed scale (where its errors are modelled).
// A weighted model is checked through its weighted regression (Model::weighted_regression():
// residuals sqrt(w) e, design sqrt(w) [1 X]), as R's lm diagnostics use weighted residuals.
// A test that cannot be computed (no regressor besides the intercept for Breusch-Pagan, no
// residual df left for RESET, constant residuals) has NaN fields.
ResidualChecks residual_checks(const Model& model);

}  // namespace powerback
