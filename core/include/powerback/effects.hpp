// powerback/effects.hpp — coefficients of a transformed-scale model read as effects on the
// original-scale median.
//
// With z = T(y) ~ N(x'b, sigma^2) the median of y at x is g(x'b), g = T^{-1}. Three readings:
//   - log-type response (log, log10, Box-Cox 0; no shift or reflection): moving the design by
//     a contrast c multiplies the median by exp(a c'b) (a = 1, or ln 10 for log10), a percent
//     change 100 (exp(a c'b) - 1) whatever the other variables are. The interval maps the
//     t interval of c'b the same way (so for c a unit vector it is the exponentiated confint).
//   - log-type response and log-type predictor column: the elasticity d log median / d log x =
//     (a_y / a_x) b_j, with the t interval of b_j scaled the same way.
//   - any response: the change in the median between two design rows, g(x1'b) - g(x0'b), with
//     a delta-method standard error sqrt(grad' V grad), grad = g'(x1'b) x1 - g'(x0'b) x0,
//     V = sigma^2 (X'X)^{-1}, and the interval estimate -+ t(df) se.
// Aliased coefficients count as 0 (as in prediction). t quantiles use the residual df.
//
// References: Seber & Lee, Linear Regression Analysis, 2nd ed., ch. 5 (t intervals for c'b);
// Oehlert, G. W. (1992). A note on the delta method. Am. Stat. 46, 27-29.
#pragma once

#include <cstddef>

#include "powerback/model.hpp"
#include "powerback/transform.hpp"

namespace powerback {

struct Effect {
  double estimate = math::kNaN;
  double se = math::kNaN;  // standard error of the estimate (delta method where nonlinear)
  double lower = math::kNaN, upper = math::kNaN;
  double median0 = math::kNaN, median1 = math::kNaN;  // median_change: the two medians
};

// Is T a log-type transform (log, log10, Box-Cox 0) without shift or reflection? Sets *a to 1
// or ln 10 (log base factor) when it is.
bool log_type(const Transform& t, double* a);

// Percent change of the median for the design contrast c (length m.columns()). Throws
// Error(Argument) when the response is not log-type (naming the remedy: median_change), for a
// level outside (0, 1) or a NULL contrast.
Effect percent_change(const Model& m, const double* contrast, double level);

// Elasticity of the median with respect to the variable behind design column j, whose
// transform is `predictor`. Throws Error(Argument) unless both the response and the predictor
// are log-type, or for a column out of range.
Effect elasticity(const Model& m, std::size_t column, const Transform& predictor, double level);

// Change in the median from design row x0 to x1 (each m.columns() long, intercept included).
// Rows whose fit lies beyond the inverse's range give NaN estimate and se.
Effect median_change(const Model& m, const double* x0, const double* x1, double level);

}  // namespace powerback
