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

// delta, delta^2, ..., delta^K into out, by squaring and doubling (dependency depth log2 K
// instead of a chain of K - 1 products).
template <int K>
inline void powers(double d, double* out) {
  out[0] = d;
  for (int have = 1; have < K; have *= 2) {
    const double top = out[have - 1];
    for (int m = 0; m < have && have + m < K; ++m) out[have + m] = out[m] * top;
  }
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
  constexpr int K = kColumnTerms;
  static const InverseFactorials<K> inv_fact;
  const Eigen::Index nr = block.rows(), cols = static_cast<Eigen::Index>(columns_);
  // Per row: its bin and (1, delta^m / m! for m = 1..K, 0), then per column (the intercept's
  // sums are count and s1): x times that slot into the row's bin, as packets.
  constexpr int S = kColumnSlot;
  std::vector<std::size_t>& bin = row_bin_;
  std::vector<double>& pw = row_pw_;
  bin.resize(static_cast<std::size_t>(nr));
  pw.resize(static_cast<std::size_t>(nr) * S);
  for (Eigen::Index r = 0; r < nr; ++r) {
    const Eigen::Index i = static_cast<Eigen::Index>(r0) + r;
    const std::size_t b = bin_of(i);
    bin[static_cast<std::size_t>(r)] = b;
    double* w = &pw[static_cast<std::size_t>(r) * S];
    w[0] = 1.0;
    powers<K>(t_(i) - centre_[b], w + 1);
    for (int m = 0; m < K; ++m) w[m + 1] *= inv_fact.v[m];
    for (int m = K + 1; m < S; ++m) w[m] = 0.0;
    if (root_w_) {  // the block is scaled by sqrt(w) already: one more factor makes it w
      const double rw = (*root_w_)(i);
      for (int m = 0; m <= K; ++m) w[m] *= rw;
    }
  }
  double* const acc = xm_.data();
  const std::size_t* const rb = bin.data();
  const double* const rw = pw.data();
  const std::size_t stride = columns_ * S;
  for (Eigen::Index j = 1; j < cols; ++j) {
    const double* x = &block.coeffRef(0, j);
    double* const acc_j = acc + static_cast<std::size_t>(j) * S;
    for (Eigen::Index r = 0; r < nr; ++r)
      Eigen::Map<Eigen::Array<double, S, 1>>(acc_j + rb[r] * stride) +=
          x[r] * Eigen::Map<const Eigen::Array<double, S, 1>>(rw + static_cast<std::size_t>(r) * S);
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
