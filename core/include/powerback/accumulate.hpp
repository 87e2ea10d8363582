// powerback/accumulate.hpp — mergeable summaries of data too large for one pass in one place.
//
// A summary takes rows in chunks (any number, any sizes, in any order), merges with summaries of
// other chunks (the merge is associative and commutative up to rounding), serialises to bytes
// and back, and finishes into the same results as the one-pass functions. Its size depends on
// the number of predictors p and on the spread of the response, never on the number of rows.
//
// LambdaSummary (the response power, see lambda.hpp for the profile log-likelihood) keeps:
//   - row counts, and compensated (Neumaier) sums of the log magnitudes t per sign (the Jacobian
//     term and the centre) and of log w (weights);
//   - the triangular factor R of the weighted design sqrt(w) [1 X] (R'R = X'WX); two factors
//     merge by a QR of the stacked pair;
//   - per-bin power sums of delta = t - c (bin centre c): sum w delta^m (m = 1..10) and
//     sum w x_j delta^m (m = 0..8) for every predictor. The bins have a fixed width h = 1/80 on t,
//     with edges at integer multiples of h, so no first pass is needed to place them. Centring
//     (Box-Cox, one-signed Yeo-Johnson) moves every bin centre by the same amount and leaves delta
//     unchanged, so it is applied at finish. With |k| <= 5 (k = lambda, or 2 - lambda for
//     Yeo-Johnson's negative values), |k delta| <= 1/32 and the series of lambda.hpp are exact to
//     rounding.
//   State: O(p^2 + bins * p) doubles, bins <= about 80 times the range of t (log y).
//   Sums inside one add() are taken in blocks of kSummaryFlushRows rows and each block is added
//   to the stored sums with Neumaier's compensation, so rounding grows with the block length,
//   not with n.
//
// The binned profile cannot serve a lambda when |k| > 5 (a search range wider than [-5, 5] for
// Box-Cox, [-3, 7] for Yeo-Johnson) or when the fit is so close to exact that subtracting the
// explained sum of squares loses the residual's digits: the binned value is used only while
// RSS > max(1e-6, 64 n eps) TSS (eps = 2^-52), a guard that grows with n because the
// log-likelihood's rounding grows as n times the relative error of RSS. finish() then says so
// (needs_pass) and names a lambda range; one further pass over the data with a LambdaGridPass
// evaluates the profile at every lambda of an equally spaced grid at once (a QR of the design
// with one column per lambda: no subtraction). The estimate and interval come from a cubic
// B-spline through the grid values; when the grid is coarse next to the interval, the pass's
// finish asks for one more pass over a narrower grid.
//
// Accuracy contract (checked by tests/core/test_accumulate_lambda.cpp): a summary built from any
// partition of the rows, merged in any order, finishes with |lambda-hat - one pass| <= 1e-7 and
// interval ends within 1e-9 of the one-pass estimate_response_lambda on the same rows, when the
// binned path serves (no needs_pass). The fallback grid path is accurate to about 1e-6 in
// lambda-hat and the interval ends after its refinement pass.
//
// FitSummary (a linear model at a fixed response transform T, as Model in model.hpp) keeps the R
// factor of sqrt(w) [1 X T(y)], counts and compensated sums of the Jacobian log |T'(y)| and of
// log w. finish() gives coefficients, sigma-hat, their covariance and the original-scale
// log-likelihood. FitCheckPass, built from a finished summary, takes the rows again (a second
// pass) for the checks that need residuals: Koenker's Breusch-Pagan, Ramsey's RESET, the
// residuals' skewness, and binned residual sums for the smearing mean of new predictions.
//
// Serialised bytes: "PWBS", a format version, a kind, the fields in little-endian order and a
// 64-bit FNV-1a checksum of everything before it. Reading is strict: a wrong magic, version,
// kind, size, count, checksum or an impossible value is Error(Parse); nothing is read past the
// buffer's end.
#pragma once

#include <Eigen/Dense>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "powerback/family_math.hpp"
#include "powerback/lambda.hpp"
#include "powerback/transform.hpp"

namespace powerback {

constexpr std::uint32_t kSummaryFormatVersion = 1;
constexpr std::size_t kSummaryFlushRows = 65536;
constexpr double kSummaryBinWidth = 1.0 / 80.0;  // 1 / (16 * 5): |k delta| <= 1/32 for |k| <= 5

// Neumaier's compensated sum.
struct CompensatedSum {
  double sum = 0.0, comp = 0.0;
  void add(double x) {
    const double t = sum + x;
    if (std::fabs(sum) >= std::fabs(x)) comp += (sum - t) + x;
    else comp += (x - t) + sum;
    sum = t;
  }
  void add(const CompensatedSum& o) {
    add(o.sum);
    add(o.comp);
  }
  double value() const { return sum + comp; }
};

struct SummaryLambdaResult {
  LambdaEstimate estimate;            // NaN fields when needs_pass
  std::vector<double> grid, loglik;   // the profile on profile_grid(estimate, m) (empty when needs_pass)
  bool needs_pass = false;            // evaluate the profile on a grid in one more pass
  double pass_lower = math::kNaN, pass_upper = math::kNaN;  // that grid's range
  std::size_t pass_points = 0;        // and its suggested size
  std::string note;                   // why a pass is needed ("" otherwise)
  bool from_grid = false;             // the estimate comes from a grid pass's spline
};

class LambdaGridPass;

class LambdaSummary {
 public:
  // family: BoxCox or YeoJohnson; p: predictors (an intercept is added).
  LambdaSummary(Family family, std::size_t p);
  ~LambdaSummary();
  LambdaSummary(const LambdaSummary&);
  LambdaSummary& operator=(const LambdaSummary&);
  LambdaSummary(LambdaSummary&&) noexcept;
  LambdaSummary& operator=(LambdaSummary&&) noexcept;

  // rows of y (length rows), X (column j of row i at X[j * ld + i], ld >= rows; NULL when p = 0)
  // and optional precision weights w (NULL: all 1; 0 drops a row, as lm does). Throws
  // IndexedError naming y's bad rows (0-based within the chunk), Error(NonFinite) naming X's
  // first bad row and column, Error(Argument) for a negative or non-finite weight (rows named).
  // The summary is unchanged when add throws.
  void add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w);
  // Adds another summary of the same family and p (Error(Argument) otherwise).
  void merge(const LambdaSummary& other);
  std::vector<unsigned char> serialize() const;
  static LambdaSummary deserialize(const unsigned char* bytes, std::size_t len);

  // The estimate, interval and profile curve (curve_points >= 2 on profile_grid). Errors:
  // Error(Argument) with no rows, fewer than 3, a constant response, bad options;
  // Error(Singular) when n <= rank + 1.
  SummaryLambdaResult finish(const LambdaOptions& opt, std::size_t curve_points = 101,
                             std::size_t pass_points = 41) const;
  // The binned profile log-likelihood at lambda; false when the bins cannot serve it.
  bool loglik(double lambda, double* out) const;

  Family family() const;
  std::size_t predictors() const;
  std::size_t n() const;      // rows with a positive weight
  std::size_t bins() const;

  struct State;
 private:
  friend class LambdaGridPass;
  std::unique_ptr<State> s_;
};

// The second pass of the fallback: the profile at every lambda of an equally spaced grid.
class LambdaGridPass {
 public:
  // grid: m >= 4 equally spaced lambdas, increasing. The summary fixes the design's kept columns,
  // the centring and the scaling; it must be the finished summary of the same rows.
  LambdaGridPass(const LambdaSummary& summary, const std::vector<double>& grid);
  ~LambdaGridPass();
  LambdaGridPass(const LambdaGridPass&);
  LambdaGridPass& operator=(const LambdaGridPass&);
  LambdaGridPass(LambdaGridPass&&) noexcept;
  LambdaGridPass& operator=(LambdaGridPass&&) noexcept;

  void add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w);
  void merge(const LambdaGridPass& other);
  std::vector<unsigned char> serialize() const;
  static LambdaGridPass deserialize(const unsigned char* bytes, std::size_t len);
  // The profile log-likelihood at each grid lambda (needs the summary for n and the Jacobian;
  // Error(Argument) when the pass saw other rows than the summary).
  std::vector<double> profile(const LambdaSummary& summary) const;
  const std::vector<double>& grid() const;
  // Estimate from the spline through the grid values; needs_pass again (with a narrower range)
  // when the grid spacing is coarse next to the interval.
  SummaryLambdaResult finish(const LambdaSummary& summary, const LambdaOptions& opt,
                             std::size_t curve_points = 101) const;

  struct State;
 private:
  explicit LambdaGridPass(std::unique_ptr<State> s);
  std::unique_ptr<State> s_;
};

// ---- the final model at fixed transforms --------------------------------------------------

struct SummaryFit {
  std::size_t n = 0, columns = 0, rank = 0, df_residual = 0;
  Eigen::VectorXd coef, se;           // NaN where aliased; intercept first
  std::vector<bool> aliased;
  Eigen::MatrixXd covariance;         // sigma^2 (X'WX)^-1, NaN rows/columns where aliased
  double sigma = math::kNaN, rss = math::kNaN, loglik = math::kNaN, jacobian = math::kNaN;
  double loglik_df = math::kNaN;
  double sum_log_weights = 0.0;
};

struct SummaryChecks {
  std::size_t n = 0;
  double skewness = math::kNaN;
  double bp_statistic = math::kNaN, bp_df = math::kNaN, bp_p = math::kNaN;
  double reset_f = math::kNaN, reset_df1 = math::kNaN, reset_df2 = math::kNaN,
         reset_p = math::kNaN;
};

class FitCheckPass;

class FitSummary {
 public:
  // response: T applied to y (identity when default-constructed); p predictors plus intercept.
  // estimated_parameters is added to the log-likelihood's df (1 when lambda was estimated).
  FitSummary(const Transform& response, std::size_t p, std::size_t estimated_parameters = 0);
  ~FitSummary();
  FitSummary(const FitSummary&);
  FitSummary& operator=(const FitSummary&);
  FitSummary(FitSummary&&) noexcept;
  FitSummary& operator=(FitSummary&&) noexcept;

  // As LambdaSummary::add; y's rows that T cannot map are an IndexedError naming them.
  void add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w);
  void merge(const FitSummary& other);  // same transform, p and estimated_parameters
  std::vector<unsigned char> serialize() const;
  static FitSummary deserialize(const unsigned char* bytes, std::size_t len);
  // Error(Argument) with no rows; Error(Singular) with no residual degrees of freedom.
  SummaryFit finish() const;
  std::size_t predictors() const;
  std::size_t n() const;
  const Transform& response() const;

  struct State;
 private:
  friend class FitCheckPass;
  explicit FitSummary(std::unique_ptr<State> s);
  std::unique_ptr<State> s_;
};

// The second pass of a fitted summary: residual checks and binned residual sums (smearing).
// Residuals are sqrt(w) (T(y) - x'b) (the weighted residuals; plain residuals without weights).
class FitCheckPass {
 public:
  explicit FitCheckPass(const FitSummary& summary);
  ~FitCheckPass();
  FitCheckPass(const FitCheckPass&);
  FitCheckPass& operator=(const FitCheckPass&);
  FitCheckPass(FitCheckPass&&) noexcept;
  FitCheckPass& operator=(FitCheckPass&&) noexcept;

  void add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w);
  void merge(const FitCheckPass& other);
  std::vector<unsigned char> serialize() const;
  static FitCheckPass deserialize(const unsigned char* bytes, std::size_t len);
  SummaryChecks finish() const;
  // Duan's smearing mean of T^-1(eta + e) over the training residuals e, for each eta, from the
  // binned residual sums (bins of width sigma / 256; within a bin T^-1 is replaced by its
  // quadratic through the bin's centre and edges). NaN where T^-1 is undefined in some bin.
  std::vector<double> smearing_mean(const double* eta, std::size_t m) const;
  std::size_t n() const;

  struct State;
 private:
  explicit FitCheckPass(std::unique_ptr<State> s);
  std::unique_ptr<State> s_;
};

}  // namespace powerback
