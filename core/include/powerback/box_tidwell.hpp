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
//
// Weights (precision weights, as in lm): every fit is weighted least squares (rows and response
// multiplied by sqrt(w)); a zero weight drops the row. Wald interval: a_j +- z se_j with z the
// normal quantile of (1 + level) / 2. Advice: leave x_j linear when the score test does not
// reject at 1 - level or the interval holds 1; otherwise the convenient power of
// convenient_lambda() (lambda.hpp) inside the interval, the log when that power is 0.
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <vector>

namespace powerback {

struct BoxTidwellOptions {
  int max_iter = 50;    // iterations of the update
  double tol = 1e-6;    // converged when max_j |change of a_j| < tol
  double max_abs_power = 20;  // |a_j| beyond this stops the iteration (flagged, not converged)
  double level = 0.95;  // level of the Wald intervals; the score tests' advice uses 1 - level
  const double* weights = nullptr;  // n precision weights >= 0, or NULL
};

// What to do with a variable: leave it linear, take its log, or a power.
enum class BoxTidwellAdvice { Linear = 0, Log = 1, Power = 2 };

struct BoxTidwellResult {
  std::vector<double> alpha;     // estimated powers, one per Box-Tidwell variable
  std::vector<double> se;        // their standard errors (see above)
  std::vector<double> conf_low;  // Wald interval at opt.level
  std::vector<double> conf_high;
  std::vector<double> score_t;   // t statistic of x_j log x_j at power 1
  std::vector<double> score_p;   // its two-sided p-value
  std::vector<BoxTidwellAdvice> advice;  // see above
  std::vector<double> suggested;  // the advised power: 1 (linear), 0 (log) or the convenient power
  double score_df = 0;           // residual df of the score-test fits
  std::vector<std::vector<double>> history;  // history[k][j]: a_j after k updates (k = 0: 1)
  int iterations = 0;            // updates made
  bool converged = false;
  double last_change = 0;        // max_j |change| of the last update
  std::size_t n = 0;             // rows used (weight > 0)
  double level = 0.95;
};

// y: n responses. Z: n-by-q other predictors (column-major, no intercept; may be NULL when
// q == 0). X: n-by-m Box-Tidwell variables (column-major, each > 0). Throws Error(Argument) for
// m == 0, bad options or too few rows; IndexedError(NonFinite) for non-finite values and
// IndexedError(Domain) for x <= 0, both naming the variable (0-based column of X) and rows, and
// for non-finite or negative weights; Error(Singular) when a Box-Tidwell variable is aliased with
// the other columns or its coefficient is zero (no power can be estimated). Non-convergence is a
// flag, not an error.
BoxTidwellResult box_tidwell(const double* y, const double* Z, std::size_t n, std::size_t q,
                             const double* X, std::size_t m, const BoxTidwellOptions& opt);

// ---- the steps of box_tidwell (internal; not a stable interface) ---------------------------
namespace detail {

// The checked data of one run: the rows used, multiplied by sqrt(w) where weighted.
struct BoxTidwellData {
  Eigen::MatrixXd lx;   // log(x / geometric mean of x), N-by-m (not weighted)
  Eigen::MatrixXd z;    // other predictors, N-by-q (not weighted)
  Eigen::VectorXd y;    // response times sqrt(w)
  Eigen::VectorXd sqrt_w;  // N values (all 1 when unweighted)
};

// Validation of the options and the data; drops zero-weight rows.
BoxTidwellData box_tidwell_data(const double* y, const double* Z, std::size_t n, std::size_t q,
                                const double* X, std::size_t m, const BoxTidwellOptions& opt);
// The weighted design sqrt(w) [1, Z, x^a] and, when augment, the columns x_j^a log x_j.
Eigen::MatrixXd box_tidwell_design(const BoxTidwellData& d, const std::vector<double>& a,
                                   bool augment);
// Score tests of power 1 (fills score_t, score_p, score_df).
void box_tidwell_score_tests(const BoxTidwellData& d, BoxTidwellResult& res);
// The iteration from a = 1 (fills alpha, history, iterations, converged, last_change) and the
// standard errors at the final powers (se).
void box_tidwell_iterate(const BoxTidwellData& d, const BoxTidwellOptions& opt,
                         BoxTidwellResult& res);
// Wald intervals and advice (conf_low, conf_high, advice, suggested).
void box_tidwell_advise(const BoxTidwellOptions& opt, BoxTidwellResult& res);
// Throws Error(Singular) unless every column in [first, first + count) is kept by ls.
void box_tidwell_require_kept(const std::vector<std::size_t>& aliased, std::size_t first,
                              std::size_t count, const char* what);

}  // namespace detail
}  // namespace powerback
