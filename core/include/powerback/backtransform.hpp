// powerback/backtransform.hpp — from the transformed scale back to original units.
//
// A linear model on z = T(y) with normal errors estimates the conditional distribution of z as
// N(mu, sigma^2). Mapping back:
//   - the median of y is T^{-1}(mu) (T is monotone, so quantiles map to quantiles);
//   - the mean of y is E[T^{-1}(mu + e)], which needs either the empirical residuals (Duan's
//     smearing estimate) or the normal model (closed form for log, numerical integration for
//     the other families);
//   - an interval for z maps to an interval for y through T^{-1}, its endpoints swapped when T
//     reflects.
// Where T^{-1} has a limited range (Box-Cox with lambda != 0 needs 1 + lambda z > 0, sqrt needs
// z >= 0, ...) a value beyond the limit is set to the limit of y (0 or +Inf in v, mapped through
// the shift and reflection) and reported as bounded.
//
// References
//   Duan, N. (1983). Smearing estimate: a nonparametric retransformation method. JASA 78, 605-610.
//   Golub, G. H. & Welsch, J. H. (1969). Calculation of Gauss quadrature rules. Math. Comp. 23,
//     221-230 (nodes and weights from the eigen-decomposition of the Jacobi matrix).
//   Abramowitz & Stegun (1964), 25.4.46 (Gauss-Hermite quadrature).
#pragma once

#include <cstddef>
#include <vector>

#include "powerback/transform.hpp"

namespace powerback {

// A back-transformed value and whether the range limit of the inverse was used for it.
struct BackValue {
  double value = math::kNaN;
  bool bounded = false;
};

// Gauss-Hermite rule for the weight exp(-x^2) on the real line: sum w_i f(x_i) approximates
// the integral of exp(-x^2) f(x). Nodes ascending; the weights sum to sqrt(pi).
struct GaussHermiteRule {
  std::vector<double> nodes, weights;
};
// m >= 1 nodes by the Golub-Welsch method. Throws Error(Argument) for m == 0.
GaussHermiteRule gauss_hermite(std::size_t m);
// The rule used by normal_mean (computed once, thread-safe).
const GaussHermiteRule& default_gauss_hermite();

// T^{-1}(z), with z beyond the range of the inverse set to the limit of y there.
// NaN z gives NaN (not bounded).
BackValue invert_bounded(const Transform& t, double z);

// The median of y given z ~ symmetric around mu: T^{-1}(mu).
BackValue median_back(const Transform& t, double mu);

// Duan's smearing estimate of E[y]: the mean over j of T^{-1}(mu + e_j), e the training
// residuals on the transformed scale. Bounded when any term used the range limit.
BackValue smearing_mean(const Transform& t, double mu, const double* residuals, std::size_t n);

// E[T^{-1}(Z)], Z ~ N(mu, sigma^2). Log and log10 (and Box-Cox with lambda 0), without shift
// or reflection effects on the formula: exp(mu + sigma^2/2) mapped through the shift and
// reflection, exactly. Other families: Gauss-Hermite with default_gauss_hermite(); when the
// normal puts non-negligible mass (> 1e-15) beyond the range limit, that mass is given the limit
// value explicitly (an infinite limit makes the mean infinite), the part inside the range is
// integrated by adaptive Gauss-Kronrod, and the result is flagged bounded.
BackValue normal_mean(const Transform& t, double mu, double sigma);

// Maps the transformed-scale interval [lo, hi] (lo <= hi) to original units, swapping the
// endpoints when T reflects so that the first is the lower. Each endpoint beyond the range is
// set to the limit; `bounded` tells whether either was.
struct BackInterval {
  double lower = math::kNaN, upper = math::kNaN;
  bool bounded = false;
};
BackInterval interval_back(const Transform& t, double lo, double hi);

}  // namespace powerback
