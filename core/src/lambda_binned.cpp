// The binned fast path of the lambda profile (see BinnedProfile in lambda.hpp): per-bin power
// sums built once, then each lambda costs O(bins * terms) (times the design's columns in the
// response case) however many observations there are.
#include <algorithm>
#include <cmath>
#include <limits>

#include "lambda_internal.hpp"

namespace powerback {
namespace detail {
namespace {

// delta^m / m! for m = 1..8 into out; the powers by squaring and doubling (dependency depth 3
// instead of a chain of 7 products), written out so that they stay in registers.
inline void column_terms(double d, const double* inv_fact, double* out) {
  const double d2 = d * d, d3 = d * d2, d4 = d2 * d2;
  out[0] = d * inv_fact[0];
  out[1] = d2 * inv_fact[1];
  out[2] = d3 * inv_fact[2];
  out[3] = d4 * inv_fact[3];
  out[4] = (d * d4) * inv_fact[4];
  out[5] = (d2 * d4) * inv_fact[5];
  out[6] = (d3 * d4) * inv_fact[6];
  out[7] = (d4 * d4) * inv_fact[7];
}

template <int K>
struct InverseFactorials {
  double v[K];
  InverseFactorials() {
    double f = 1.0;
    for (int m = 1; m <= K; ++m) {
      f *= m;
      v[m - 1] = 1.0 / f;
    }
  }
};

}  // namespace

BinnedProfile::BinnedProfile(const Eigen::ArrayXd& t, const Eigen::Array<bool, Eigen::Dynamic, 1>& second,
                             bool has_second, double k_valid, std::size_t columns,
                             const Eigen::ArrayXd* weights, const Eigen::ArrayXd* root_weights)
    : k_valid_(k_valid), t_(t), second_of_(second), has_second_(has_second),
      root_w_(root_weights), columns_(columns) {
  const Eigen::Index n = t.size();
  constexpr int K = kTerms;
  h_ = 1.0 / (16.0 * k_valid);  // |k delta| <= k_valid * h / 2 = 1/32
  inv_h_ = 16.0 * k_valid;
  double hi[2] = {-std::numeric_limits<double>::infinity(), -std::numeric_limits<double>::infinity()};
  lo_[0] = lo_[1] = std::numeric_limits<double>::infinity();
  for (Eigen::Index i = 0; i < n; ++i) {
    const int g = (has_second && second(i)) ? 1 : 0;
    lo_[g] = std::min(lo_[g], t(i));
    hi[g] = std::max(hi[g], t(i));
  }
  for (int g = 0; g < 2; ++g)
    if (hi[g] >= lo_[g]) {
      const double span = std::floor((hi[g] - lo_[g]) / h_) + 1.0;
      if (!(span < static_cast<double>(n) + 1.0)) return;  // more bins than values: never useful
      nb_[g] = static_cast<std::size_t>(span);
    }
  bins_ = nb_[0] + nb_[1];
  // Each lambda then costs about bins * (K + columns * kColumnTerms) against n transformed
  // values and their projection when evaluated directly.
  const double per_bin = static_cast<double>(K) + static_cast<double>(columns) * kColumnTerms;
  if (static_cast<double>(bins_) * per_bin > static_cast<double>(n)) return;
  useful_ = true;

  centre_.resize(bins_);
  sign_.resize(bins_);
  second_.resize(bins_);
  count_.assign(bins_, 0.0);
  s1_.assign(bins_ * K, 0.0);
  s2_.assign(bins_ * K, 0.0);
  for (int g = 0; g < 2; ++g)
    for (std::size_t j = 0; j < nb_[g]; ++j) {
      const std::size_t b = (g ? nb_[0] : 0) + j;
      centre_[b] = lo_[g] + (static_cast<double>(j) + 0.5) * h_;
      sign_[b] = g ? -1.0 : 1.0;
      second_[b] = static_cast<unsigned char>(g);
    }
  static_assert(K % 2 == 0, "the power sums are added two at a time");
  for (Eigen::Index i = 0; i < n; ++i) {
    const std::size_t b = bin_of(i);
    const double wi = weights ? (*weights)(i) : 1.0;
    count_[b] += wi;
    const double d = t(i) - centre_[b], d2 = d * d;
    // (delta^(m), delta^(m+1)) pairs, each the previous times delta^2, added as packets.
    Eigen::Array2d pair(wi * d, wi * d2);
    const Eigen::Array2d step = Eigen::Array2d::Constant(d2);
    double* row = &s1_[b * K];
    for (int m = 0; m < K; m += 2) {
      Eigen::Map<Eigen::Array2d>(row + m) += pair;
      pair *= step;
    }
  }
  static const InverseFactorials<K> inv_fact;
  double two = 2.0;
  for (int m = 1; m <= K; ++m) {
    two *= 2.0;
    const double c2 = m >= 2 ? (two / 2.0 - 2.0) * inv_fact.v[m - 1] : 0.0;  // (2^m - 2) / m!
    for (std::size_t b = 0; b < bins_; ++b) {
      const double p = s1_[b * K + m - 1];
      s1_[b * K + m - 1] = p * inv_fact.v[m - 1];
      s2_[b * K + m - 1] = p * c2;
    }
  }
  a_.resize(bins_);
  b_.resize(bins_);
  e1_.resize(bins_);
  if (columns_ > 0) xm_.assign(bins_ * columns_ * kColumnSlot, 0.0);
}

std::size_t BinnedProfile::bin_of(Eigen::Index i) const {
  const int g = (has_second_ && second_of_(i)) ? 1 : 0;
  const std::size_t j = std::min(nb_[g] - 1, static_cast<std::size_t>((t_(i) - lo_[g]) * inv_h_));
  return (g ? nb_[0] : 0) + j;
}

void BinnedProfile::add_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
  if (!useful_ || columns_ == 0) return;
  add_predictor_rows(r0, block.rightCols(static_cast<Eigen::Index>(columns_ - 1)));
}

void BinnedProfile::add_predictor_rows(std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
  if (!useful_ || columns_ == 0) return;
  const auto column = [&](std::size_t c) { return &block.coeffRef(0, static_cast<Eigen::Index>(c)); };
  constexpr int K = kColumnTerms;
  static_assert(K == 8, "column_terms writes 8 terms");
  static const InverseFactorials<K> inv_fact;
  const Eigen::Index nr = block.rows();
  if (nr == 0) return;
  // The block's rows ordered by bin (a stable counting sort: within a bin, in row order), each
  // with (1, delta^m / m! for m = 1..K, 0) stored in that order. Then per bin and column (the
  // intercept's sums are count and s1) the bin's sums stay in registers while its rows are
  // added: the same additions in the same order as row by row, without a scattered
  // read-modify-write of a bin's sums for every row and column.
  constexpr int S = kColumnSlot;
  using Slot = Eigen::Array<double, S, 1>;
  // Work space shared by every profile on this thread: many responses fed block by block then
  // keep one copy in cache rather than one each.
  thread_local std::vector<std::size_t> bin, start, next, order;
  thread_local std::vector<double> pw;
  const std::size_t rows = static_cast<std::size_t>(nr);
  bin.resize(rows);
  pw.resize(rows * S);
  start.assign(bins_ + 1, 0);
  for (std::size_t r = 0; r < rows; ++r) {
    const std::size_t b = bin_of(static_cast<Eigen::Index>(r0 + r));
    bin[r] = b;
    ++start[b + 1];
  }
  for (std::size_t b = 0; b < bins_; ++b) start[b + 1] += start[b];
  next.assign(start.begin(), start.end() - 1);
  const std::size_t P = columns_ - 1;
  order.resize(rows);
  for (std::size_t r = 0; r < rows; ++r) {
    const std::size_t b = bin[r], k = next[b]++;
    order[k] = r;
    const Eigen::Index i = static_cast<Eigen::Index>(r0 + r);
    double* w = &pw[k * S];
    w[0] = 1.0;
    column_terms(t_(i) - centre_[b], inv_fact.v, w + 1);
    for (int m = K + 1; m < S; ++m) w[m] = 0.0;
    if (root_w_) {  // the block is scaled by sqrt(w) already: one more factor makes it w
      const double rw = (*root_w_)(i);
      for (int m = 0; m <= K; ++m) w[m] *= rw;
    }
  }
  const std::size_t stride = columns_ * S;
  const double* const tw = pw.data();
  const std::size_t* const ord = order.data();
  for (std::size_t b = 0; b < bins_; ++b) {
    const std::size_t k0 = start[b], k1 = start[b + 1];
    if (k0 == k1) continue;
    double* const rec = &xm_[b * stride];
    std::size_t j = 0;
    for (; j + 1 < P; j += 2) {  // two columns at a time: each row's terms loaded once
      Eigen::Map<Slot> sums(rec + (j + 1) * S);
      Eigen::Map<Slot> sums2(rec + (j + 2) * S);
      const double* x = column(j);
      const double* x2 = column(j + 1);
      Slot a = sums, a2 = sums2;
      for (std::size_t k = k0; k < k1; ++k) {
        const Eigen::Map<const Slot> terms(tw + k * S);
        a += x[ord[k]] * terms;
        a2 += x2[ord[k]] * terms;
      }
      sums = a;
      sums2 = a2;
    }
    for (; j < P; ++j) {
      Eigen::Map<Slot> sums(rec + (j + 1) * S);
      const double* x = column(j);
      Slot a = sums;
      for (std::size_t k = k0; k < k1; ++k) a += x[ord[k]] * Eigen::Map<const Slot>(tw + k * S);
      sums = a;
    }
  }
}

void BinnedProfile::set_design(const std::vector<std::size_t>& kept, const Eigen::MatrixXd& r) {
  // The reduction in log_rss needs the intercept as the first kept column.
  if (kept.empty() || kept[0] != 0 || columns_ == 0) {
    useful_ = false;
    return;
  }
  kept_ = kept;
  r_ = r;
  v_.resize(static_cast<Eigen::Index>(kept.size()));
}

bool BinnedProfile::log_rss(double lambda, double* out) const {
  constexpr int K = kTerms;
  const double k2 = 2.0 - lambda;
  if ((nb_[0] > 0 && std::fabs(lambda) > k_valid_) || (nb_[1] > 0 && std::fabs(k2) > k_valid_)) return false;
  double m = -std::numeric_limits<double>::infinity();
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double k = second_[b] ? k2 : lambda;
    m = std::max(m, k * centre_[b]);
  }
  m += 1.0 / 32.0;  // the largest k delta within a bin
  const bool scaled = m > kDirectLimit;
  const double em = scaled ? std::exp(-m) : 1.0;
  double sum = 0.0, n = 0.0;
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double k = second_[b] ? k2 : lambda;
    const BinTerms ab = bin_terms(k, centre_[b], scaled, m, em);
    const double e1 = power_sum(&s1_[b * K], 0, K - 1, k);
    a_[b] = sign_[b] * ab.a;
    b_[b] = sign_[b] * ab.b;
    e1_[b] = e1;
    sum += count_[b] * a_[b] + b_[b] * e1;
    n += count_[b];
  }
  const double wbar = sum / n;
  double tss = 0.0;
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double k = second_[b] ? k2 : lambda;
    const double e2 = power_sum(&s2_[b * K], 1, K - 1, k);
    const double da = a_[b] - wbar;
    tss += count_[b] * da * da + 2.0 * da * b_[b] * e1_[b] + b_[b] * b_[b] * e2;
  }
  double rss = tss;
  if (!kept_.empty()) {
    // X_k' z, then Q1' z = R^-T X_k' z; its first coordinate is the mean's (intercept first),
    // the others carry the explained part of the centred sum of squares.
    constexpr int KC = kColumnTerms;
    v_.setZero();
    v_(0) = sum;
    const Eigen::Index kk = v_.size();
    for (std::size_t b = 0; b < bins_; ++b) {
      if (count_[b] == 0.0) continue;
      const double k = second_[b] ? k2 : lambda, ab = a_[b], bb = b_[b];
      const double* xm = &xm_[b * columns_ * kColumnSlot];
      for (Eigen::Index c = 1; c < kk; ++c) {
        const double* s = xm + kept_[static_cast<std::size_t>(c)] * kColumnSlot;  // sum x, then the terms
        v_(c) += ab * s[0] + bb * power_sum(s, 1, KC, k);
      }
    }
    const Eigen::VectorXd u = r_.transpose().triangularView<Eigen::Lower>().solve(v_);
    const double explained = u.tail(u.size() - 1).squaredNorm();
    rss = tss - explained;
    // Too much of the sum of squares explained to subtract safely: evaluate directly instead.
    if (!(rss > kBinnedFitGuard * tss)) return false;
  }
  if (!(rss > 0.0) || !std::isfinite(rss)) return false;
  *out = std::log(rss) + (scaled ? 2.0 * m : 0.0);
  return true;
}

}  // namespace detail
}  // namespace powerback
