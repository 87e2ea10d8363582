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
// References: Box, G. E. P. & Cox, D. R. (1964). An analysis of transformations. JRSS B 26,
//   211-252 (sec. 3, the maximised log-likelihood and the approximate confidence region).
//   Yeo, I.-K. & Johnson, R. A. (2000). Biometrika 87, 954-959 (sec. 3, the same profile for
//   their family).
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "powerback/family_math.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

struct LambdaOptions {
  double lower = -3.0, upper = 3.0;  // search range
  double level = 0.95;               // confidence level of the likelihood-ratio interval
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
// Throws IndexedError(NonFinite) for NaN/Inf values, IndexedError(Domain) for x <= 0 with Box-Cox,
// Error(Argument) for n < 3, a constant x, a bad family, lower >= upper or level outside (0, 1).
LambdaEstimate estimate_lambda(const double* x, std::size_t n, Family family,
                               const LambdaOptions& opt = {});

// Response lambda given predictors: X n-by-p column-major, no intercept column (one is added).
// The design is factored once, without Q (factor_tall), in the same pass that gathers the binned
// sums. Same errors for y (checked first); Error(Singular) when n <= rank + 1; X's errors as
// LeastSquares.
LambdaEstimate estimate_response_lambda(const double* y, const double* X, std::size_t n,
                                        std::size_t p, Family family,
                                        const LambdaOptions& opt = {});

// Same, reusing a factorised design (for leave-one-out and other callers). y has design.n() values.
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

// The convenient value: of {-2,-1,-0.5,0,0.5,1,2} the one nearest lambda inside [lo, hi]; else
// lambda rounded to 2 decimals.
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

// A grid of m points (m >= 2) for plotting an estimate's profile: it spans the interval with a
// margin of 1.5 times its width on each side (at least 0.1 each side), clipped to the search range.
std::vector<double> profile_grid(const LambdaEstimate& est, std::size_t m = 101);

// ---- internals shared by the core's lambda sources (not a stable interface) ----------------
namespace detail {

// Validated data in the form the profile needs, prepared once:
//   Box-Cox:     t_i = log v_i - mean(log v)  (centred logs; the centre's effect on the RSS is
//                an exact factor exp(2 lambda centre), so it is added back in log space)
//   Yeo-Johnson: t_i = log1p(|v_i|), with the sign of v_i kept (centred too when all v_i have
//                one sign)
// For each lambda the transformed values are written as s_i expm1(k_i t_i) / k_i, with
// k_i = lambda (v >= 0, and all of Box-Cox) or 2 - lambda (Yeo-Johnson, v < 0) and s_i = +-1.
// When the largest exponent k_i t_i exceeds kDirectLimit the values are computed divided by
// exp(m) (m that largest exponent) and the RSS gains 2 m in log space, so nothing overflows.
// The data binned on t (bins of width h = 1 / (16 k_valid)), with per-bin power sums of
// delta = t - bin centre, so that the profile at any lambda with |k| <= k_valid costs
// O(bins * terms) instead of O(n): within a bin, expm1(k t) / k = A + B e with
// A = expm1(k c) / k, B = exp(k c) and e = expm1(k delta) / k = sum_m k^(m-1) delta^m / m!.
// |k delta| <= 1/32 bounds the relative remainder of that series after M terms by
// (1/32)^M / (M+1)! (Taylor's theorem): below 3e-18 for M = kColumnTerms = 8, and the series of
// e^2 = sum_m (2^m - 2) k^(m-2) delta^m / m! (m >= 2) after kTerms = 10 terms by
// 2^11 (1/32)^9 / 11!, below 2e-18. Both are exact to rounding. In the response case the sums
// of e weighted by each design column give X' z, and R (R'R = X'X) turns it into the explained
// sum of squares; the rows are added block by block while the design is factored.
class BinnedProfile {
 public:
  static constexpr int kTerms = 10;        // power sums of delta: the series of e and e^2
  static constexpr int kColumnTerms = 8;   // column-weighted sums: the series of e only
  static constexpr int kColumnSlot = kColumnTerms + 2;  // per bin and column: sum x, the terms, 0
  // t: the prepared values; second: which belong to Yeo-Johnson's negative group (used when
  // has_second). columns: the design's columns, intercept first (response case), or 0. t and
  // second must outlive the object.
  BinnedProfile(const Eigen::ArrayXd& t, const Eigen::Array<bool, Eigen::Dynamic, 1>& second,
                bool has_second, double k_valid, std::size_t columns);
  // Worth it: far fewer bins than values (and, in the response case, a usable design).
  bool useful() const { return useful_; }
  // Response case: add the rows [r0, r0 + block.rows()) of the design (every column, the
  // intercept first), then, once every row is in, name the columns kept (kept[0] must be the
  // intercept, 0) and their R. A design without that intercept makes the object not useful.
  void add_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block);
  void set_design(const std::vector<std::size_t>& kept, const Eigen::MatrixXd& r);
  // log RSS at lambda; false when lambda is outside what the bins cover or the result would
  // lose accuracy (the caller then evaluates directly).
  bool log_rss(double lambda, double* out) const;

 private:
  std::size_t bin_of(Eigen::Index i) const;

  bool useful_ = false;
  double k_valid_ = 0.0, h_ = 0.0, inv_h_ = 0.0;
  double lo_[2] = {0.0, 0.0};
  std::size_t nb_[2] = {0, 0};
  const Eigen::ArrayXd& t_;
  const Eigen::Array<bool, Eigen::Dynamic, 1>& second_of_;
  bool has_second_ = false;
  std::size_t bins_ = 0, columns_ = 0;
  std::vector<double> centre_, count_, sign_;
  std::vector<unsigned char> second_;
  std::vector<double> s1_, s2_;   // per bin, kTerms: sum delta^m / m! (m = 1..K); (2^m - 2) times it (m = 2..K)
  std::vector<double> xm_;        // response: per bin and design column, kColumnSlot values: sum x, sum x delta^m / m!
  std::vector<std::size_t> kept_; // response: the kept design columns
  Eigen::MatrixXd r_;             // response: their R
  std::vector<std::size_t> row_bin_;  // add_rows' work space: each row's bin
  std::vector<double> row_pw_;        // and its delta^m / m!
  mutable std::vector<double> a_, b_, e1_;
  mutable Eigen::VectorXd v_;
};

class LambdaProfile {
 public:
  // Univariate: RSS about the mean. `what` names the variable in messages ("x").
  LambdaProfile(const double* x, std::size_t n, Family family, const std::string& what);
  // Response: RSS about the least-squares fit of `design` (which must have an intercept and
  // outlive the profile).
  LambdaProfile(const double* y, const LeastSquares& design, Family family, const std::string& what);
  // Response, with X (n-by-p, column-major, no intercept column; one is added) factored here in
  // one pass (factor_tall) while the binned sums are gathered. X must outlive the profile: a
  // lambda the bins do not cover is evaluated on a LeastSquares of the kept columns, built then.
  LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p, Family family,
                const std::string& what);
  ~LambdaProfile();
  // The binned sums refer to this object's members: neither copied nor moved.
  LambdaProfile(const LambdaProfile&) = delete;
  LambdaProfile& operator=(const LambdaProfile&) = delete;

  // Profile log-likelihood at lambda (original scale, Jacobian included). direct = true skips
  // the binned fast path (for tests comparing the two).
  double loglik(double lambda, bool direct = false) const;
  bool binned() const { return static_cast<bool>(binned_); }
  std::size_t n() const { return static_cast<std::size_t>(t_.size()); }
  Family family() const { return family_; }
  // Response case: rank of the design (intercept included) and its aliased columns.
  std::size_t rank() const { return kept_.size(); }
  const std::vector<std::size_t>& aliased() const { return aliased_; }

 private:
  void prepare(const double* v, std::size_t n);
  void check_rank(std::size_t n, std::size_t rank, const std::string& what) const;
  double log_rss(double lambda) const;
  double log_rss_direct(double lambda) const;
  void make_binned(std::size_t columns);
  const LeastSquares& direct_design() const;

  Family family_;
  const LeastSquares* design_ = nullptr;  // response case: the caller's, or owned_ once built
  mutable std::unique_ptr<LeastSquares> owned_;  // streamed response: built on first direct use
  const double* X_ = nullptr;   // streamed response: the caller's predictors (NULL when p = 0)
  bool response_ = false;
  std::vector<std::size_t> kept_, aliased_;  // response case: the design's columns used / dropped
  Eigen::ArrayXd t_;            // log magnitudes (see above)
  Eigen::Array<bool, Eigen::Dynamic, 1> neg_;  // Yeo-Johnson: v < 0
  bool any_neg_ = false, any_pos_ = false;
  double centre_ = 0.0;         // mean of t before centring (Box-Cox, one-signed Yeo-Johnson)
  bool centre_on_second_ = false;  // the centred group is Yeo-Johnson's negatives (k = 2 - lambda)
  double sum_pos_ = 0.0, sum_neg_ = 0.0;  // sums of t over v >= 0 and v < 0 (Yeo-Johnson)
  double pos_min_ = 0.0, pos_max_ = 0.0, neg_min_ = 0.0, neg_max_ = 0.0;  // ranges of t per sign
  mutable Eigen::VectorXd w_;   // work space: transformed values at the current lambda
  std::unique_ptr<BinnedProfile> binned_;  // fast path for large n (see BinnedProfile)
};

// The binned fast path is tried from this many observations on, for |k| up to kBinnedKValid
// (which covers lambda in [-3, 3] for both families, Yeo-Johnson's 2 - lambda included).
constexpr std::size_t kBinnedMinimumN = 4096;
constexpr double kBinnedKValid = 5.0;

// Largest exponent evaluated without rescaling: exp(300)^2 * 1e12 values stays finite.
constexpr double kDirectLimit = 300.0;

}  // namespace detail
}  // namespace powerback
