// Pieces shared by the summaries: the byte format, chunk checks, the stacked R update.
#include <algorithm>
#include <cmath>
#include <string>

#include "powerback/accumulate_detail.hpp"

namespace powerback {
namespace summary_detail {
namespace {

constexpr unsigned char kMagic[4] = {'P', 'W', 'B', 'S'};
constexpr std::size_t kHeader = 4 + 4 + 4;  // magic, version, kind
constexpr std::size_t kChecksum = 8;

std::uint64_t fnv1a(const unsigned char* b, std::size_t n) {
  std::uint64_t h = 14695981039346656037ull;
  for (std::size_t i = 0; i < n; ++i) {
    h ^= b[i];
    h *= 1099511628211ull;
  }
  return h;
}

void put_le(std::vector<unsigned char>& out, std::uint64_t v, int bytes) {
  for (int i = 0; i < bytes; ++i) out.push_back(static_cast<unsigned char>((v >> (8 * i)) & 0xffu));
}

std::uint64_t get_le(const unsigned char* b, int bytes) {
  std::uint64_t v = 0;
  for (int i = 0; i < bytes; ++i) v |= static_cast<std::uint64_t>(b[i]) << (8 * i);
  return v;
}

const char* kind_name(Kind k) {
  switch (k) {
    case Kind::Lambda: return "a lambda summary";
    case Kind::LambdaGrid: return "a lambda grid pass";
    case Kind::Fit: return "a fit summary";
    case Kind::FitChecks: return "a fit check pass";
  }
  return "an unknown summary";
}

std::string plural_rows(std::size_t k) { return std::to_string(k) + (k == 1 ? " row" : " rows"); }

// The rows of [0, rows) where bad(i) holds: their count and the first kMaxReportedIndices.
struct BadRows {
  std::size_t count = 0;
  std::vector<std::size_t> first;
};
template <class Bad>
BadRows find_bad_rows(std::size_t rows, Bad bad) {
  BadRows out;
  for (std::size_t i = 0; i < rows; ++i)
    if (bad(i)) {
      ++out.count;
      if (out.first.size() < kMaxReportedIndices) out.first.push_back(i);
    }
  return out;
}

}  // namespace

ByteWriter::ByteWriter(Kind kind) {
  out_.reserve(1024);
  for (unsigned char m : kMagic) out_.push_back(m);
  put_le(out_, kSummaryFormatVersion, 4);
  put_le(out_, static_cast<std::uint32_t>(kind), 4);
}
void ByteWriter::u32(std::uint32_t v) { put_le(out_, v, 4); }
void ByteWriter::u64(std::uint64_t v) { put_le(out_, v, 8); }
void ByteWriter::f64(double v) {
  std::uint64_t u;
  std::memcpy(&u, &v, 8);
  put_le(out_, u, 8);
}
std::vector<unsigned char> ByteWriter::finish() {
  const std::uint64_t h = fnv1a(out_.data(), out_.size());
  put_le(out_, h, 8);
  return std::move(out_);
}

ByteReader::ByteReader(const unsigned char* bytes, std::size_t len, Kind kind, const char* what)
    : b_(bytes), what_(what) {
  if (!bytes && len > 0) throw Error(ErrorCode::Argument, what_ + ": the byte buffer is NULL");
  if (len < kHeader + kChecksum)
    fail("only " + std::to_string(len) + " bytes, fewer than any summary has (truncated?)");
  if (std::memcmp(bytes, kMagic, 4) != 0) fail("these bytes are not a powerback summary (wrong magic)");
  const std::uint64_t version = get_le(bytes + 4, 4);
  if (version != kSummaryFormatVersion)
    fail("format version " + std::to_string(version) + " is not the version this library reads (" +
         std::to_string(kSummaryFormatVersion) + ")");
  const std::uint64_t k = get_le(bytes + 8, 4);
  if (k != static_cast<std::uint64_t>(kind))
    fail("the bytes hold " +
         std::string(k >= 1 && k <= 4 ? kind_name(static_cast<Kind>(k)) : "an unknown kind") +
         ", not " + kind_name(kind));
  end_ = len - kChecksum;
  if (fnv1a(bytes, end_) != get_le(bytes + end_, 8))
    fail("the checksum does not match: the bytes were corrupted or truncated");
  pos_ = kHeader;
}

void ByteReader::fail(const std::string& why) const {
  throw Error(ErrorCode::Parse, "cannot read " + what_ + ": " + why);
}

std::uint8_t ByteReader::u8(const char* field) {
  if (remaining() < 1) fail(std::string("the buffer ends inside ") + field);
  return b_[pos_++];
}
std::uint32_t ByteReader::u32(const char* field) {
  if (remaining() < 4) fail(std::string("the buffer ends inside ") + field);
  const std::uint64_t v = get_le(b_ + pos_, 4);
  pos_ += 4;
  return static_cast<std::uint32_t>(v);
}
std::uint64_t ByteReader::u64(const char* field) {
  if (remaining() < 8) fail(std::string("the buffer ends inside ") + field);
  const std::uint64_t v = get_le(b_ + pos_, 8);
  pos_ += 8;
  return v;
}
double ByteReader::f64(const char* field) {
  const std::uint64_t u = u64(field);
  double v;
  std::memcpy(&v, &u, 8);
  return v;
}
double ByteReader::finite(const char* field) {
  const double v = f64(field);
  if (!std::isfinite(v)) fail(std::string(field) + " is not finite");
  return v;
}
CompensatedSum ByteReader::sum(const char* field) {
  CompensatedSum s;
  s.sum = finite(field);
  s.comp = finite(field);
  return s;
}
std::size_t ByteReader::count(const char* field, std::uint64_t limit) {
  const std::uint64_t v = u64(field);
  if (v > limit) fail(std::string(field) + " is " + std::to_string(v) + ", beyond its limit " + std::to_string(limit));
  return static_cast<std::size_t>(v);
}
Eigen::MatrixXd ByteReader::matrix(std::size_t rows, std::size_t cols, const char* field) {
  if (rows != 0 && cols > remaining() / 8 / rows) fail(std::string("the buffer ends inside ") + field);
  Eigen::MatrixXd m(static_cast<Eigen::Index>(rows), static_cast<Eigen::Index>(cols));
  for (Eigen::Index i = 0; i < m.size(); ++i) m.data()[i] = finite(field);
  return m;
}
void ByteReader::done() {
  if (pos_ != end_) fail(std::to_string(end_ - pos_) + " unexpected bytes after the last field");
}

void check_weights(const double* w, std::size_t rows) {
  if (!w) return;
  const BadRows bad = find_bad_rows(rows, [&](std::size_t i) { return !(std::isfinite(w[i]) && w[i] >= 0.0); });
  if (bad.count)
    throw IndexedError(ErrorCode::Argument,
                       "the weights must be finite and >= 0; " + plural_rows(bad.count) + " are not, at " +
                           format_indices(bad.first, bad.count) + " (0-based in this chunk): fix or drop them",
                       bad.count, bad.first);
}

void check_predictors(const double* X, std::size_t rows, std::size_t ld, std::size_t p) {
  for (std::size_t j = 0; j < p; ++j)
    for (std::size_t i = 0; i < rows; ++i)
      if (!std::isfinite(X[j * ld + i]))
        throw Error(ErrorCode::NonFinite, "predictor column " + std::to_string(j) +
                                              " has a non-finite value at row " + std::to_string(i) +
                                              " (0-based in this chunk): remove or impute it first");
}

void check_lambda_response(const double* y, std::size_t rows, Family family) {
  const auto values = [](std::size_t k) { return std::to_string(k) + " value" + (k == 1 ? "" : "s"); };
  const BadRows nonfinite = find_bad_rows(rows, [&](std::size_t i) { return !std::isfinite(y[i]); });
  if (nonfinite.count)
    throw IndexedError(ErrorCode::NonFinite,
                       "y has " + std::to_string(nonfinite.count) + " non-finite value" +
                           (nonfinite.count == 1 ? "" : "s") + " (NaN or Inf) at rows " +
                           format_indices(nonfinite.first, nonfinite.count) +
                           " (0-based in this chunk): remove or impute them first",
                       nonfinite.count, nonfinite.first);
  if (family != Family::BoxCox) return;
  const BadRows low = find_bad_rows(rows, [&](std::size_t i) { return !(y[i] > 0.0); });
  if (low.count)
    throw IndexedError(ErrorCode::Domain,
                       "Box-Cox needs y > 0; " + values(low.count) + " <= 0 at rows " +
                           format_indices(low.first, low.count) +
                           " (0-based in this chunk): use Yeo-Johnson or a shift that makes every value > 0",
                       low.count, low.first);
}

void check_chunk(const double* y, const double* X, std::size_t rows, std::size_t ld, std::size_t p,
                 const double* w, const Family* lambda_family) {
  require(y != nullptr, "y is NULL");
  require(p == 0 || X != nullptr, "the predictor matrix is NULL");
  require(p == 0 || ld >= rows, "the leading dimension of X (" + std::to_string(ld) +
                                    ") is smaller than the rows (" + std::to_string(rows) + ")");
  check_weights(w, rows);
  if (lambda_family) check_lambda_response(y, rows, *lambda_family);
  if (p) check_predictors(X, rows, ld, p);
}

void stack_r(Eigen::MatrixXd& r, Eigen::MatrixXd& work, Eigen::Index rows) {
  const Eigen::Index c = r.cols();
  work.topRows(c) = r;
  auto used = work.topRows(c + rows);
  const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(used);
  r = used.topRows(c).triangularView<Eigen::Upper>();
}

Eigen::MatrixXd merge_r(const Eigen::MatrixXd& a, const Eigen::MatrixXd& b) {
  const Eigen::Index c = a.cols();
  Eigen::MatrixXd work(2 * c, c);
  work.bottomRows(c) = b;
  Eigen::MatrixXd r = a;
  stack_r(r, work, c);
  return r;
}

}  // namespace summary_detail
}  // namespace powerback
