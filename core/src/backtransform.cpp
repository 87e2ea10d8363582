// Back-transforms: medians, smearing and normal-theory means, intervals, range limits.
#include "powerback/backtransform.hpp"

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <boost/math/policies/error_handling.hpp>
#include <boost/math/quadrature/tanh_sinh.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

constexpr double kPi = 3.141592653589793238462643383279502884;

// y for a value v of the family's argument: undo the shift, then the reflection.
double x_of_v(const TransformSpec& s, double v) {
  const double u = v - s.shift;
  return s.reflect ? s.pivot - u : u;
}

RangeLimit range_limit(const TransformSpec& s) { return family_traits(s.family).range(s.lambda); }

// Log-type families whose normal-theory mean has a closed form: E[v] = exp(a mu + a^2 s^2 / 2)
// with a = 1 (natural log) or ln 10 (log10).
bool lognormal_scale(const TransformSpec& s, double* a) {
  *a = family_traits(s.family).log_scale(s.lambda);
  return *a > 0.0;
}

}  // namespace

BackValue invert_bounded(const Transform& t, double z) {
  BackValue b;
  if (std::isnan(z)) return b;
  const TransformSpec& s = t.spec();
  if (std::isfinite(z) && math::in_range(s.family, z, s.lambda)) {
    // Not t.invert(), which reports an overflowing inverse as an error (NaN): here overflow to
    // +-Inf of a finite z (e.g. exp(800)) is the range limit in floating point, flagged bounded.
    b.value = x_of_v(s, math::inverse(s.family, z, s.lambda));
    b.bounded = !std::isfinite(b.value);
    return b;
  }
  // Beyond the range (finite z), or z = +-Inf: the limit of the inverse at that end.
  const RangeLimit r = range_limit(s);
  const bool invalid_side = r.limited && (z > r.z) == r.beyond_is_above;
  const double v = invalid_side ? r.v : math::inverse(s.family, z, s.lambda);
  b.value = x_of_v(s, v);
  b.bounded = true;
  return b;
}

BackValue median_back(const Transform& t, double mu) { return invert_bounded(t, mu); }

BackValue smearing_mean(const Transform& t, double mu, const double* residuals, std::size_t n) {
  require(n > 0 && residuals != nullptr, "smearing needs at least one training residual");
  BackValue b;
  if (std::isnan(mu)) return b;
  double sum = 0.0;
  for (std::size_t j = 0; j < n; ++j) {
    const BackValue v = invert_bounded(t, mu + residuals[j]);
    sum += v.value;
    b.bounded = b.bounded || v.bounded;
  }
  b.value = sum / static_cast<double>(n);
  return b;
}

namespace {

// v at distance delta >= 0 inside the range from its limit, without the cancellation of
// forming z = limit +- delta first (the base of the power is |lambda| delta exactly).
double v_inside(const TransformSpec& s, const RangeLimit& r, double delta) {
  const double l = s.lambda;
  switch (s.family) {
    case Family::BoxCox: return std::exp(std::log(std::fabs(l) * delta) / l);
    case Family::Sqrt: return delta * delta;
    case Family::Reciprocal: return 1.0 / delta;
    case Family::Power: return std::pow(delta, 1.0 / l);
    case Family::YeoJohnson:
      if (l < 0.0 && delta <= r.z) return std::expm1(std::log(-l * delta) / l);
      if (l > 2.0 && delta <= -r.z) return -std::expm1(std::log((l - 2.0) * delta) / (2.0 - l));
      break;
    default: break;
  }
  const double z = r.beyond_is_above ? r.z - delta : r.z + delta;
  return math::inverse(s.family, z, s.lambda);
}

// Q(k) / phi(k) for k > 30 by its asymptotic series 1/k (1 - 1/k^2 + 3/k^4 - ...), whose first
// omitted term is below 5e-18 there (Abramowitz & Stegun 26.2.12).
double mills_ratio_large(double k) {
  const double k2 = k * k;
  double term = 1.0, sum = 1.0;
  for (int j = 1; j <= 7; ++j) {
    term *= -(2.0 * j - 1.0) / k2;
    sum += term;
  }
  return sum / k;
}

using GK = boost::math::quadrature::gauss_kronrod<double, 61>;
constexpr double kRelTol = 1e-13;
constexpr double kWindow = 40.0;  // standard units beyond which the normal weight is < e^-800
// Bisection depth of the adaptive Gauss-Kronrod rule per piece: at most 2^12 subintervals of 61
// points, which smooth integrands never approach, and which bounds the cost of a pathological one
// (a back-transform growing like sinh across a wide window) to milliseconds.
constexpr unsigned kMaxDepth = 12;

// Integral of f over [a, b] split at the interior points of `cuts` (sorted, clipped).
template <class F>
double integrate_pieces(F f, double a, double b, std::vector<double> cuts) {
  cuts.push_back(a);
  cuts.push_back(b);
  std::sort(cuts.begin(), cuts.end());
  double sum = 0.0;
  for (std::size_t i = 0; i + 1 < cuts.size(); ++i) {
    const double lo = std::max(a, cuts[i]), hi = std::min(b, cuts[i + 1]);
    if (hi > lo) sum += GK::integrate(f, lo, hi, kMaxDepth, kRelTol);
  }
  return sum;
}

}  // namespace

BackValue normal_mean(const Transform& t, double mu, double sigma, double* cut_mass) {
  BackValue b;
  if (cut_mass) *cut_mass = math::kNaN;
  if (std::isnan(mu) || std::isnan(sigma)) return b;
  require(sigma >= 0.0, "sigma must be >= 0");
  const TransformSpec& s = t.spec();
  const RangeLimit r = range_limit(s);
  if (sigma == 0.0 || !std::isfinite(mu)) {
    b = invert_bounded(t, mu);
    if (cut_mass) *cut_mass = (r.limited && std::isfinite(mu) && !math::in_range(s.family, mu, s.lambda)) ? 1.0 : 0.0;
    return b;
  }
  if (cut_mass) *cut_mass = 0.0;
  double a = 1.0;
  if (lognormal_scale(s, &a)) {
    // Lognormal mean: E[exp(a Z)] = exp(a mu + a^2 sigma^2 / 2).
    const double ev = std::exp(a * mu + 0.5 * a * a * sigma * sigma);
    b.value = x_of_v(s, ev);
    b.bounded = !std::isfinite(ev);
    return b;
  }
  if (s.family == Family::Identity) {
    b.value = x_of_v(s, mu);
    return b;
  }
  // How far the integrand's bulk can sit from the normal's centre (standard units): sigma for
  // inverses growing like exp(z), sqrt(p) for a power p of z.
  const double p = family_traits(s.family).growth_power(s.lambda);
  const double reach = sigma + std::sqrt(std::fabs(p));
  if (!r.limited) {
    auto f = [&](double u) {
      const double v = math::inverse(s.family, mu + sigma * u, s.lambda);
      const double w = std::exp(-0.5 * u * u) / std::sqrt(2.0 * kPi);
      return w == 0.0 ? 0.0 : v * w;
    };
    const double lim = kWindow + reach;
    const double ev = integrate_pieces(f, -lim, lim, {-reach, 0.0, reach});
    b.value = x_of_v(s, ev);
    b.bounded = !std::isfinite(ev);
    return b;
  }
  // Distance into the range in standard units: t >= 0, z = limit -+ sigma t. With
  // kappa = (signed) standard distance of the limit from mu towards the inside, the mass cut off
  // is Phi(kappa) and the truncated weight on t is phi(kappa + t) / Q(kappa).
  const double u0 = (r.z - mu) / sigma;
  const double kappa = r.beyond_is_above ? -u0 : u0;
  const boost::math::normal n01;
  const double cut = boost::math::cdf(n01, kappa);
  if (cut_mass) *cut_mass = cut;
  if (normal_mean_diverges(r)) {
    // v grows like distance^p with p <= -1 at the limit, where the normal density is positive:
    // the integral diverges, and the mean is infinite under any positive normal weight.
    b.value = x_of_v(s, r.v);
    b.bounded = true;
    return b;
  }
  double hazard = 0.0;  // phi(kappa) / Q(kappa), for kappa > 0
  if (kappa > 30.0) hazard = 1.0 / mills_ratio_large(kappa);
  else if (kappa > 0.0) hazard = boost::math::pdf(n01, kappa) / boost::math::cdf(boost::math::complement(n01, kappa));
  const double inside = kappa <= 0.0 ? boost::math::cdf(boost::math::complement(n01, kappa)) : 0.0;
  auto weight = [&](double tt) {
    if (kappa <= 0.0) return boost::math::pdf(n01, kappa + tt) / inside;
    return hazard * std::exp(-kappa * tt - 0.5 * tt * tt);
  };
  auto f = [&](double tt) {
    const double w = weight(tt);
    return w == 0.0 ? 0.0 : v_inside(s, r, sigma * tt) * w;
  };
  const double peak = std::max(0.0, -kappa);
  const double lo = std::max(0.0, peak - kWindow - reach), hi = peak + kWindow + reach;
  double ev = 0.0;
  try {
    double start = lo;
    if (lo == 0.0) {
      // Next to the limit the integrand may have an integrable singularity (p in (-1, 0)) or a
      // kink: tanh-sinh handles endpoint behaviour of that kind.
      start = std::min(1.0, hi);
      boost::math::quadrature::tanh_sinh<double> ts;
      ev += ts.integrate(f, 0.0, start, kRelTol);
    }
    ev += integrate_pieces(f, start, hi, {peak - reach, peak, peak + reach});
  } catch (const boost::math::evaluation_error&) {
    // The quadrature met a point where the back-transform overflows: in floating point the mean
    // is the overflow limit, reported as bounded like any other overflow.
    ev = math::kInf;
  }
  b.value = x_of_v(s, ev);
  b.bounded = !std::isfinite(ev);
  return b;
}

BackInterval interval_back(const Transform& t, double lo, double hi) {
  BackInterval out;
  const BackValue a = invert_bounded(t, lo), c = invert_bounded(t, hi);
  out.bounded = a.bounded || c.bounded;
  if (t.spec().reflect) {
    out.lower = c.value;
    out.upper = a.value;
  } else {
    out.lower = a.value;
    out.upper = c.value;
  }
  return out;
}

}  // namespace powerback
