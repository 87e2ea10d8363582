// Back-transforms: medians, smearing and normal-theory means, intervals, range limits.
#include "powerback/backtransform.hpp"

#include <Eigen/Eigenvalues>
#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <boost/math/special_functions/hermite.hpp>
#include <cmath>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

constexpr double kPi = 3.141592653589793238462643383279502884;
constexpr std::size_t kHermiteNodes = 64;
// Normal mass beyond the range limit below which it is neglected (it cannot move a double).
constexpr double kNegligibleMass = 1e-15;

// y for a value v of the family's argument: undo the shift, then the reflection.
double x_of_v(const TransformSpec& s, double v) {
  const double u = v - s.shift;
  return s.reflect ? s.pivot - u : u;
}

// Where the inverse stops existing, and what v tends to beyond that point.
struct RangeLimit {
  bool limited = false;
  double z = math::kNaN;        // the boundary on the transformed scale
  bool beyond_is_above = true;  // the invalid side is z > boundary (else z < boundary)
  double v = math::kNaN;        // limit of v on the invalid side: 0, +Inf or -Inf
};

RangeLimit range_limit(const TransformSpec& s) {
  RangeLimit r;
  const double l = s.lambda;
  switch (s.family) {
    case Family::BoxCox:
      if (l == 0.0) return r;
      r.limited = true;
      r.z = -1.0 / l;
      r.beyond_is_above = l < 0.0;  // 1 + l z > 0
      r.v = l > 0.0 ? 0.0 : math::kInf;
      return r;
    case Family::YeoJohnson:
      if (l < 0.0) {  // z >= 0 branch needs 1 + l z > 0
        r.limited = true;
        r.z = -1.0 / l;
        r.beyond_is_above = true;
        r.v = math::kInf;
      } else if (l > 2.0) {  // z < 0 branch needs 1 - (2 - l) z > 0
        r.limited = true;
        r.z = 1.0 / (2.0 - l);
        r.beyond_is_above = false;
        r.v = -math::kInf;
      }
      return r;
    case Family::Sqrt:
      r.limited = true;
      r.z = 0.0;
      r.beyond_is_above = false;
      r.v = 0.0;
      return r;
    case Family::Reciprocal:
      r.limited = true;
      r.z = 0.0;
      r.beyond_is_above = true;
      r.v = math::kInf;
      return r;
    case Family::Power:
      if (l > 0.0) return r;
      r.limited = true;
      r.z = 0.0;
      r.beyond_is_above = true;
      r.v = math::kInf;
      return r;
    default:
      return r;
  }
}

// Log-type families whose normal-theory mean has a closed form: E[v] = exp(a mu + a^2 s^2 / 2)
// with a = 1 (natural log) or ln 10 (log10).
bool lognormal_scale(const TransformSpec& s, double* a) {
  if (s.family == Family::Log || (s.family == Family::BoxCox && s.lambda == 0.0)) {
    *a = 1.0;
    return true;
  }
  if (s.family == Family::Log10) {
    *a = math::kLn10;
    return true;
  }
  return false;
}

}  // namespace

GaussHermiteRule gauss_hermite(std::size_t m) {
  require(m > 0, "a Gauss-Hermite rule needs at least one node");
  // Golub-Welsch: the Jacobi matrix of the Hermite polynomials (weight exp(-x^2)) has zero
  // diagonal and off-diagonal sqrt(k / 2), k = 1..m-1; its eigenvalues are the nodes.
  const Eigen::Index n = static_cast<Eigen::Index>(m);
  Eigen::MatrixXd J = Eigen::MatrixXd::Zero(n, n);
  for (Eigen::Index k = 1; k < n; ++k) J(k, k - 1) = J(k - 1, k) = std::sqrt(0.5 * static_cast<double>(k));
  const Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> es(J, Eigen::EigenvaluesOnly);
  GaussHermiteRule rule;
  rule.nodes.resize(m);
  rule.weights.resize(m);
  // Weights from the closed form w_i = 2^(m-1) m! sqrt(pi) / (m^2 H_{m-1}(x_i)^2) (Abramowitz &
  // Stegun 25.4.46), in logs: accurate in relative terms even for the outermost nodes, where
  // eigenvector components would only be accurate in absolute terms.
  const double md = static_cast<double>(m);
  const double logc = (md - 1.0) * std::log(2.0) + std::lgamma(md + 1.0) + 0.5 * std::log(kPi) -
                      2.0 * std::log(md);
  for (std::size_t i = 0; i < m; ++i) {
    const double x = es.eigenvalues()(static_cast<Eigen::Index>(i));
    rule.nodes[i] = x;
    const double h = boost::math::hermite(static_cast<unsigned>(m - 1), x);
    rule.weights[i] = m == 1 ? std::sqrt(kPi) : std::exp(logc - 2.0 * std::log(std::fabs(h)));
  }
  return rule;
}

const GaussHermiteRule& default_gauss_hermite() {
  static const GaussHermiteRule rule = gauss_hermite(kHermiteNodes);
  return rule;
}

BackValue invert_bounded(const Transform& t, double z) {
  BackValue b;
  if (std::isnan(z)) return b;
  const TransformSpec& s = t.spec();
  if (std::isfinite(z) && math::in_range(s.family, z, s.lambda)) {
    b.value = t.invert(z);
    // Overflow to +-Inf of a finite z (e.g. exp(800)) is the range limit in floating point.
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

BackValue normal_mean(const Transform& t, double mu, double sigma) {
  BackValue b;
  if (std::isnan(mu) || std::isnan(sigma)) return b;
  require(sigma >= 0.0, "sigma must be >= 0");
  if (sigma == 0.0 || !std::isfinite(mu)) return invert_bounded(t, mu);
  const TransformSpec& s = t.spec();
  double a = 1.0;
  if (lognormal_scale(s, &a)) {
    // Lognormal mean: E[exp(a Z)] = exp(a mu + a^2 sigma^2 / 2).
    const double ev = std::exp(a * mu + 0.5 * a * a * sigma * sigma);
    b.value = x_of_v(s, ev);
    b.bounded = !std::isfinite(ev);
    return b;
  }
  const RangeLimit r = range_limit(s);
  double mass = 0.0;
  if (r.limited) {
    const boost::math::normal nd(mu, sigma);
    mass = r.beyond_is_above ? boost::math::cdf(boost::math::complement(nd, r.z))
                             : boost::math::cdf(nd, r.z);
  }
  if (mass <= kNegligibleMass) {
    // Gauss-Hermite: E[g(mu + sigma Z)] = pi^(-1/2) sum w_i g(mu + sqrt(2) sigma x_i). Nodes
    // beyond the limit carry mass below kNegligibleMass and are left out.
    const GaussHermiteRule& gh = default_gauss_hermite();
    double sum = 0.0, wsum = 0.0;
    for (std::size_t i = 0; i < gh.nodes.size(); ++i) {
      const double z = mu + std::sqrt(2.0) * sigma * gh.nodes[i];
      if (!math::in_range(s.family, z, s.lambda)) continue;
      const BackValue v = invert_bounded(t, z);
      sum += gh.weights[i] * v.value;
      wsum += gh.weights[i];
      b.bounded = b.bounded || v.bounded;
    }
    b.value = sum / wsum;
    return b;
  }
  b.bounded = true;
  const double limit_x = x_of_v(s, r.v);
  if (std::isinf(limit_x)) {  // positive mass at an infinite limit: the mean is infinite
    b.value = limit_x;
    return b;
  }
  // Inside the range, integrate g(mu + sigma u) phi(u) over the half-line of u that maps into
  // the range; the mass beyond contributes mass * limit.
  const double u0 = (r.z - mu) / sigma;
  auto f = [&](double u) {
    const double z = mu + sigma * u;
    if (!math::in_range(s.family, z, s.lambda)) return 0.0;
    return t.invert(z) * std::exp(-0.5 * u * u) / std::sqrt(2.0 * kPi);
  };
  using GK = boost::math::quadrature::gauss_kronrod<double, 31>;
  const double inside = r.beyond_is_above ? GK::integrate(f, -math::kInf, u0, 15, 1e-12)
                                          : GK::integrate(f, u0, math::kInf, 15, 1e-12);
  b.value = inside + mass * limit_x;
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
