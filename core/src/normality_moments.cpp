// Sample skewness and excess kurtosis with their small-sample adjustments and standard errors,
// and the finite-input check shared by the normality statistics.
//
//   m_k = sum (x - mean)^k / n,  g1 = m3 / m2^(3/2),  g2 = m4 / m2^2 - 3
//   G1 = g1 sqrt(n(n-1)) / (n-2)
//   G2 = (n-1) / ((n-2)(n-3)) * ((n+1) g2 + 6)
// (Joanes & Gill 1998, the estimators they call G1 and G2.)
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/family_math.hpp"
#include "powerback/normality.hpp"

namespace powerback {
namespace detail {

// Throws IndexedError(NonFinite) listing the first NaN or infinite elements of x.
void require_finite_sample(const double* x, std::size_t n, const char* what) {
  std::size_t count = 0;
  std::vector<std::size_t> first;
  for (std::size_t i = 0; i < n; ++i) {
    if (std::isfinite(x[i])) continue;
    if (first.size() < kMaxReportedIndices) first.push_back(i);
    ++count;
  }
  if (count == 0) return;
  throw IndexedError(ErrorCode::NonFinite,
                     std::string(what) + " has " + std::to_string(count) + " of " +
                         std::to_string(n) + " values NaN or infinite at index " +
                         format_indices(first, count) + " (0-based): remove missing values first",
                     count, first);
}

}  // namespace detail

const char* normality_skip_text(NormalitySkip why) noexcept {
  switch (why) {
    case NormalitySkip::TooFew: return "fewer than 3 values: Shapiro-Wilk needs at least 3";
    case NormalitySkip::TooMany:
      return "more than 5000 values: the Shapiro-Wilk approximation is valid only up to 5000";
    case NormalitySkip::Constant: return "all values are identical: no test of shape is possible";
    case NormalitySkip::Overflow:
      return "the transformed values overflow double precision: no test is possible";
    default: return "";
  }
}

Moments sample_moments(const double* x, std::size_t n) {
  if (n > 0 && !x) throw Error(ErrorCode::Argument, "x is NULL but n > 0");
  detail::require_finite_sample(x, n, "x");
  Moments m;
  m.n = n;
  m.mean = m.sd = m.skewness = m.skewness_se = m.skewness_z = math::kNaN;
  m.kurtosis = m.kurtosis_se = m.kurtosis_z = math::kNaN;
  if (n == 0) return m;
  // The sums run on x * c, with c the power of two that brings max |x| into [0.5, 1): exact, and
  // values near 1e300 or 1e-301 neither overflow nor underflow in the powers. Skewness and
  // kurtosis do not depend on c; the mean and sd are scaled back exactly.
  double amax = 0.0;
  for (std::size_t i = 0; i < n; ++i) amax = std::max(amax, std::fabs(x[i]));
  int e = 0;
  if (amax > 0.0) std::frexp(amax, &e);
  const double c = std::ldexp(1.0, -e), back = std::ldexp(1.0, e);
  // Two passes: the mean, then central sums (accurate when the mean is large against the spread).
  double sum = 0.0;
  for (std::size_t i = 0; i < n; ++i) sum += x[i] * c;
  const double dn = static_cast<double>(n);
  double mean = sum / dn;
  // One refinement step removes most of the rounding of the first sum (it matters when the mean
  // is large against the spread, where odd central moments are tiny differences).
  double resid = 0.0;
  for (std::size_t i = 0; i < n; ++i) resid += x[i] * c - mean;
  mean += resid / dn;
  double s2 = 0.0, s3 = 0.0, s4 = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    const double d = x[i] * c - mean, d2 = d * d;
    s2 += d2;
    s3 += d2 * d;
    s4 += d2 * d2;
  }
  m.mean = mean * back;
  if (n >= 2) m.sd = std::sqrt(s2 / (dn - 1.0)) * back;
  if (n >= 3)
    m.skewness_se = std::sqrt(6.0 * dn * (dn - 1.0) / ((dn - 2.0) * (dn + 1.0) * (dn + 3.0)));
  if (n >= 4)
    m.kurtosis_se = std::sqrt(24.0 * dn * (dn - 1.0) * (dn - 1.0) /
                              ((dn - 3.0) * (dn - 2.0) * (dn + 3.0) * (dn + 5.0)));
  // A constant sample (every deviation exactly zero, or zero up to rounding of the mean: within
  // 64 units in the last place of the mean) has no shape: leave G1 and G2 NaN.
  const double m2 = s2 / dn;
  constexpr double eps = std::numeric_limits<double>::epsilon();
  if (!(m2 > 0.0) || std::sqrt(m2) <= 64.0 * eps * std::fabs(mean)) {
    m.sd = n >= 2 ? 0.0 : m.sd;
    return m;
  }
  const double g1 = (s3 / dn) / std::pow(m2, 1.5);
  const double g2 = (s4 / dn) / (m2 * m2) - 3.0;
  if (n >= 3) {
    m.skewness = g1 * std::sqrt(dn * (dn - 1.0)) / (dn - 2.0);
    m.skewness_z = m.skewness / m.skewness_se;
  }
  if (n >= 4) {
    m.kurtosis = (dn - 1.0) / ((dn - 2.0) * (dn - 3.0)) * ((dn + 1.0) * g2 + 6.0);
    m.kurtosis_z = m.kurtosis / m.kurtosis_se;
  }
  return m;
}

}  // namespace powerback
