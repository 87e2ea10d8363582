// Back-transforms: normal-theory and smearing means, range limits.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/errors.hpp"
#include "test_support.hpp"

using namespace powerback;

namespace {
constexpr double kPi = 3.141592653589793238462643383279502884;
using pwbtest::make;
double phi(double u) { return std::exp(-0.5 * u * u) / std::sqrt(2 * kPi); }
double Phi(double u) { return 0.5 * std::erfc(-u / std::sqrt(2.0)); }
}  // namespace

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
  // Adaptive quadrature here; tolerance 1e-10, a margin over the 1e-13 asked of it.
  CHECK(normal_mean(make(Family::Asinh), 0.8, 1.1).value ==
        Approx(std::sinh(0.8) * std::exp(0.605)).epsilon(1e-10));
  // Box-Cox lambda = 1/2: y = (1 + z/2)^2, so E[y] = (1 + mu/2)^2 + sigma^2 / 4 when the mass
  // beyond z = -2 is negligible (mu = 10 is 17 sigma away). Tolerance 1e-10 as above.
  const BackValue b = normal_mean(make(Family::BoxCox, 0.5), 10.0, 0.7);
  CHECK(b.value == Approx(36.0 + 0.49 / 4).epsilon(1e-10));
  CHECK_FALSE(b.bounded);
}

TEST_CASE("normal-theory mean truncates the normal to the range", "[backtransform]") {
  // Box-Cox 1/2, mu = -1.5, sigma = 1: 31% of the normal lies below z = -2 and is cut off. With
  // W = 1 + Z/2 = a + b U (a = 1 + mu/2, b = sigma/2, U standard normal) and u0 = (-2 - mu)/sigma,
  // E[W^2; U > u0] = a^2 (1 - Phi(u0)) + 2ab phi(u0) + b^2 (1 - Phi(u0) + u0 phi(u0))
  // (truncated normal moments, by integration by parts), divided by the kept mass 1 - Phi(u0).
  // Tolerance 1e-11: quadrature asked for 1e-13 relative, with a margin.
  const double mu = -1.5, s = 1.0, a = 1 + mu / 2, bb = s / 2, u0 = (-2 - mu) / s;
  const double want = a * a * (1 - Phi(u0)) + 2 * a * bb * phi(u0) + bb * bb * (1 - Phi(u0) + u0 * phi(u0));
  double cut = -1;
  const BackValue b = normal_mean(make(Family::BoxCox, 0.5), mu, s, &cut);
  CHECK_FALSE(b.bounded);
  CHECK(b.value == Approx(want / (1 - Phi(u0))).epsilon(1e-11));
  CHECK(cut == Approx(Phi(u0)).epsilon(1e-14));  // the same normal probability
  // Reciprocal (-1/v): v ~ 1/distance at z = 0, so the integral diverges whatever the mass
  // beyond: the mean is infinite and flagged, with the cut mass reported.
  const BackValue r = normal_mean(make(Family::Reciprocal), -0.5, 0.1, &cut);
  CHECK(r.bounded);
  CHECK(std::isinf(r.value));
  CHECK(cut == Approx(Phi(-5.0)).epsilon(1e-12));
  // Box-Cox -0.5 (v ~ distance^-2): infinite even with 1e-300 of the mass beyond.
  CHECK(std::isinf(normal_mean(make(Family::BoxCox, -0.5), -20.0, 0.5).value));
  // Box-Cox -2 (v ~ distance^-1/2, integrable): finite, and continuous as the limit nears.
  const BackValue far = normal_mean(make(Family::BoxCox, -2.0), 0.0, 0.05, &cut);
  CHECK_FALSE(far.bounded);
  CHECK(cut == Approx(Phi(-10.0)).epsilon(1e-10));  // the limit z = 0.5 is 10 sigma away
  // Far from the limit the truncation is invisible: the moment expansion
  // g(mu) + g''(mu) sigma^2 / 2 + g''''(mu) sigma^4 / 8 with g = (1 - 2z)^(-1/2), g''(0) = 3,
  // g''''(0) = 105 leaves g^(6)(0) sigma^6 / 48 = 10395 * 1.6e-8 / 48 = 3.4e-6 (margin 1e-5).
  CHECK(far.value == Approx(1.0 + 1.5 * 0.0025 + 105.0 * 0.0025 * 0.0025 / 8).margin(1e-5));
  // Sigma 0: the median; beyond the limit it is the limit, and all mass is cut.
  CHECK(normal_mean(make(Family::Sqrt), -1.0, 0.0, &cut).value == 0.0);
  CHECK(cut == 1.0);
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
