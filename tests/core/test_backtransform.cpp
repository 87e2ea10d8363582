// Back-transforms: Gauss-Hermite rule, normal-theory and smearing means, range limits.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/errors.hpp"

using namespace powerback;

namespace {
constexpr double kPi = 3.141592653589793238462643383279502884;
Transform make(Family f, double lambda = math::kNaN, double shift = 0, bool reflect = false,
               double pivot = math::kNaN) {
  TransformSpec s;
  s.family = f;
  s.lambda = lambda;
  s.shift = shift;
  s.reflect = reflect;
  s.pivot = pivot;
  return Transform(s);
}
double phi(double u) { return std::exp(-0.5 * u * u) / std::sqrt(2 * kPi); }
double Phi(double u) { return 0.5 * std::erfc(-u / std::sqrt(2.0)); }
}  // namespace

TEST_CASE("Gauss-Hermite rule integrates the moments of exp(-x^2)", "[backtransform]") {
  // integral of x^(2k) exp(-x^2) over the line = Gamma(k + 1/2) (any table of integrals).
  // Tolerance 1e-12: the rule is exact for these polynomials, so only rounding remains.
  const GaussHermiteRule& r = default_gauss_hermite();
  REQUIRE(r.nodes.size() == 64);
  for (int k = 0; k <= 4; ++k) {
    double s = 0;
    for (std::size_t i = 0; i < r.nodes.size(); ++i) s += r.weights[i] * std::pow(r.nodes[i], 2 * k);
    CHECK(s == Approx(std::tgamma(k + 0.5)).epsilon(1e-12));
  }
  // Three nodes: 0 and +-sqrt(3/2), weights 2 sqrt(pi)/3 and sqrt(pi)/6 (Abramowitz & Stegun
  // table 25.10). Tolerance 1e-13: closed forms, rounding only.
  const GaussHermiteRule r3 = gauss_hermite(3);
  CHECK(r3.nodes[2] == Approx(std::sqrt(1.5)).epsilon(1e-13));
  CHECK(r3.nodes[1] == Approx(0.0).margin(1e-14));
  CHECK(r3.weights[1] == Approx(2 * std::sqrt(kPi) / 3).epsilon(1e-13));
  CHECK(r3.weights[0] == Approx(std::sqrt(kPi) / 6).epsilon(1e-13));
  CHECK_THROWS_AS(gauss_hermite(0), Error);
}

TEST_CASE("normal-theory means match closed forms", "[backtransform]") {
  // Lognormal mean exp(mu + sigma^2 / 2) (Johnson, Kotz & Balakrishnan, Continuous Univariate
  // Distributions vol. 1, ch. 14); for log10, E[10^Z] = exp(mu ln10 + (sigma ln10)^2 / 2).
  // Tolerance 1e-13: the implementation evaluates the same closed form.
  CHECK(normal_mean(make(Family::Log), 1.2, 0.5).value == Approx(std::exp(1.2 + 0.125)).epsilon(1e-13));
  CHECK(normal_mean(make(Family::BoxCox, 0.0), 1.2, 0.5).value == Approx(std::exp(1.325)).epsilon(1e-13));
  const double l10 = std::log(10.0);
  CHECK(normal_mean(make(Family::Log10), 0.3, 0.2).value ==
        Approx(std::exp(0.3 * l10 + 0.5 * 0.04 * l10 * l10)).epsilon(1e-13));
  // With a shift of 2: y = v - 2, so E[y] = E[v] - 2.
  CHECK(normal_mean(make(Family::Log, math::kNaN, 2.0), 1.0, 0.3).value ==
        Approx(std::exp(1.045) - 2).epsilon(1e-13));
  // sinh: E[sinh(Z)] = sinh(mu) exp(sigma^2 / 2), from the normal moment generating function.
  // Gauss-Hermite here; tolerance 1e-10 is the accuracy asked of the quadrature.
  CHECK(normal_mean(make(Family::Asinh), 0.8, 1.1).value ==
        Approx(std::sinh(0.8) * std::exp(0.605)).epsilon(1e-10));
  // Box-Cox lambda = 1/2: y = (1 + z/2)^2, so E[y] = (1 + mu/2)^2 + sigma^2 / 4 when the mass
  // beyond z = -2 is negligible (mu = 10 is 17 sigma away). Tolerance 1e-10 as above.
  const BackValue b = normal_mean(make(Family::BoxCox, 0.5), 10.0, 0.7);
  CHECK(b.value == Approx(36.0 + 0.49 / 4).epsilon(1e-10));
  CHECK_FALSE(b.bounded);
}

TEST_CASE("normal-theory mean gives the mass beyond the range its limit", "[backtransform]") {
  // Box-Cox 1/2, mu = -1.5, sigma = 1: 31% of the normal lies below z = -2 where y = 0. With
  // W = 1 + Z/2 = a + b U (a = 1 + mu/2, b = sigma/2, U standard normal) and u0 = (-2 - mu)/sigma,
  // E[W^2; U > u0] = a^2 (1 - Phi(u0)) + 2ab phi(u0) + b^2 (1 - Phi(u0) + u0 phi(u0))
  // (truncated normal moments, by integration by parts). Tolerance 1e-9: adaptive quadrature
  // asked for 1e-12 relative, with a margin for the kink-free but truncated integrand.
  const double mu = -1.5, s = 1.0, a = 1 + mu / 2, bb = s / 2, u0 = (-2 - mu) / s;
  const double want = a * a * (1 - Phi(u0)) + 2 * a * bb * phi(u0) + bb * bb * (1 - Phi(u0) + u0 * phi(u0));
  const BackValue b = normal_mean(make(Family::BoxCox, 0.5), mu, s);
  CHECK(b.bounded);
  CHECK(b.value == Approx(want).epsilon(1e-9));
  // Reciprocal (-1/v): any mass at z >= 0 sends y to +Inf, so the mean is infinite and flagged.
  const BackValue r = normal_mean(make(Family::Reciprocal), -0.5, 0.3);
  CHECK(r.bounded);
  CHECK(std::isinf(r.value));
}

TEST_CASE("smearing equals Duan's formula", "[backtransform]") {
  // Duan (1983), eq. for the log model: E[y] estimate = exp(mu) * mean_j exp(e_j).
  const std::vector<double> e = {-0.4, 0.1, 0.25, -0.05, 0.3, -0.2};
  double m = 0;
  for (double v : e) m += std::exp(v) / e.size();
  const BackValue b = smearing_mean(make(Family::Log), 2.0, e.data(), e.size());
  CHECK(b.value == Approx(std::exp(2.0) * m).epsilon(1e-14));  // same sums, rounding only
  CHECK_FALSE(b.bounded);
  // sqrt: mean_j (mu + e_j)^2 = mu^2 + 2 mu mean(e) + mean(e^2); terms below 0 would be bounded.
  double m1 = 0, m2 = 0;
  for (double v : e) { m1 += v / e.size(); m2 += v * v / e.size(); }
  CHECK(smearing_mean(make(Family::Sqrt), 3.0, e.data(), e.size()).value ==
        Approx(9 + 6 * m1 + m2).epsilon(1e-14));
  CHECK(smearing_mean(make(Family::Sqrt), 0.1, e.data(), e.size()).bounded);
}

TEST_CASE("range limits set values to the family's limit and flag them", "[backtransform]") {
  // Box-Cox 1/2 with shift 1: z <= -2 means v = 0, so y = -1.
  const BackValue lo = invert_bounded(make(Family::BoxCox, 0.5, 1.0), -3.0);
  CHECK(lo.bounded);
  CHECK(lo.value == -1.0);
  // Box-Cox -1: z >= 1 means v = +Inf; reflected about 10 that is y = -Inf.
  CHECK(invert_bounded(make(Family::BoxCox, -1.0), 1.5).value == math::kInf);
  CHECK(invert_bounded(make(Family::BoxCox, -1.0, 0.0, true, 10.0), 1.5).value == -math::kInf);
  // Inside the range: the plain inverse, not bounded.
  const BackValue in = invert_bounded(make(Family::BoxCox, -1.0), 0.5);
  CHECK_FALSE(in.bounded);
  CHECK(in.value == Approx(2.0).epsilon(1e-15));
  CHECK(std::isnan(invert_bounded(make(Family::Log), math::kNaN).value));
  // A reflected transform swaps interval endpoints: log of (10 - y).
  const BackInterval iv = interval_back(make(Family::Log, math::kNaN, 0.0, true, 10.0), 0.0, 1.0);
  CHECK(iv.lower == Approx(10 - std::exp(1.0)).epsilon(1e-15));
  CHECK(iv.upper == Approx(9.0).epsilon(1e-15));
  CHECK_FALSE(iv.bounded);
}
