// powerback/mean_interval.hpp — confidence intervals for the original-scale MEAN of the response
// at new rows, and for averages of those means over groups of rows.
//
// A back-transformed fit T^{-1}(x0'b) estimates a median, not a mean; the mean needs a correction
// (the smearing or the normal-theory mean of backtransform.hpp). This file gives that corrected
// mean an interval. Every interval here treats the response transform as KNOWN: when lambda was
// estimated from the same data, its uncertainty is not included (the intervals are then too
// narrow by an amount that grows with the width of lambda's own interval).
//
// The estimate at a row x0 (transformed-scale fit mu = x0'b):
//   smearing: m = (1/n) sum_i T^{-1}(mu + e_i) over the n smearing residuals (Duan 1983);
//   normal:   m = E[T^{-1}(mu + sigma Z)], Z standard normal (truncated to the inverse's range).
// A group G of rows gets M = (1/|G|) sum_{k in G} m_k.
//
// Delta method (a first-order expansion in the estimated quantities):
//   smearing: the residuals r_i = z_i - D_i'b (D the fitted design, sqrt(w) [1 X] when weighted)
//     depend on b too, so M = (1/n) sum_i u_i(b), u_i = (1/|G|) sum_k T^{-1}(x_k'b + r_i(b)),
//     moves with b along
//       g = (1/|G|) sum_k m'(mu_k) x_k - (1/(n |G|)) sum_i sum_k (T^{-1})'(mu_k + r_i) D_i,
//     (for one row at the mean design row of an intercept model g is 0: an intercept error
//     shifts the fit and every residual in opposite directions). With the errors eps_i,
//     M - M0 ~ (1/n) sum_i (u_i - M0) + g'(D'D)^{-1} D' eps, whose variance is
//       var M = sigma^2 g'(D'D)^{-1} g + S^2 / n + (2 / n) (g'(D'D)^{-1} D' 1) C,
//     S^2 the sample variance (divisor n - 1) of u_i over i and C its sample covariance with
//     r_i; the last term is 0 for an unweighted model with an intercept (D'1 is then D e_1).
//   normal:   var M = sigma^2 gbar' (X'WX)^{-1} gbar + (dM/dsigma^2)^2 * 2 sigma^4 / df, with
//     gbar = (1/|G|) sum_k m'(mu_k) x_k and var(sigma^2-hat) = 2 sigma^4 / df under normal
//     errors, sigma-hat independent of b.
// For the log family on an intercept-only model the normal-theory interval below is the "Cox
// method" interval for a lognormal mean: log-scale mean + s^2/2 -+ z sqrt(s^2/n + s^4/(2(n-1))),
// exponentiated (Zhou & Gao 1997, Statistics in Medicine; formula from memory).
// Quantiles are standard normal (z), not Student t: the delta variance mixes the coefficients'
// and sigma's uncertainty and has no exact t distribution; z is the first-order choice and the
// one the Cox interval uses.
// When M > 0 the interval is formed on log M (se(log M) = se(M) / M) and exponentiated, which
// keeps both endpoints positive; otherwise M -+ z se(M) (flag kMeanLinearScale).
//
// Cost. The derivative m'(mu) is computed in time linear in the rows: exactly for the identity
// and the exponential families (log, log10, Box-Cox 0, where m' = a m on the v scale), and for
// the other families by a five-point central difference of the linear-time smearing mean
// (smearing.hpp) with step h = 1e-4 max(1, |mu|) (truncation h^4, rounding ~1e-12 / h: a
// relative error near 1e-8, far below what an interval needs). The normal-theory mean's
// derivatives in mu and sigma are exact for the exponential families and the identity and by
// the same five-point differences of normal_mean otherwise. The residual parts of the smearing
// variance (S^2, C and the residual part of g) are exact and linear for the identity and the
// exponential families (u_i is then affine in T^{-1}(r_i), and the residual part of g is
// exp(a mu) times a fixed vector). For the other families they are summed over residuals and
// rows directly when n x (new rows) <= kMeanDirectPairs. Above that, S^2 and C are summed over q
// evenly spaced order statistics of the residuals (the (j + 1/2)/q quantiles,
// q = max(kMeanMinQuantiles, kMeanDirectPairs / rows), at most n), an approximation whose
// relative error is O(1/q) for smooth inverses, and the residual part of g is taken as
// mean_k m'(mu_k) times the mean design row, which drops the sample covariance between
// (T^{-1})'(mu + r_i) and D_i (zero in expectation when the errors are independent of the
// predictors, as the model assumes).
//
// Bootstrap (percentile): the residuals are resampled, not the cases, so that the design, its
// factorisation and its rank stay fixed (a case resample can lose a factor level and change the
// model) and so that the errors are treated as exchangeable, which is the assumption the
// smearing estimate itself makes. The resampled residuals are the modified residuals
// e_i sqrt(n / df), centred (Davison & Hinkley 1997, Bootstrap Methods and their Application,
// ch. 6, from memory), in the weighted least-squares space (sqrt(w) e). Each replicate
// z* = fitted + e* is refitted on the same design with the transform FIXED, and the mean (and
// each group's mean) recomputed with the replicate's residuals or sigma. The interval is the
// (1 -+ level)/2 quantiles of the replicates (R's quantile type 7: linear interpolation between
// order statistics). Random indices come from std::mt19937_64 seeded with the caller's seed,
// mapped to 0..n-1 by x mod n after rejecting the 2^64 mod n smallest outputs (no standard
// distribution object, whose output differs between library implementations), so a seed gives
// the same interval on every platform. Memory: replicates x outputs doubles, at most
// kMeanBootstrapMaxValues. Cost per replicate: one solve on the stored factorisation (O(n p)),
// the smearing structure of the replicate's residuals (O(n log n) for families without a closed
// form) and one mean per new row (a quadrature each for the normal-theory mean of those
// families, which makes that combination the slowest).
//
// References
//   Duan, N. (1983). Smearing estimate: a nonparametric retransformation method. JASA 78, 605-610.
//   Zhou, X.-H. & Gao, S. (1997). Confidence intervals for the log-normal mean. Statistics in
//     Medicine (the Cox method; cited from memory).
//   Davison, A. C. & Hinkley, D. V. (1997). Bootstrap Methods and their Application, ch. 5-6.
#pragma once

#include <cstddef>
#include <cstdint>
#include <random>
#include <vector>

#include "powerback/model.hpp"

namespace powerback {

enum class MeanIntervalMethod { Delta = 0, Bootstrap };

struct MeanIntervalOptions {
  double level = 0.95;
  MeanMethod mean_method = MeanMethod::Smearing;
  MeanIntervalMethod method = MeanIntervalMethod::Delta;
  std::size_t replicates = 999;  // bootstrap only; at least kMeanMinReplicates
  std::uint64_t seed = 1;        // bootstrap only
};

constexpr std::size_t kMeanDirectPairs = std::size_t(1) << 24;
constexpr std::size_t kMeanMinQuantiles = 512;
constexpr std::size_t kMeanMinReplicates = 10;
constexpr std::size_t kMeanBootstrapMaxValues = std::size_t(1) << 26;

// Flags of an output (besides kPredBounded and kPredMissing of model.hpp).
constexpr unsigned kMeanLinearScale = 4u;  // interval formed as M -+ z se (M not positive)
// Bootstrap only: some replicates gave a non-finite mean (the interval is then NaN).
constexpr unsigned kMeanReplicateFailed = 8u;

struct MeanIntervals {
  // One value per output: a group (when groups are given) or a row.
  std::vector<double> fit;    // the mean estimate M
  std::vector<double> se;     // delta: its standard error; bootstrap: the replicates' SD
  std::vector<double> lower, upper;
  std::vector<unsigned> flags;
  std::vector<std::size_t> rows;  // new rows in each output
};

// Intervals for the original-scale mean at m new rows (Xnew column-major m-by-p, the model's
// predictor columns without the intercept). group: NULL (each row is an output) or m ids in
// [0, n_groups), each id used at least once; output g averages the rows with id g. A row with a
// non-finite predictor makes its output NaN, flagged kPredMissing. Throws Error(Argument) for a
// level outside (0, 1), p other than the model's, a group id out of range or unused, fewer than
// kMeanMinReplicates bootstrap replicates or more than kMeanBootstrapMaxValues stored values,
// Error(Cancelled) when the thread's cancellation check says stop between replicates.
MeanIntervals mean_intervals(const Model& model, const double* Xnew, std::size_t m, std::size_t p,
                             const std::size_t* group, std::size_t n_groups,
                             const MeanIntervalOptions& opt);

// The per-row pieces the delta method uses, exposed for tests: the mean m(mu), dm/dmu, and (normal
// method) dm/dsigma^2 (NaN for smearing), all in original units.
struct MeanDerivatives {
  double mean = 0, d_mu = 0, d_sigma2 = 0;
  bool bounded = false;
};
MeanDerivatives mean_derivatives(const Model& model, double mu, MeanMethod method);

// A uniform index in [0, n) from a 64-bit Mersenne twister (whose output sequence the C++
// standard fixes): x mod n after rejecting the values below 2^64 mod n, so that the values kept
// are a whole multiple of n in number: the same sequence on every platform. n >= 1.
std::size_t uniform_index(std::mt19937_64& rng, std::size_t n);

}  // namespace powerback
