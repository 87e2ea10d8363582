// The binned fast path of the lambda profile (see BinnedProfile in lambda.hpp): per-bin power
// sums built once, then each lambda costs O(bins * terms) (times the design's columns in the
// response case) however many observations there are.
#include <algorithm>
#include <cmath>
#include <limits>

#include "powerback/lambda.hpp"

namespace powerback {
namespace detail {

BinnedProfile::BinnedProfile(const Eigen::ArrayXd& t, const Eigen::Array<bool, Eigen::Dynamic, 1>& second,
                             bool has_second, const LeastSquares* X, double k_valid)
    : k_valid_(k_valid), design_(X) {
  const Eigen::Index n = t.size();
  constexpr int K = kTerms;
  const double h = 0.25 / k_valid;  // |k delta| <= k_valid * h / 2 <= 1/8
  double lo[2] = {std::numeric_limits<double>::infinity(), std::numeric_limits<double>::infinity()};
  double hi[2] = {-lo[0], -lo[0]};
  for (Eigen::Index i = 0; i < n; ++i) {
    const int g = (has_second && second(i)) ? 1 : 0;
    lo[g] = std::min(lo[g], t(i));
    hi[g] = std::max(hi[g], t(i));
  }
  std::size_t nb[2] = {0, 0};
  for (int g = 0; g < 2; ++g)
    if (hi[g] >= lo[g]) nb[g] = static_cast<std::size_t>(std::floor((hi[g] - lo[g]) / h)) + 1;
  bins_ = nb[0] + nb[1];
  if (X) {
    // The reduction below needs the intercept as the first kept column.
    if (!X->has_intercept() || X->kept().empty() || X->kept()[0] != 0) return;
    cols_ = X->rank();
  }
  const double per_bin = static_cast<double>(K) * static_cast<double>(cols_ + 2);
  if (static_cast<double>(bins_) * per_bin * 4.0 > static_cast<double>(n)) return;
  useful_ = true;

  centre_.resize(bins_);
  sign_.resize(bins_);
  second_.resize(bins_);
  count_.assign(bins_, 0.0);
  s1_.assign(bins_ * K, 0.0);
  s2_.assign(bins_ * K, 0.0);
  for (int g = 0; g < 2; ++g)
    for (std::size_t j = 0; j < nb[g]; ++j) {
      const std::size_t b = (g ? nb[0] : 0) + j;
      centre_[b] = lo[g] + (static_cast<double>(j) + 0.5) * h;
      sign_[b] = g ? -1.0 : 1.0;
      second_[b] = static_cast<unsigned char>(g);
    }
  std::vector<std::size_t> bin_of(static_cast<std::size_t>(n));
  for (Eigen::Index i = 0; i < n; ++i) {
    const int g = (has_second && second(i)) ? 1 : 0;
    const std::size_t j = std::min(nb[g] - 1, static_cast<std::size_t>((t(i) - lo[g]) / h));
    const std::size_t b = (g ? nb[0] : 0) + j;
    bin_of[static_cast<std::size_t>(i)] = b;
    count_[b] += 1.0;
    const double d = t(i) - centre_[b];
    double p = d;
    double* row = &s1_[b * K];
    for (int m = 0; m < K; ++m) {
      row[m] += p;
      p *= d;
    }
  }
  double fact = 1.0, two = 2.0;
  std::vector<double> inv_fact(K), s2_coef(K);
  for (int m = 1; m <= K; ++m) {
    fact *= m;
    two *= 2.0;
    inv_fact[m - 1] = 1.0 / fact;
    s2_coef[m - 1] = m >= 2 ? (two / 2.0 - 2.0) / fact : 0.0;  // (2^m - 2) / m!
  }
  for (std::size_t b = 0; b < bins_; ++b)
    for (int m = 0; m < K; ++m) {
      const double p = s1_[b * K + m];
      s1_[b * K + m] = p * inv_fact[m];
      s2_[b * K + m] = p * s2_coef[m];
    }
  a_.resize(bins_);
  b_.resize(bins_);
  e1_.resize(bins_);
  e2_.resize(bins_);
  if (!X) return;

  // Response: per bin, the kept columns' sums and their sums weighted by delta^m / m!, as one
  // matrix product per bin over the rows sorted by bin.
  std::vector<std::size_t> start(bins_ + 1, 0);
  for (std::size_t i = 0; i < bin_of.size(); ++i) ++start[bin_of[i] + 1];
  for (std::size_t b = 0; b < bins_; ++b) start[b + 1] += start[b];
  std::vector<std::size_t> order(bin_of.size()), fill(start.begin(), start.end() - 1);
  for (std::size_t i = 0; i < bin_of.size(); ++i) order[fill[bin_of[i]]++] = i;
  const Eigen::MatrixXd& D = X->design();
  Eigen::MatrixXd xs(n, static_cast<Eigen::Index>(cols_));
  for (std::size_t c = 0; c < cols_; ++c) {
    const Eigen::Index src = static_cast<Eigen::Index>(X->kept()[c]);
    for (Eigen::Index r = 0; r < n; ++r)
      xs(r, static_cast<Eigen::Index>(c)) = D(static_cast<Eigen::Index>(order[static_cast<std::size_t>(r)]), src);
  }
  xsum_.assign(bins_ * cols_, 0.0);
  xm_.assign(bins_ * K * cols_, 0.0);
  for (std::size_t b = 0; b < bins_; ++b) {
    const Eigen::Index r0 = static_cast<Eigen::Index>(start[b]);
    const Eigen::Index nr = static_cast<Eigen::Index>(start[b + 1] - start[b]);
    if (nr == 0) continue;
    Eigen::MatrixXd pw(nr, K);
    for (Eigen::Index r = 0; r < nr; ++r) {
      const double d = t(static_cast<Eigen::Index>(order[static_cast<std::size_t>(r0 + r)])) - centre_[b];
      double p = d;
      for (int m = 0; m < K; ++m) {
        pw(r, m) = p * inv_fact[m];
        p *= d;
      }
    }
    const auto rows = xs.middleRows(r0, nr);
    Eigen::Map<Eigen::MatrixXd>(&xm_[b * K * cols_], static_cast<Eigen::Index>(cols_), K).noalias() =
        rows.transpose() * pw;
    Eigen::Map<Eigen::VectorXd>(&xsum_[b * cols_], static_cast<Eigen::Index>(cols_)).noalias() =
        rows.transpose() * Eigen::VectorXd::Ones(nr);
  }
}

bool BinnedProfile::log_rss(double lambda, double* out) const {
  constexpr int K = kTerms;
  const double k2 = 2.0 - lambda;
  bool have[2] = {false, false};
  for (std::size_t b = 0; b < bins_; ++b) have[second_[b]] = true;
  if ((have[0] && std::fabs(lambda) > k_valid_) || (have[1] && std::fabs(k2) > k_valid_)) return false;
  double m = -std::numeric_limits<double>::infinity();
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double k = second_[b] ? k2 : lambda;
    m = std::max(m, k * centre_[b]);
  }
  m += 0.125;  // the largest k delta within a bin
  const bool scaled = m > kDirectLimit;
  const double em = scaled ? std::exp(-m) : 1.0;
  double sum = 0.0, n = 0.0;
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double k = second_[b] ? k2 : lambda, c = centre_[b], kc = k * c;
    double A, B;
    if (!scaled) {
      A = k == 0.0 ? c : std::expm1(kc) / k;
      B = std::exp(kc);
    } else {
      B = std::exp(kc - m);
      A = k == 0.0 ? c * em : (B - em) / k;
    }
    const double* r1 = &s1_[b * K];
    const double* r2 = &s2_[b * K];
    double e1 = r1[K - 1], e2 = r2[K - 1];
    for (int j = K - 2; j >= 0; --j) e1 = e1 * k + r1[j];
    for (int j = K - 2; j >= 1; --j) e2 = e2 * k + r2[j];
    a_[b] = sign_[b] * A;
    b_[b] = sign_[b] * B;
    e1_[b] = e1;
    e2_[b] = e2;
    sum += count_[b] * a_[b] + b_[b] * e1;
    n += count_[b];
  }
  const double wbar = sum / n;
  double tss = 0.0;
  for (std::size_t b = 0; b < bins_; ++b) {
    if (count_[b] == 0.0) continue;
    const double da = a_[b] - wbar;
    tss += count_[b] * da * da + 2.0 * da * b_[b] * e1_[b] + b_[b] * b_[b] * e2_[b];
  }
  double rss = tss;
  if (design_) {
    // X_k' z, then Q1' z = R^-T X_k' z; its first coordinate is the mean's (intercept first),
    // the others carry the explained part of the centred sum of squares.
    Eigen::VectorXd v = Eigen::VectorXd::Zero(static_cast<Eigen::Index>(cols_));
    Eigen::VectorXd acc(static_cast<Eigen::Index>(cols_));
    for (std::size_t b = 0; b < bins_; ++b) {
      if (count_[b] == 0.0) continue;
      const double k = second_[b] ? k2 : lambda;
      const double* xm = &xm_[b * K * cols_];
      acc = Eigen::Map<const Eigen::VectorXd>(xm + (K - 1) * cols_, static_cast<Eigen::Index>(cols_));
      for (int j = K - 2; j >= 0; --j)
        acc = acc * k + Eigen::Map<const Eigen::VectorXd>(xm + j * cols_, static_cast<Eigen::Index>(cols_));
      v += a_[b] * Eigen::Map<const Eigen::VectorXd>(&xsum_[b * cols_], static_cast<Eigen::Index>(cols_)) +
           b_[b] * acc;
    }
    const Eigen::VectorXd u = design_->r().transpose().triangularView<Eigen::Lower>().solve(v);
    const double explained = u.tail(u.size() - 1).squaredNorm();
    rss = tss - explained;
    // Too much of the sum of squares explained to subtract safely: evaluate directly instead.
    if (!(rss > 1e-6 * tss)) return false;
  }
  if (!(rss > 0.0) || !std::isfinite(rss)) return false;
  *out = std::log(rss) + (scaled ? 2.0 * m : 0.0);
  return true;
}

}  // namespace detail
}  // namespace powerback
