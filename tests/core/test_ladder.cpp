// The rule-based ladder of powers: thresholds, reflection, shift, stored constants.
#include <catch2/catch.hpp>

#include <boost/math/distributions/exponential.hpp>
#include <boost/math/distributions/lognormal.hpp>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/ladder.hpp"
#include "test_support.hpp"

using namespace powerback;

namespace {

using pwbtest::quantiles;

// Moments with a chosen G1 and z, for probing the rule's boundaries.
Moments fake(std::size_t n, double g1, double z) {
  Moments m;
  m.n = n;
  m.skewness = g1;
  m.skewness_z = z;
  return m;
}

}  // namespace

TEST_CASE("the 3.29 cut is the two-sided p < .001 normal quantile", "[ladder][external]") {
  // Source: the standard normal quantile at 0.9995 (Boost.Math) is 3.2905; the textbook rounds
  // it to 3.29. Tolerance 1e-3: that rounding.
  const double q = boost::math::quantile(boost::math::normal_distribution<double>(), 0.9995);
  CHECK(LadderRule::kZCut == Approx(q).margin(1e-3));
}

TEST_CASE("ladder thresholds: z below 300 values and size of G1 from 300 on", "[ladder]") {
  // Exactly at a cut the variable is not past it; just past it, it is.
  CHECK(ladder_from_moments(fake(100, 1.5, 3.29), 1, 9).step == LadderStep::None);
  CHECK(ladder_from_moments(fake(100, 1.5, 3.2901), 1, 9).step == LadderStep::Log10);
  CHECK_FALSE(ladder_from_moments(fake(299, 0.45, 3.2), 1, 9).skewed);
  // From 300 values z no longer decides: a huge z with a small G1 is not skewed ...
  const LadderAdvice big_z = ladder_from_moments(fake(300, 0.5, 40.0), 1, 9);
  CHECK(big_z.by_size);
  CHECK_FALSE(big_z.skewed);
  CHECK(big_z.step == LadderStep::None);
  // ... and a G1 past 0.5 is, whatever z says.
  const LadderAdvice size = ladder_from_moments(fake(300, 0.51, 2.0), 1, 9);
  CHECK(size.skewed);
  CHECK(size.step == LadderStep::Sqrt);
  // Severity by |G1|: <= 1 sqrt, <= 2 log10, above 2 reciprocal.
  CHECK(ladder_from_moments(fake(50, 1.0, 9), 1, 9).step == LadderStep::Sqrt);
  CHECK(ladder_from_moments(fake(50, 1.0001, 9), 1, 9).step == LadderStep::Log10);
  CHECK(ladder_from_moments(fake(50, 2.0, 9), 1, 9).step == LadderStep::Log10);
  CHECK(ladder_from_moments(fake(50, 2.0001, 9), 1, 9).step == LadderStep::Reciprocal);
  CHECK(ladder_from_moments(fake(50, -2.5, -9), 1, 9).step == LadderStep::Reciprocal);
  // The two rules nearly meet at the switch: 3.29 SE(G1) at n = 300 is 0.46.
  const double n = 300.0;
  const double se = std::sqrt(6 * n * (n - 1) / ((n - 2) * (n + 1) * (n + 3)));
  CHECK(3.29 * se == Approx(0.46).margin(0.005));
}

TEST_CASE("right skew: the step by severity, no shift for positive values", "[ladder]") {
  // Quantiles of the unit exponential (G1 near 2, inside the log10 band after the sample's
  // small-n shrinkage) and of a lognormal with sigma = 1 (G1 far above 2).
  const auto ex = quantiles(boost::math::exponential_distribution<double>(1.0), 100);
  const LadderAdvice a = ladder_recommend(ex.data(), ex.size());
  INFO(a.reason);
  CHECK(a.skewed);
  CHECK(a.skewness > 1.0);
  CHECK(a.skewness <= 2.0);
  CHECK(a.step == LadderStep::Log10);
  CHECK(a.spec.family == Family::Log10);
  CHECK_FALSE(a.spec.reflect);
  CHECK(a.spec.shift == 0.0);
  CHECK(std::isnan(a.spec.pivot));
  CHECK(a.reason.find("substantial right skew -> log10") != std::string::npos);

  const auto ln = quantiles(boost::math::lognormal_distribution<double>(0.0, 1.0), 200);
  const LadderAdvice b = ladder_recommend(ln.data(), ln.size());
  CHECK(b.skewness > 2.0);
  CHECK(b.step == LadderStep::Reciprocal);
  // Our reciprocal is -1/v, increasing: the transformed values keep the original order.
  const Transform t(b.spec);
  for (std::size_t i = 1; i < ln.size(); ++i) CHECK(t.apply(ln[i]) > t.apply(ln[i - 1]));
}

TEST_CASE("left skew: reflect about max + 1, and the order reverses once", "[ladder]") {
  auto x = quantiles(boost::math::exponential_distribution<double>(0.5), 80);
  for (double& v : x) v = 40.0 - v;  // left skew, max just under 40
  const double mx = x.front();       // quantiles ascend, so 40 - q descends
  const LadderAdvice a = ladder_recommend(x.data(), x.size());
  CHECK(a.skewness < -1.0);
  CHECK(a.spec.reflect);
  CHECK(a.spec.pivot == mx + 1.0);
  CHECK(a.spec.shift == 0.0);
  CHECK(a.reason.find("left skew -> reflect, then log10") != std::string::npos);
  const Transform t(a.spec);
  // pivot - max = 1, so the largest value maps to log10(1) = 0, the smallest value the most.
  CHECK(t.apply(mx) == Approx(0.0).margin(1e-15));
  CHECK(t.apply(x.back()) == Approx(std::log10(mx + 1.0 - x.back())).epsilon(1e-14));
  CHECK(t.apply(x.back()) > t.apply(x.front()));  // reflection reversed the order, once
}

TEST_CASE("a minimum at or below zero is shifted to 1", "[ladder]") {
  auto x = quantiles(boost::math::exponential_distribution<double>(1.0), 60);
  for (double& v : x) v -= 2.0;  // minimum about -1.99
  const LadderAdvice a = ladder_recommend(x.data(), x.size());
  CHECK(a.skewed);
  CHECK(a.spec.shift == 1.0 - x.front());
  CHECK(Transform(a.spec).apply(x.front()) == Approx(0.0).margin(1e-15));  // log10(1)
}

TEST_CASE("a symmetric variable needs no step", "[ladder]") {
  const auto x = quantiles(boost::math::normal_distribution<double>(5.0, 2.0), 500);
  const LadderAdvice a = ladder_recommend(x.data(), x.size());
  CHECK_FALSE(a.skewed);
  CHECK(a.by_size);
  CHECK(a.step == LadderStep::None);
  CHECK(a.spec.family == Family::Identity);
  CHECK(std::string(ladder_step_name(a.step)) == "none");
}

TEST_CASE("the ladder refuses samples without a skewness", "[ladder][errors]") {
  const double two[] = {1.0, 5.0};
  CHECK_THROWS_WITH(ladder_recommend(two, 2), Catch::Contains("at least 3 values"));
  const double flat[] = {2.0, 2.0, 2.0, 2.0};
  CHECK_THROWS_WITH(ladder_recommend(flat, 4), Catch::Contains("identical"));
  const double bad[] = {1.0, 2.0, NAN, 4.0};
  CHECK_THROWS_AS(ladder_recommend(bad, 4), IndexedError);
}
