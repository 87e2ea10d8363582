// powerback/box_tidwell.hpp — powers of positive predictors that make a linear model linear.
//
// Model: y = b0 + sum_j b_j x_j^(a_j) + (other predictors, entered linearly) + e, with x_j > 0.
// Box & Tidwell (1962) linearise x^a about the current a (x^(a + d) ~ x^a + d x^a log x):
// with w_j = x_j^(a_j), fit y on [1, Z, w] to get b_j, then y on [1, Z, w, w_j log x_j] to get
// g_j, and update a_j <- a_j + g_j / b_j. The first step from a = 1 is the closed form of
// Box & Tidwell (1962), eq. for alpha_1: 1 + g / b with g the coefficient of x log x.
//
// Standard error of a_j at convergence: the Gauss-Newton linearisation of the nonlinear least
// squares fit has the column b_j x_j^(a_j) log x_j for a_j, so se(a_j) = se(g_j) / |b_j| from
// the augmented fit at the final powers (Seber & Wild, Nonlinear Regression, sec. 2.1).
//
// Score test of a_j = 1: the t statistic of the added column x_j log x_j in the fit of y on
// [1, Z, x, x_j log x_j] (every Box-Tidwell variable linear, one added column at a time);
// two-sided p-value from Student's t on that fit's residual degrees of freedom.
//
// Each x_j is divided by its geometric mean before powering; the fits are invariant to that
// scaling (it multiplies w_j by a constant and adds a multiple of w_j to w_j log x_j), and it
// keeps x^a representable for large |a|.
#pragma once

#include <cstddef>
#include <vector>

namespace powerback {

struct BoxTidwellOptions {
  int max_iter = 50;    // iterations of the update
  double tol = 1e-6;    // converged when max_j |change of a_j| < tol
  double max_abs_power = 20;  // |a_j| beyond this stops the iteration (flagged, not converged)
};

struct BoxTidwellResult {
  std::vector<double> alpha;     // estimated powers, one per Box-Tidwell variable
  std::vector<double> se;        // their standard errors (see above)
  std::vector<double> score_t;   // t statistic of x_j log x_j at power 1
  std::vector<double> score_p;   // its two-sided p-value
  double score_df = 0;           // residual df of the score-test fits
  std::vector<std::vector<double>> history;  // history[k][j]: a_j after k updates (k = 0: 1)
  int iterations = 0;            // updates made
  bool converged = false;
  double last_change = 0;        // max_j |change| of the last update
  std::size_t n = 0;
};

// y: n responses. Z: n-by-q other predictors (column-major, no intercept; may be NULL when
// q == 0). X: n-by-m Box-Tidwell variables (column-major, each > 0). Throws Error(Argument) for
// m == 0, bad options or too few rows; IndexedError(NonFinite) for non-finite values and
// IndexedError(Domain) for x <= 0, both naming the variable (0-based column of X) and rows;
// Error(Singular) when a Box-Tidwell variable is aliased with the other columns or its
// coefficient is zero (no power can be estimated). Non-convergence is a flag, not an error.
BoxTidwellResult box_tidwell(const double* y, const double* Z, std::size_t n, std::size_t q,
                             const double* X, std::size_t m, const BoxTidwellOptions& opt);

}  // namespace powerback
