// Moments, Shapiro-Wilk and the screen do not depend on units, down to 1e-301 and up to 1e300.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include <boost/math/distributions/lognormal.hpp>

#include "powerback/normality.hpp"
#include "powerback/screen.hpp"
#include "test_support.hpp"

using namespace powerback;

TEST_CASE("moments, W and the screen are the same in any units", "[normality][screen][scale]") {
  const std::vector<double> base = pwbtest::quantiles(boost::math::lognormal(0.0, 0.6), 60);
  const Moments m0 = sample_moments(base.data(), base.size());
  const ShapiroWilk w0 = shapiro_wilk(base.data(), base.size());
  const VariableScreen s0 = screen_variable(base.data(), base.size(), ScreenOptions());
  REQUIRE(s0.usable);
  for (double unit : {1e-301, 1e-200, 1e200, 1e300}) {
    CAPTURE(unit);
    std::vector<double> x(base);
    for (double& v : x) v *= unit;
    const Moments m = sample_moments(x.data(), x.size());
    // The sums run on exactly rescaled values; what differs is the rounding of x * unit (one ulp
    // per value, ~1e-16), well inside 1e-12.
    CHECK(m.skewness == Approx(m0.skewness).epsilon(1e-12));
    CHECK(m.kurtosis == Approx(m0.kurtosis).epsilon(1e-12));
    CHECK(m.mean / unit == Approx(m0.mean).epsilon(1e-12));
    CHECK(m.sd / unit == Approx(m0.sd).epsilon(1e-12));
    const ShapiroWilk w = shapiro_wilk(x.data(), x.size());
    CHECK(w.w == Approx(w0.w).epsilon(1e-12));
    const VariableScreen s = screen_variable(x.data(), x.size(), ScreenOptions());
    CHECK(s.usable);
    CHECK(s.note.find("identical") == std::string::npos);
    CHECK(s.moments.skewness == Approx(m0.skewness).epsilon(1e-12));
  }
  // A truly constant sample at 1e300 is still constant.
  const std::vector<double> same(10, 1e300);
  CHECK(std::isnan(sample_moments(same.data(), same.size()).skewness));
}
