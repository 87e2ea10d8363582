// Shapiro-Wilk W and its p-value, following the published algorithm AS R94 (Royston 1995) with
// the coefficient and distribution approximations of Royston (1992).
//
// Coefficients a (antisymmetric, sum a^2 = 1): with m_i = Phi^-1((i - 3/8) / (n + 1/4)) and
// u = 1/sqrt(n), the two outermost take a polynomial correction of m_i / |m|, the rest are m_i
// rescaled so that the squares sum to one. W = (sum a_i x_(i))^2 / sum (x_i - mean)^2.
// p-value: exact for n = 3; for 4 <= n <= 11 a normal approximation to -log(gamma - log(1 - W));
// for n >= 12 a normal approximation to log(1 - W). All polynomial constants below are the
// published ones (Royston 1992; the same values appear in the published algorithm, Royston 1995).
#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include <boost/math/distributions/normal.hpp>

#include "powerback/errors.hpp"
#include "powerback/family_math.hpp"
#include "powerback/normality.hpp"

namespace powerback {

namespace {

constexpr std::size_t kMinN = 3;
constexpr std::size_t kMaxN = 5000;

// c[0] + c[1] t + c[2] t^2 + ... (Horner).
template <std::size_t K>
double poly(const double (&c)[K], double t) {
  double r = c[K - 1];
  for (std::size_t k = K - 1; k-- > 0;) r = r * t + c[k];
  return r;
}

// Royston (1992): corrections of the largest two coefficients, in u = 1/sqrt(n).
constexpr double kLast[] = {0.0, 0.221157, -0.147981, -2.071190, 4.434685, -2.706056};
constexpr double kNextToLast[] = {0.0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633};
// 4 <= n <= 11: gamma, mean and log sd of -log(gamma - log(1 - W)), polynomials in n.
constexpr double kGammaSmall[] = {-2.273, 0.459};
constexpr double kMeanSmall[] = {0.5440, -0.39978, 0.025054, -6.714e-4};
constexpr double kLogSdSmall[] = {1.3822, -0.77857, 0.062767, -0.0020322};
// n >= 12: mean and log sd of log(1 - W), polynomials in log n.
constexpr double kMeanLarge[] = {-1.5861, -0.31082, -0.083751, 0.0038915};
constexpr double kLogSdLarge[] = {-0.4803, -0.082676, 0.0030302};

// The coefficients a_1..a_n (a_i = -a_{n+1-i}).
std::vector<double> coefficients(std::size_t n) {
  std::vector<double> a(n, 0.0);
  if (n == 3) {
    a[2] = std::sqrt(0.5);
    a[0] = -a[2];
    return a;
  }
  const boost::math::normal_distribution<double> std_normal;
  const double dn = static_cast<double>(n);
  std::vector<double> m(n);
  double mm = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    // Compute the upper half from the upper tail and mirror, so that m is exactly antisymmetric.
    if (i < n / 2) continue;
    const double p = (static_cast<double>(i + 1) - 0.375) / (dn + 0.25);
    m[i] = boost::math::quantile(std_normal, p);
    m[n - 1 - i] = -m[i];
  }
  for (double v : m) mm += v * v;
  const double norm = std::sqrt(mm);
  const double u = 1.0 / std::sqrt(dn);
  const double an = m[n - 1] / norm + poly(kLast, u);
  double phi;
  std::size_t outer;  // how many coefficients at each end come from the polynomials
  double an1 = 0.0;
  if (n > 5) {
    an1 = m[n - 2] / norm + poly(kNextToLast, u);
    phi = (mm - 2.0 * m[n - 1] * m[n - 1] - 2.0 * m[n - 2] * m[n - 2]) /
          (1.0 - 2.0 * an * an - 2.0 * an1 * an1);
    outer = 2;
  } else {
    phi = (mm - 2.0 * m[n - 1] * m[n - 1]) / (1.0 - 2.0 * an * an);
    outer = 1;
  }
  const double root_phi = std::sqrt(phi);
  for (std::size_t i = 0; i < n; ++i) a[i] = m[i] / root_phi;
  a[n - 1] = an;
  a[0] = -an;
  if (outer == 2) {
    a[n - 2] = an1;
    a[1] = -an1;
  }
  return a;
}

double p_value(double w, std::size_t n) {
  const boost::math::normal_distribution<double> std_normal;
  if (n == 3) {
    // Exact: P(W <= w) = (6 / pi) (asin(sqrt(w)) - asin(sqrt(3/4))), W >= 3/4.
    const double pi = 3.141592653589793238462643;
    const double p = 6.0 / pi * (std::asin(std::sqrt(w)) - pi / 3.0);
    return std::min(1.0, std::max(0.0, p));
  }
  const double one_minus_w = 1.0 - w;
  if (one_minus_w <= 0.0) return 1.0;
  const double y = std::log(one_minus_w);
  const double dn = static_cast<double>(n);
  double stat, mean, sd;
  if (n <= 11) {
    const double gamma = poly(kGammaSmall, dn);
    // Beyond gamma the approximation has no value; W is then far below any plausible value
    // (this cannot happen for W >= its minimum at these n), so the p-value is 0 to any precision.
    if (y >= gamma) return 0.0;
    stat = -std::log(gamma - y);
    mean = poly(kMeanSmall, dn);
    sd = std::exp(poly(kLogSdSmall, dn));
  } else {
    const double ln = std::log(dn);
    stat = y;
    mean = poly(kMeanLarge, ln);
    sd = std::exp(poly(kLogSdLarge, ln));
  }
  return boost::math::cdf(boost::math::complement(std_normal, (stat - mean) / sd));
}

ShapiroWilk skipped(std::size_t n, NormalitySkip why) {
  ShapiroWilk r;
  r.w = r.p_value = math::kNaN;
  r.n = n;
  r.computed = false;
  r.skip = why;
  r.note = normality_skip_text(why);
  return r;
}

}  // namespace

ShapiroWilk shapiro_wilk(const double* x, std::size_t n) {
  if (n > 0 && !x) throw Error(ErrorCode::Argument, "x is NULL but n > 0");
  detail::require_finite_sample(x, n, "x");
  if (n < kMinN) return skipped(n, NormalitySkip::TooFew);
  if (n > kMaxN) return skipped(n, NormalitySkip::TooMany);
  std::vector<double> s(x, x + n);
  std::sort(s.begin(), s.end());
  // W does not depend on units: scale by the power of two that brings max |x| into [0.5, 1)
  // (exact), so that neither the range nor the sum overflows for values near 1e308.
  int e = 0;
  const double scale0 = std::max(std::fabs(s[0]), std::fabs(s[n - 1]));
  if (scale0 > 0.0) std::frexp(scale0, &e);
  for (double& v : s) v = std::ldexp(v, -e);
  const double range = s[n - 1] - s[0];
  const double scale = std::max(std::fabs(s[0]), std::fabs(s[n - 1]));
  // Constant up to rounding: a range within 64 units in the last place of the largest value.
  if (!(range > 64.0 * std::numeric_limits<double>::epsilon() * scale))
    return skipped(n, NormalitySkip::Constant);
  // Centre and scale by the range, so neither a large mean nor extreme units lose precision.
  double mean = 0.0;
  for (double v : s) mean += v;
  mean /= static_cast<double>(n);
  double ssq = 0.0;
  for (double& v : s) {
    v = (v - mean) / range;
    ssq += v * v;
  }
  const std::vector<double> a = coefficients(n);
  double num = 0.0;
  for (std::size_t i = 0; i < n; ++i) num += a[i] * s[i];
  double w = num * num / ssq;
  w = std::min(w, 1.0);
  ShapiroWilk r;
  r.w = w;
  r.p_value = p_value(w, n);
  r.n = n;
  r.computed = true;
  return r;
}

}  // namespace powerback
