// powerback/backtransform.hpp — from the transformed scale back to original units.
//
// A linear model on z = T(y) with normal errors estimates the conditional distribution of z as
// N(mu, sigma^2). Mapping back:
//   - the median of y is T^{-1}(mu) (T is monotone, so quantiles map to quantiles);
//   - the mean of y is E[T^{-1}(mu + e)], which needs either the empirical residuals (Duan's
//     smearing estimate) or the normal model (closed form for log, numerical integration for
//     the other families, see normal_mean for its definition at a range limit);
//   - an interval for z maps to an interval for y through T^{-1}, its endpoints swapped when T
//     reflects.
// Where T^{-1} has a limited range (Box-Cox with lambda != 0 needs 1 + lambda z > 0, sqrt needs
// z >= 0, ...) a value beyond the limit is set to the limit of y (0 or +Inf in v, mapped through
// the shift and reflection) and reported as bounded.
//
// References
//   Duan, N. (1983). Smearing estimate: a nonparametric retransformation method. JASA 78, 605-610.
//   Johnson, Kotz & Balakrishnan (1994). Continuous Univariate Distributions, vol. 1, ch. 13
//     (truncated normal) and ch. 14 (lognormal mean).
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

// T^{-1}(z), with z beyond the range of the inverse set to the limit of y there.
// NaN z gives NaN (not bounded).
BackValue invert_bounded(const Transform& t, double z);

// The median of y given z ~ symmetric around mu: T^{-1}(mu).
BackValue median_back(const Transform& t, double mu);

// Duan's smearing estimate of E[y]: the mean over j of T^{-1}(mu + e_j), e the training
// residuals on the transformed scale. Bounded when any term used the range limit. This is the
// pairwise definition, n terms per call; Smearing (smearing.hpp) gives the same values for many
// rows in linear time.
BackValue smearing_mean(const Transform& t, double mu, const double* residuals, std::size_t n);

// The normal-theory mean: E[T^{-1}(Z) | Z in R], Z ~ N(mu, sigma^2), R the range of T^{-1}
// (the whole line for most families). The normal mass beyond R's limit is cut off (the normal
// is truncated to R and renormalised) and written to *cut_mass when cut_mass is not NULL
// (0 without a limit; NaN for NaN input). The mean is then
//   - log, log10, Box-Cox 0: exp(a mu + a^2 sigma^2 / 2) (a = 1 or ln 10), exactly;
//   - identity: mu;
//   - where T^{-1} tends to +-Inf at the limit like distance^p with p <= -1 (Box-Cox and
//     Yeo-Johnson with -1 <= lambda < 0, Yeo-Johnson with 2 < lambda <= 3, reciprocal, power
//     with -1 <= lambda < 0): +-Inf, flagged bounded, because the truncated normal density is
//     positive at the limit and the integral diverges, however little mass lies beyond;
//   - otherwise adaptive Gauss-Kronrod (61 points, relative tolerance 1e-13) on pieces around
//     the bulk of the integrand, with tanh-sinh on the unit next to a limit (an integrable
//     singularity or a kink there), all from Boost.Math.
// Shift and reflection are affine in v, so they pass through the expectation. `bounded` is
// set when the mean is infinite. sigma = 0 gives T^{-1}(mu) (range-limited; cut mass 1 when mu
// is beyond the limit, else 0). Throws Error(Argument) for sigma < 0.
BackValue normal_mean(const Transform& t, double mu, double sigma, double* cut_mass = nullptr);

// Maps the transformed-scale interval [lo, hi] (lo <= hi) to original units, swapping the
// endpoints when T reflects so that the first is the lower. Each endpoint beyond the range is
// set to the limit; `bounded` tells whether either was.
struct BackInterval {
  double lower = math::kNaN, upper = math::kNaN;
  bool bounded = false;
};
BackInterval interval_back(const Transform& t, double lo, double hi);

}  // namespace powerback
