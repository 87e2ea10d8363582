// LambdaSummary: rows in, merges, bytes out and in (the evaluation is in accumulate_lambda_finish.cpp).
#include <algorithm>
#include <cmath>
#include <limits>

#include "powerback/accumulate_detail.hpp"
#include "powerback/cancel.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

using summary_detail::ByteReader;
using summary_detail::ByteWriter;
using summary_detail::Kind;

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr std::size_t kBlockRows = 4096;
// A bin index fits an int32 for every finite t: |log| of a double is below 745.
constexpr std::int64_t kMaxBinIndex = 80 * 800;

inline void add_compensated(double& s, double& c, double x) {
  const double t = s + x;
  if (std::fabs(s) >= std::fabs(x)) c += (s - t) + x;
  else c += (x - t) + s;
  s = t;
}

}  // namespace

LambdaSummary::State::State(Family f, std::size_t predictors) : family(f), p(predictors) {
  require(f == Family::BoxCox || f == Family::YeoJohnson,
          std::string("a lambda summary is for box-cox and yeo-johnson only, not ") + family_name(f));
  require(p < 100000, "a lambda summary takes fewer than 100000 predictors");
  L = 1 + K + p * S;
  t_min[0] = t_min[1] = y_min = kInf;
  t_max[0] = t_max[1] = y_max = -kInf;
  r = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(p + 1), static_cast<Eigen::Index>(p + 1));
}

std::size_t LambdaSummary::State::bin(int g, std::int64_t j) {
  std::vector<std::int32_t>& idx = index[g];
  if (idx.empty()) {
    jlo[g] = j;
    idx.assign(1, -1);
  } else if (j < jlo[g]) {
    // Grow with room to spare, so that a range growing row by row costs little.
    const std::int64_t grow = std::max<std::int64_t>(jlo[g] - j, static_cast<std::int64_t>(idx.size()));
    idx.insert(idx.begin(), static_cast<std::size_t>(grow), -1);
    jlo[g] -= grow;
  } else if (j - jlo[g] >= static_cast<std::int64_t>(idx.size())) {
    const std::size_t need = static_cast<std::size_t>(j - jlo[g]) + 1;
    idx.resize(std::max(need, 2 * idx.size()), -1);
  }
  std::int32_t& slot = idx[static_cast<std::size_t>(j - jlo[g])];
  if (slot < 0) {
    slot = static_cast<std::int32_t>(key.size());
    key.push_back(static_cast<std::int32_t>(j));
    group.push_back(static_cast<std::uint8_t>(g));
    rec.resize(rec.size() + L, 0.0);
    comp.resize(comp.size() + L, 0.0);
  }
  return static_cast<std::size_t>(slot);
}

void LambdaSummary::State::rebuild_index() {
  index[0].clear();
  index[1].clear();
  std::vector<std::int32_t> keys;
  keys.swap(key);
  std::vector<std::uint8_t> groups;
  groups.swap(group);
  std::vector<double> r0, c0;
  r0.swap(rec);
  c0.swap(comp);
  for (std::size_t b = 0; b < keys.size(); ++b) {
    const std::size_t nb = bin(groups[b], keys[b]);
    if (nb != b) throw Error(ErrorCode::Parse, "cannot read a lambda summary: a bin appears twice");
  }
  rec.swap(r0);
  comp.swap(c0);
}

LambdaSummary::LambdaSummary(Family family, std::size_t p) : s_(new State(family, p)) {}
LambdaSummary::~LambdaSummary() = default;
LambdaSummary::LambdaSummary(const LambdaSummary& o) : s_(new State(*o.s_)) {}
LambdaSummary& LambdaSummary::operator=(const LambdaSummary& o) {
  if (this != &o) s_.reset(new State(*o.s_));
  return *this;
}
LambdaSummary::LambdaSummary(LambdaSummary&&) noexcept = default;
LambdaSummary& LambdaSummary::operator=(LambdaSummary&&) noexcept = default;

Family LambdaSummary::family() const { return s_->family; }
std::size_t LambdaSummary::predictors() const { return s_->p; }
std::size_t LambdaSummary::n() const { return static_cast<std::size_t>(s_->n); }
std::size_t LambdaSummary::bins() const { return s_->bins(); }

void LambdaSummary::add(const double* y, const double* X, std::size_t rows, std::size_t ld,
                        const double* w) {
  State& s = *s_;
  if (rows == 0) return;
  summary_detail::check_chunk(y, X, rows, ld, s.p, w, &s.family);

  constexpr int K = State::K, KC = State::KC, S = State::S;
  const std::size_t L = s.L, p = s.p;
  const Eigen::Index c = static_cast<Eigen::Index>(p + 1);
  const bool yj = s.family == Family::YeoJohnson;
  // Sums of one block of kSummaryFlushRows rows, then added to the stored ones with compensation.
  std::vector<double> part(s.rec.size(), 0.0);
  std::vector<std::size_t> touched;
  std::vector<std::uint8_t> is_touched(s.bins(), 0);
  const auto flush = [&] {
    for (std::size_t b : touched) {
      double* pr = &part[b * L];
      double* sr = &s.rec[b * L];
      double* sc = &s.comp[b * L];
      for (std::size_t l = 0; l < L; ++l) {
        add_compensated(sr[l], sc[l], pr[l]);
        pr[l] = 0.0;
      }
      is_touched[b] = 0;
    }
    touched.clear();
  };
  Eigen::MatrixXd work(c + static_cast<Eigen::Index>(kBlockRows), c);
  double pw[K + 1];
  std::size_t since_flush = 0;
  for (std::size_t r0 = 0; r0 < rows; r0 += kBlockRows) {
    poll_cancel();
    const std::size_t r1 = std::min(rows, r0 + kBlockRows);
    Eigen::Index nr = 0;
    for (std::size_t i = r0; i < r1; ++i) {
      const double wi = w ? w[i] : 1.0;
      if (wi == 0.0) continue;
      const double v = y[i];
      s.y_min = std::min(s.y_min, v);
      s.y_max = std::max(s.y_max, v);
      const int g = (yj && v < 0.0) ? 1 : 0;
      const double t = yj ? std::log1p(std::fabs(v)) : std::log(v);
      ++s.n;
      ++s.count[g];
      s.t_sum[g].add(t);
      if (w) s.log_w.add(std::log(wi));
      s.t_min[g] = std::min(s.t_min[g], t);
      s.t_max[g] = std::max(s.t_max[g], t);
      const std::int64_t j = std::max(-kMaxBinIndex, std::min(kMaxBinIndex,
                                      static_cast<std::int64_t>(std::floor(t / kSummaryBinWidth))));
      const std::size_t b = s.bin(g, j);
      if (b >= is_touched.size()) {
        is_touched.resize(b + 1, 0);
        part.resize((b + 1) * L, 0.0);
      }
      if (!is_touched[b]) {
        is_touched[b] = 1;
        touched.push_back(b);
      }
      const double d = t - (static_cast<double>(j) + 0.5) * kSummaryBinWidth;
      pw[0] = 1.0;
      for (int m = 1; m <= K; ++m) pw[m] = pw[m - 1] * d;
      double* rb = &part[b * L];
      rb[0] += wi;
      for (int m = 1; m <= K; ++m) rb[m] += wi * pw[m];
      const double sw = std::sqrt(wi);
      work(c + nr, 0) = sw;
      for (std::size_t col = 0; col < p; ++col) {
        const double x = X[col * ld + i];
        const double xw = wi * x;
        double* rc = rb + 1 + K + col * S;
        for (int m = 0; m <= KC; ++m) rc[m] += xw * pw[m];
        work(c + nr, static_cast<Eigen::Index>(col) + 1) = sw * x;
      }
      ++nr;
    }
    if (nr > 0) summary_detail::stack_r(s.r, work, nr);
    since_flush += r1 - r0;
    if (since_flush >= kSummaryFlushRows) {
      flush();
      since_flush = 0;
    }
  }
  flush();
}

void LambdaSummary::merge(const LambdaSummary& other) {
  State& s = *s_;
  const State& o = *other.s_;
  require(s.family == o.family && s.p == o.p,
          std::string("summaries merge only with the same family and predictors; got ") +
              family_name(s.family) + " with " + std::to_string(s.p) + " predictors and " +
              family_name(o.family) + " with " + std::to_string(o.p));
  if (summary_detail::merged_self(*this, other)) return;
  for (std::size_t b = 0; b < o.bins(); ++b) {
    const std::size_t nb = s.bin(o.group[b], o.key[b]);
    for (std::size_t l = 0; l < s.L; ++l) {
      add_compensated(s.rec[nb * s.L + l], s.comp[nb * s.L + l], o.rec[b * s.L + l]);
      add_compensated(s.rec[nb * s.L + l], s.comp[nb * s.L + l], o.comp[b * s.L + l]);
    }
  }
  s.n += o.n;
  for (int g = 0; g < 2; ++g) {
    s.count[g] += o.count[g];
    s.t_sum[g].add(o.t_sum[g]);
    s.t_min[g] = std::min(s.t_min[g], o.t_min[g]);
    s.t_max[g] = std::max(s.t_max[g], o.t_max[g]);
  }
  s.log_w.add(o.log_w);
  s.y_min = std::min(s.y_min, o.y_min);
  s.y_max = std::max(s.y_max, o.y_max);
  s.r = summary_detail::merge_r(s.r, o.r);
}

std::vector<unsigned char> LambdaSummary::serialize() const {
  const State& s = *s_;
  ByteWriter out(Kind::Lambda);
  out.u32(static_cast<std::uint32_t>(s.family));
  out.u64(s.p);
  out.u64(s.n);
  for (int g = 0; g < 2; ++g) {
    out.u64(s.count[g]);
    out.sum(s.t_sum[g]);
    out.f64(s.t_min[g]);
    out.f64(s.t_max[g]);
  }
  out.sum(s.log_w);
  out.f64(s.y_min);
  out.f64(s.y_max);
  out.matrix(s.r);
  out.u64(s.bins());
  for (std::size_t b = 0; b < s.bins(); ++b) {
    out.u32(static_cast<std::uint32_t>(s.key[b]));
    out.u8(s.group[b]);
  }
  out.f64s(s.rec.data(), s.rec.size());
  out.f64s(s.comp.data(), s.comp.size());
  return out.finish();
}

LambdaSummary LambdaSummary::deserialize(const unsigned char* bytes, std::size_t len) {
  ByteReader in(bytes, len, Kind::Lambda, "a lambda summary");
  const std::uint32_t fam = in.u32("the family");
  if (fam != static_cast<std::uint32_t>(Family::BoxCox) && fam != static_cast<std::uint32_t>(Family::YeoJohnson))
    in.fail("the family code " + std::to_string(fam) + " is not box-cox or yeo-johnson");
  const std::size_t p = in.count("the number of predictors", 99999);
  // R alone needs (p + 1)^2 doubles: a larger p than the bytes can hold is corruption.
  if ((p + 1) * (p + 1) > in.remaining() / 8) in.fail("the number of predictors does not fit the buffer");
  LambdaSummary out(static_cast<Family>(fam), p);
  State& s = *out.s_;
  s.n = in.u64("the row count");
  std::uint64_t total = 0;
  for (int g = 0; g < 2; ++g) {
    s.count[g] = in.u64("a group count");
    total += s.count[g];
    s.t_sum[g] = in.sum("a sum of logs");
    s.t_min[g] = in.f64("a minimum");
    s.t_max[g] = in.f64("a maximum");
    const bool empty = s.count[g] == 0;
    if (empty ? !(s.t_min[g] == kInf && s.t_max[g] == -kInf)
              : !(std::isfinite(s.t_min[g]) && std::isfinite(s.t_max[g]) && s.t_min[g] <= s.t_max[g]))
      in.fail("a group's range does not match its count");
  }
  if (total != s.n) in.fail("the group counts do not add up to the row count");
  if (s.family == Family::BoxCox && s.count[1] != 0) in.fail("a box-cox summary with negative values");
  s.log_w = in.sum("the sum of log weights");
  s.y_min = in.f64("the smallest response");
  s.y_max = in.f64("the largest response");
  if (s.n > 0 && !(std::isfinite(s.y_min) && std::isfinite(s.y_max) && s.y_min <= s.y_max))
    in.fail("the response range is not finite");
  s.r = in.matrix(p + 1, p + 1, "the R factor");
  if (!s.r.isUpperTriangular(0.0)) in.fail("the R factor is not upper triangular");
  const std::size_t bins = in.count("the number of bins", in.remaining() / 5);
  if (bins > 0 && s.L * 2 > in.remaining() / 8 / bins) in.fail("the bins do not fit the buffer");
  std::vector<std::int32_t> keys(bins);
  std::vector<std::uint8_t> groups(bins);
  for (std::size_t b = 0; b < bins; ++b) {
    keys[b] = static_cast<std::int32_t>(in.u32("a bin index"));
    groups[b] = in.u8("a bin group");
    if (groups[b] > 1 || keys[b] < -kMaxBinIndex || keys[b] > kMaxBinIndex) in.fail("a bin label is out of range");
    if (groups[b] == 1 && s.family == Family::BoxCox) in.fail("a box-cox summary with a negative bin");
  }
  s.key = keys;
  s.group = groups;
  s.rec.resize(bins * s.L);
  s.comp.resize(bins * s.L);
  for (double& v : s.rec) v = in.finite("a bin sum");
  for (double& v : s.comp) v = in.finite("a bin compensation");
  in.done();
  s.rebuild_index();
  return out;
}

}  // namespace powerback
