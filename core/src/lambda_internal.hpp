// lambda_internal.hpp — internals shared by the core's lambda sources (lambda_*.cpp): the
// prepared profile and its binned fast path. Private to the core: not installed, not a stable
// interface.
#pragma once

#include <Eigen/Dense>
#include <cmath>
#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "powerback/lambda.hpp"
#include "powerback/tall_qr.hpp"

namespace powerback {
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
// With precision weights every sum is weighted: counts become sums of w, the power sums sums of
// w delta^m, and the column sums (of the design scaled by sqrt(w), as factored) gain one more
// factor sqrt(w), so the same formulas give the weighted sums of squares.
// The binned series' pieces, shared by BinnedProfile and the chunked summaries
// (accumulate_lambda_finish.cpp). Within a bin centred at c, expm1(k t) / k = A + B e with
// A = expm1(k c) / k and B = exp(k c); when scaled, both are divided by exp(m) (em = exp(-m)).
struct BinTerms {
  double a, b;
};
inline BinTerms bin_terms(double k, double c, bool scaled, double m, double em) {
  const double kc = k * c;
  if (!scaled) return {k == 0.0 ? c : std::expm1(kc) / k, std::exp(kc)};
  const double b = std::exp(kc - m);
  return {k == 0.0 ? c * em : (b - em) / k, b};
}
// sum over j in [first, last] of s[j] k^(j - first), by Horner's rule.
inline double power_sum(const double* s, int first, int last, double k) {
  double e = s[last];
  for (int j = last - 1; j >= first; --j) e = e * k + s[j];
  return e;
}

class BinnedProfile {
 public:
  static constexpr int kTerms = 10;        // power sums of delta: the series of e and e^2
  static constexpr int kColumnTerms = 8;   // column-weighted sums: the series of e only
  static constexpr int kColumnSlot = kColumnTerms + 2;  // per bin and column: sum x, the terms, 0
  // t: the prepared values; second: which belong to Yeo-Johnson's negative group (used when
  // has_second). columns: the design's columns, intercept first (response case), or 0. t and
  // second must outlive the object.
  // weights, root_weights: NULL, or the rows' weights and their square roots (outliving the
  // object).
  BinnedProfile(const Eigen::ArrayXd& t, const Eigen::Array<bool, Eigen::Dynamic, 1>& second,
                bool has_second, double k_valid, std::size_t columns,
                const Eigen::ArrayXd* weights = nullptr, const Eigen::ArrayXd* root_weights = nullptr);
  // Worth it: far fewer bins than values (and, in the response case, a usable design).
  bool useful() const { return useful_; }
  // Response case: add the rows [r0, r0 + block.rows()) of the design (every column, the
  // intercept first; scaled by sqrt(w) when weighted), then, once every row is in, name the columns kept (kept[0] must be the
  // intercept, 0) and their R. A design without that intercept makes the object not useful.
  void add_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block);
  // The same with the design's columns after the intercept only (x: block rows by columns - 1),
  // for callers that read them in place from the predictors (the intercept's sums are the
  // counts and power sums, never read from the block).
  void add_predictor_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& x);
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
  const Eigen::ArrayXd* root_w_ = nullptr;  // weighted: sqrt(w) per row
  std::size_t bins_ = 0, columns_ = 0;
  std::vector<double> centre_, count_, sign_;
  std::vector<unsigned char> second_;
  std::vector<double> s1_, s2_;   // per bin, kTerms: sum delta^m / m! (m = 1..K); (2^m - 2) times it (m = 2..K)
  std::vector<double> xm_;        // response: per bin and design column, kColumnSlot values: sum x, sum x delta^m / m!
  std::vector<std::size_t> kept_; // response: the kept design columns
  Eigen::MatrixXd r_;             // response: their R
  mutable std::vector<double> a_, b_, e1_;
  mutable Eigen::VectorXd v_;
};

// The profile of one data set. Rows of weight 0 are dropped at construction (the prepared
// arrays hold the used rows only; rows() maps them back to the caller's indices).
//
// Evaluating lambdas the binned series cannot serve ("direct"): the rows are taken in blocks;
// each block's transformed values for every lambda of a batch form a matrix Z, and one pass
// gathers X_k' W Z (X_k the kept design columns) for the whole batch; the coefficients
// B = (R'R)^-1 X_k' W Z follow from R, and a second pass sums the squared residuals
// sqrt(W) (Z - X_k B) of every column. The residual sum of squares is stationary in B, so the
// rounding in B (the seminormal equations lose about cond(R) eps in B) enters only to second
// order, (cond(R) eps)^2 relative to the total sum of squares: no subtraction of sums of
// squares, no copy of the design, and a batch of m lambdas costs two passes instead of m.
// References: Bjorck, Numerical Methods for Least Squares Problems (1996), sec. 2.2 (the
// seminormal equations and their error).
class LambdaProfile {
 public:
  // Univariate: RSS about the (weighted) mean. `what` names the variable in messages ("x").
  LambdaProfile(const double* x, std::size_t n, Family family, const std::string& what,
                const double* weights = nullptr);
  // Response: RSS about the least-squares fit of `design` (which must have an intercept and
  // outlive the profile). Unweighted.
  LambdaProfile(const double* y, const LeastSquares& design, Family family, const std::string& what);
  // Response, with X (n-by-p, column-major, no intercept column; one is added) factored here in
  // one pass (factor_tall) while the binned sums are gathered. X (and the weights) must outlive
  // the profile: lambdas the bins do not cover are evaluated from X's rows.
  LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p, Family family,
                const std::string& what, const double* weights = nullptr);
  // Response, with the design's factorisation left to the caller, so that many responses
  // share one (lambda_many.cpp): y is checked and prepared here; then factor_design() on any
  // one of the profiles (they share X and the weights) with a visitor that passes every block
  // to each profile's add_design_rows(), and adopt_design() on each with the result. The
  // streamed constructor above is exactly this sequence for one response.
  struct DeferDesign {};
  LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p, Family family,
                const std::string& what, const double* weights, DeferDesign);
  TallFactor factor_design(const DesignBlockVisitor& gather) const;
  void add_design_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
    if (binned_) binned_->add_rows(r0, block);
  }
  void adopt_design(const TallFactor& f, const std::string& what);
  // The binned sums still need the design's rows (after DeferDesign).
  bool gathers_design_rows() const { return static_cast<bool>(binned_); }
  // Many responses (lambda_many.cpp): the design's rows, block by block as factor_design shows
  // them to its visitor (the same rows, values and block boundaries, so every sum is the same),
  // added to the binned sums of each of the count profiles in group (NULL entries skipped). The
  // profiles must share X and the weights with this one. Only reads X and this object, so
  // several threads may feed disjoint groups at once; polls the cancel check once per block.
  void feed_design_rows(LambdaProfile* const* group, std::size_t count) const;
  ~LambdaProfile();
  // The binned sums refer to this object's members: neither copied nor moved.
  LambdaProfile(const LambdaProfile&) = delete;
  LambdaProfile& operator=(const LambdaProfile&) = delete;

  // Profile log-likelihood at lambda (original scale, Jacobian included). direct = true skips
  // the binned fast path (for tests comparing the two).
  double loglik(double lambda, bool direct = false) const;
  // The same at m lambdas: those the binned series cannot serve are evaluated in one batch.
  void loglik_batch(const double* lambdas, std::size_t m, double* out, bool direct = false) const;
  // Direct evaluation at lambda: 1 - R^2 of the transformed values, the residual sum of squares
  // over the total one about the (weighted) mean.
  double unexplained_share(double lambda) const;
  bool binned() const { return static_cast<bool>(binned_); }
  // The binned series serves lambda (which implies 1 - R^2 > kBinnedFitGuard there).
  bool binned_serves(double lambda) const {
    double v;
    return binned_ && binned_->log_rss(lambda, &v);
  }
  std::size_t n() const { return static_cast<std::size_t>(t_.size()); }
  Family family() const { return family_; }
  bool response() const { return response_; }
  // Response case: rank of the design (intercept included) and its aliased columns.
  std::size_t rank() const { return kept_.size(); }
  const std::vector<std::size_t>& aliased() const { return aliased_; }

 private:
  void select_rows(const double* v, std::size_t n, const double* weights, const std::string& what);
  void prepare(const double* v);
  void check_rank(std::size_t n, std::size_t rank, const std::string& what) const;
  // log RSS at each lambda directly (see the class comment); exact-fit error when an RSS is 0.
  void log_rss_direct(const double* lambdas, std::size_t m, double* out,
                      double* log_tss = nullptr) const;
  void design_block(Eigen::Index r0, Eigen::Index nr, Eigen::MatrixXd& out) const;
  void make_binned(std::size_t columns);

  Family family_;
  const LeastSquares* design_ = nullptr;  // response case with a caller's factorised design
  const double* X_ = nullptr;   // streamed response: the caller's predictors (NULL when p = 0)
  std::size_t p_ = 0;           // streamed response: their columns
  std::size_t n_all_ = 0;       // the caller's rows (zero-weight ones included)
  bool response_ = false;
  std::vector<std::size_t> kept_, aliased_;  // response case: the design's columns used / dropped
  Eigen::MatrixXd r_;           // R of the kept columns (R'R = X_k' W X_k); 1x1 univariate
  std::vector<std::size_t> rows_;  // caller's index of each used row; empty when all are used
  Eigen::ArrayXd w_, root_w_;   // weights of the used rows and their roots; empty when unweighted
  double sum_w_ = 0.0, sum_log_w_ = 0.0;
  Eigen::ArrayXd t_;            // log magnitudes (see above)
  Eigen::Array<bool, Eigen::Dynamic, 1> neg_;  // Yeo-Johnson: v < 0
  bool any_neg_ = false, any_pos_ = false;
  double centre_ = 0.0;         // mean of t before centring (Box-Cox, one-signed Yeo-Johnson)
  bool centre_on_second_ = false;  // the centred group is Yeo-Johnson's negatives (k = 2 - lambda)
  double sum_pos_ = 0.0, sum_neg_ = 0.0;  // sums of t over v >= 0 and v < 0 (Yeo-Johnson)
  double jac_sum_ = 0.0;        // the Jacobian is (lambda - 1) jac_sum_ - n centre_ + the shift's part
  double pos_min_ = 0.0, pos_max_ = 0.0, neg_min_ = 0.0, neg_max_ = 0.0;  // ranges of t per sign
  std::unique_ptr<BinnedProfile> binned_;  // fast path for large n (see BinnedProfile)
};

// The estimate (and, for m >= 2, its profile curve on profile_grid(estimate, m)) from a prepared
// profile, as the public estimators compute it (lambda_search.cpp); the options are checked
// first.
LambdaEstimate estimate_on_profile(const LambdaProfile& prof, const LambdaOptions& opt,
                                   std::size_t m = 0, std::vector<double>* grid = nullptr,
                                   std::vector<double>* loglik = nullptr);
void check_lambda_options(const LambdaOptions& opt);

// The binned fast path is tried from this many observations on, for |k| up to kBinnedKValid
// (which covers lambda in [-3, 3] for both families, Yeo-Johnson's 2 - lambda included).
constexpr std::size_t kBinnedMinimumN = 4096;
constexpr double kBinnedKValid = 5.0;

// The binned series refuses a response fit with 1 - R^2 at or below this (subtracting the
// explained sum of squares would lose too many digits); the exact-fit check relies on every
// lambda the bins serve having 1 - R^2 above kExactFitRatio.
constexpr double kBinnedFitGuard = 1e-6;
static_assert(kBinnedFitGuard >= kExactFitRatio, "the bins must not serve an exact fit");

// Largest exponent evaluated without rescaling: exp(300)^2 * 1e12 values stays finite.
constexpr double kDirectLimit = 300.0;

}  // namespace detail
}  // namespace powerback
