// The screen of one variable: moments, Shapiro-Wilk before and after, ladder and ML alternative.
#include <catch2/catch.hpp>

#include <boost/math/distributions/gamma.hpp>
#include <boost/math/distributions/lognormal.hpp>
#include <cmath>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/screen.hpp"
#include "test_support.hpp"

using namespace powerback;

namespace {

using pwbtest::quantiles;

std::vector<double> mapped(const TransformSpec& s, const std::vector<double>& x) {
  std::vector<double> z(x.size());
  Transform(s).apply(x.data(), x.size(), z.data());
  return z;
}

}  // namespace

TEST_CASE("screen of a lognormal sample: ladder and Box-Cox with the figures after each",
          "[screen]") {
  // Lognormal quantiles are exactly normal quantiles after a log, so the ML power is near 0
  // and its convenient value is 0 (the log). The figures after each transform must equal the
  // statistics of the transformed values computed directly (1e-12: the same arithmetic).
  const auto x = quantiles(boost::math::lognormal_distribution<double>(1.0, 0.6), 120);
  const VariableScreen s = screen_variable(x.data(), x.size());
  REQUIRE(s.usable);
  CHECK(s.note.empty());
  CHECK(s.n == 120);
  CHECK(s.moments.skewness > 1.0);
  CHECK(s.sw.computed);
  CHECK(s.sw.p_value < 1e-3);

  CHECK(s.ladder.step == LadderStep::Log10);
  const auto zl = mapped(s.ladder.spec, x);
  CHECK(s.after_ladder.skewness == Approx(sample_moments(zl.data(), zl.size()).skewness).margin(1e-12));
  CHECK(s.after_ladder.sw.w == Approx(shapiro_wilk(zl.data(), zl.size()).w).margin(1e-12));

  REQUIRE(s.ml_done);
  CHECK(s.ml.family == Family::BoxCox);
  CHECK(std::fabs(s.ml.lambda) < 0.05);  // near 0; the quantile grid is not exactly normal in W
  CHECK(s.ml.conf_low < 0.0);
  CHECK(s.ml.conf_high > 0.0);
  CHECK(s.ml.convenient == 0.0);
  CHECK(s.ml_spec.family == Family::BoxCox);
  CHECK(s.ml_spec.lambda == 0.0);
  // The ML figures are estimate_lambda's own.
  const LambdaEstimate direct = estimate_lambda(x.data(), x.size(), Family::BoxCox);
  CHECK(s.ml.lambda == direct.lambda);
  CHECK(s.ml.conf_high == direct.conf_high);
  const auto zm = mapped(s.ml_spec, x);
  CHECK(s.after_ml.sw.p_value == Approx(shapiro_wilk(zm.data(), zm.size()).p_value).margin(1e-12));
  CHECK(std::fabs(s.after_ml.skewness) < 0.05);  // log of lognormal quantiles is symmetric
  CHECK(s.after_ml.sw.w > 0.99);
}

TEST_CASE("screen uses Yeo-Johnson when some value is not positive", "[screen]") {
  auto x = quantiles(boost::math::gamma_distribution<double>(2.0, 3.0), 90);
  for (double& v : x) v -= 3.0;  // some negative values
  const VariableScreen s = screen_variable(x.data(), x.size());
  REQUIRE(s.ml_done);
  CHECK(s.ml.family == Family::YeoJohnson);
  CHECK(s.ml_spec.family == Family::YeoJohnson);
  CHECK(s.ladder.spec.shift == 1.0 - x.front());
  CHECK(std::fabs(s.after_ml.skewness) < std::fabs(s.moments.skewness));
}

TEST_CASE("screen options reach the lambda search", "[screen]") {
  // A search range that excludes lambda-hat puts the estimate at a bound, which is flagged.
  const auto x = quantiles(boost::math::lognormal_distribution<double>(0.0, 0.8), 60);
  ScreenOptions o;
  o.lower = 0.5;
  o.upper = 2.0;
  o.level = 0.9;
  const VariableScreen s = screen_variable(x.data(), x.size(), o);
  REQUIRE(s.ml_done);
  CHECK(s.ml.at_bound);
  CHECK(s.ml.lambda == Approx(0.5).margin(1e-3));
  CHECK(s.ml.level == 0.9);
}

TEST_CASE("screen reports what it cannot do instead of failing", "[screen]") {
  const double two[] = {1.0, 3.0};
  const VariableScreen a = screen_variable(two, 2);
  CHECK_FALSE(a.usable);
  CHECK(a.note.find("fewer than 3") != std::string::npos);
  const double flat[] = {5.0, 5.0, 5.0, 5.0, 5.0};
  const VariableScreen b = screen_variable(flat, 5);
  CHECK_FALSE(b.usable);
  CHECK(b.note.find("identical") != std::string::npos);
  CHECK(b.moments.sd == 0.0);
  // Beyond 5000 values: moments and both transforms, Shapiro-Wilk skipped with its note.
  const auto big = quantiles(boost::math::gamma_distribution<double>(1.5, 1.0), 6000);
  const VariableScreen c = screen_variable(big.data(), big.size());
  REQUIRE(c.usable);
  CHECK_FALSE(c.sw.computed);
  CHECK(c.sw.skip == NormalitySkip::TooMany);
  CHECK_FALSE(c.after_ladder.sw.computed);
  CHECK(std::isfinite(c.after_ladder.skewness));
  CHECK(c.ml_done);
}

TEST_CASE("screen rejects non-finite values and bad options", "[screen][errors]") {
  const double x[] = {1.0, 2.0, INFINITY, 4.0, 7.0};
  CHECK_THROWS_AS(screen_variable(x, 5), IndexedError);
  const double ok[] = {1.0, 2.0, 3.0, 4.0, 9.0};
  ScreenOptions o;
  o.level = 1.0;
  CHECK_THROWS_WITH(screen_variable(ok, 5, o), Catch::Contains("level"));
  o.level = 0.95;
  o.lower = 2.0;
  o.upper = 1.0;
  CHECK_THROWS_WITH(screen_variable(ok, 5, o), Catch::Contains("lower < upper"));
}
