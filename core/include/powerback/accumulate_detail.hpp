// powerback/accumulate_detail.hpp — pieces shared by the summary sources (not a stable
// interface): byte writing and strict reading, chunk checks, the stacked-R update, the search of
// a profile given as a function.
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <functional>
#include <string>
#include <vector>

#include "powerback/accumulate.hpp"
#include "powerback/errors.hpp"

namespace powerback {
namespace summary_detail {

// Largest exponent evaluated without rescaling: exp(300)^2 times 1e12 values stays finite.
constexpr double kScaleLimit = 300.0;

enum class Kind : std::uint32_t { Lambda = 1, LambdaGrid = 2, Fit = 3, FitChecks = 4 };

// Little-endian writer; finish() appends the checksum.
class ByteWriter {
 public:
  ByteWriter(Kind kind);
  void u8(std::uint8_t v) { out_.push_back(v); }
  void u32(std::uint32_t v);
  void u64(std::uint64_t v);
  void f64(double v);
  void f64s(const double* v, std::size_t n) {
    for (std::size_t i = 0; i < n; ++i) f64(v[i]);
  }
  void sum(const CompensatedSum& s) {
    f64(s.sum);
    f64(s.comp);
  }
  void matrix(const Eigen::MatrixXd& m) { f64s(m.data(), static_cast<std::size_t>(m.size())); }
  std::vector<unsigned char> finish();

 private:
  std::vector<unsigned char> out_;
};

// Strict reader: every read is bounds-checked; any failure is Error(Parse) naming what was read.
class ByteReader {
 public:
  // Checks the magic, version, kind, and checksum before anything else is read.
  ByteReader(const unsigned char* bytes, std::size_t len, Kind kind, const char* what);
  std::uint8_t u8(const char* field);
  std::uint32_t u32(const char* field);
  std::uint64_t u64(const char* field);
  double f64(const char* field);
  // A finite value (Error(Parse) otherwise).
  double finite(const char* field);
  CompensatedSum sum(const char* field);
  // A count no larger than limit.
  std::size_t count(const char* field, std::uint64_t limit);
  // rows x cols finite doubles; refuses sizes beyond what is left in the buffer.
  Eigen::MatrixXd matrix(std::size_t rows, std::size_t cols, const char* field);
  std::size_t remaining() const { return end_ - pos_; }
  // Every byte before the checksum was read.
  void done();
  [[noreturn]] void fail(const std::string& why) const;

 private:
  const unsigned char* b_;
  std::size_t pos_ = 0, end_ = 0;
  std::string what_;
};

// The chunk checks of the summaries: y finite (and accepted by `accept`), X finite, weights finite
// and >= 0. Messages name the rows (0-based within the chunk).
void check_weights(const double* w, std::size_t rows);
void check_predictors(const double* X, std::size_t rows, std::size_t ld, std::size_t p);
void check_lambda_response(const double* y, std::size_t rows, Family family);
// Every summary's add(): the pointers and leading dimension, then the weights, then (lambda
// summaries, family given) the response's domain, then the p predictor columns.
void check_chunk(const double* y, const double* X, std::size_t rows, std::size_t ld, std::size_t p,
                 const double* w, const Family* lambda_family = nullptr);

// Merging a summary into itself doubles it: merges a copy instead when other is self. True when
// it did (the caller's merge is then done).
template <class T>
bool merged_self(T& self, const T& other) {
  if (&other != &self) return false;
  const T copy(other);
  self.merge(copy);
  return true;
}

// r (c x c upper) := R of [r; block]; block is factored in place (its contents are destroyed).
void stack_r(Eigen::MatrixXd& r, Eigen::MatrixXd& work, Eigen::Index rows);
// R of [a; b] (both c x c upper).
Eigen::MatrixXd merge_r(const Eigen::MatrixXd& a, const Eigen::MatrixXd& b);

// Maximum and interval of the profile f over [opt.lower, opt.upper]: the maximiser and the interval
// search shared with the in-memory path (lambda_maximise.hpp).
LambdaEstimate search_profile(const std::function<double(double)>& f, const LambdaOptions& opt);
void check_lambda_options(const LambdaOptions& opt);

}  // namespace summary_detail
}  // namespace powerback

namespace powerback {

// The stored sums of a LambdaSummary (see accumulate.hpp). Group 0: Box-Cox's values and
// Yeo-Johnson's values >= 0; group 1: Yeo-Johnson's negative values.
struct LambdaSummary::State {
  static constexpr int K = 10;   // power sums of delta: the series of e and e^2
  static constexpr int KC = 8;   // column-weighted sums: the series of e
  static constexpr int S = KC + 1;  // per predictor: sum w x delta^m, m = 0..KC
  Family family = Family::BoxCox;
  std::size_t p = 0;
  std::size_t L = 0;              // one bin's record: w, K sums, p * S column sums
  std::uint64_t n = 0;            // rows with w > 0
  std::uint64_t count[2] = {0, 0};
  CompensatedSum t_sum[2], log_w;
  double t_min[2], t_max[2];
  double y_min, y_max;
  Eigen::MatrixXd r;              // (p + 1) x (p + 1), upper
  std::vector<std::int32_t> key;  // each bin's index j: centre (j + 1/2) h
  std::vector<std::uint8_t> group;
  std::vector<double> rec, comp;  // bins * L sums and their compensations
  std::int64_t jlo[2] = {0, 0};
  std::vector<std::int32_t> index[2];  // j - jlo -> bin, -1 when none

  State(Family f, std::size_t predictors);
  std::size_t bins() const { return key.size(); }
  // The bin of (g, j), made when new.
  std::size_t bin(int g, std::int64_t j);
  void rebuild_index();
};

}  // namespace powerback

namespace powerback {
namespace summary_detail {

// What a lambda summary's finish and its grid pass share: the design's kept columns and their R,
// the centring of the logs.
struct Finished {
  std::vector<std::size_t> kept, aliased;
  Eigen::MatrixXd rk;
  double centre = 0.0;
  int centred = -1;           // the group whose logs are centred (-1: none, two-signed Yeo-Johnson)
  double t_min[2], t_max[2];  // ranges after centring
};
// The checks of a summary about to finish (rows, constancy, rank) and the above.
Finished prepare_finish(const LambdaSummary::State& s);
// The profile log-likelihood from log RSS of the centred values.
double loglik_from(const LambdaSummary::State& s, const Finished& f, double lambda, double log_rss);

}  // namespace summary_detail
}  // namespace powerback

namespace powerback {

// The stored sums of a FitSummary.
struct FitSummary::State {
  Transform response;
  std::size_t p = 0, estimated = 0;
  std::uint64_t n = 0;
  CompensatedSum jacobian, log_w, weight;
  Eigen::MatrixXd r;  // (p + 2) x (p + 2): R of sqrt(w) [1 X z]
  State(const Transform& t, std::size_t predictors, std::size_t est);
};

namespace summary_detail {

// The fit of a summary on its kept columns: rz is R of [X_kept z] ((k + 1) x (k + 1)).
struct FitParts {
  std::vector<std::size_t> kept, aliased;
  Eigen::MatrixXd rz;
  Eigen::VectorXd coef;  // kept columns
  double rss = 0.0;
  double fitted_centre = 0.0, fitted_scale = 0.0;  // weighted mean and spread of the fitted values
};
FitParts fit_parts(const FitSummary::State& s);
void write_spec(ByteWriter& out, const TransformSpec& t);
Transform read_spec(ByteReader& in);

}  // namespace summary_detail
}  // namespace powerback
