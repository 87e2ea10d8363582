// Normality statistics of the core: Shapiro-Wilk W and p, sample skewness and kurtosis.
#include <catch2/catch.hpp>

#include "test_support.hpp"

#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include "fixture_csv.hpp"
#include "powerback/errors.hpp"
#include "powerback/normality.hpp"

using namespace powerback;

namespace {

using pwbtest::parse_values;

}  // namespace

TEST_CASE("Shapiro-Wilk W and p equal R's shapiro.test", "[normality][external]") {
  // Source: base R stats::shapiro.test on the samples of tests/fixtures/r_shapiro.csv, made by
  // tests/fixtures/make_r_shapiro.R (n = 3 with and without ties, 4, 5, 6, 7 with ties, the
  // 11/12 switch of the p-value approximation, 20, 25 with ties, 40, 150, 400, 5000).
  // Tolerance: 1e-6 absolute on W and p (the brief's figure); both sides evaluate the same
  // published approximation, so agreement is far closer in practice (checked below at 1e-9).
  const auto rows = pwbtest::read_csv("r_shapiro.csv");
  REQUIRE(rows.size() == 17);
  for (const auto& r : rows) {
    const std::vector<double> x = parse_values(r[4]);
    REQUIRE(x.size() == std::stoul(r[1]));
    const ShapiroWilk sw = shapiro_wilk(x.data(), x.size());
    INFO(r[0]);
    REQUIRE(sw.computed);
    CHECK(sw.n == x.size());
    CHECK(sw.w == Approx(std::stod(r[2])).margin(1e-6).epsilon(0));
    CHECK(sw.p_value == Approx(std::stod(r[3])).margin(1e-6).epsilon(0));
    // Tighter: the same formulas in double precision differ only by rounding (1e-9 leaves room
    // for the normal quantiles of two libraries).
    CHECK(sw.w == Approx(std::stod(r[2])).margin(1e-9).epsilon(0));
    CHECK(sw.p_value == Approx(std::stod(r[3])).margin(1e-9).epsilon(1e-7));
  }
}

TEST_CASE("Shapiro-Wilk is invariant to order and to location and scale", "[normality]") {
  // W is a squared correlation of the ordered sample with fixed coefficients: sorting,
  // shifting and positive rescaling leave it unchanged. Tolerance 1e-12: rounding of the
  // centred sums only.
  const std::vector<double> x = {3.1, 0.4, 2.2, 9.7, 1.5, 4.4, 0.9, 2.8, 6.1, 1.1, 3.3, 2.0, 5.5};
  std::vector<double> y;
  for (std::size_t i = x.size(); i-- > 0;) y.push_back(1e6 + 250.0 * x[i]);
  const ShapiroWilk a = shapiro_wilk(x.data(), x.size());
  const ShapiroWilk b = shapiro_wilk(y.data(), y.size());
  REQUIRE(a.computed);
  CHECK(b.w == Approx(a.w).margin(1e-12).epsilon(0));
  CHECK(b.p_value == Approx(a.p_value).margin(1e-12).epsilon(0));
}

TEST_CASE("Shapiro-Wilk for n = 3 follows the exact distribution", "[normality]") {
  // For n = 3, W >= 3/4 and P(W <= w) = (6/pi)(asin(sqrt(w)) - asin(sqrt(3/4))) (Royston 1995).
  // Equally spaced values give W = 1 (p = 1); a pair of ties gives the minimum W = 3/4 (p = 0).
  // Tolerance 1e-14: closed-form arithmetic only.
  const double spaced[] = {1.0, 2.0, 3.0};
  const ShapiroWilk s = shapiro_wilk(spaced, 3);
  CHECK(s.w == Approx(1.0).margin(1e-14));
  CHECK(s.p_value == Approx(1.0).margin(1e-14));
  const double tie[] = {4.0, 4.0, 7.0};
  const ShapiroWilk t = shapiro_wilk(tie, 3);
  CHECK(t.w == Approx(0.75).margin(1e-14));
  CHECK(t.p_value == Approx(0.0).margin(1e-14));
}

TEST_CASE("Shapiro-Wilk outside 3..5000 values or on a constant sample is skipped with a note",
          "[normality]") {
  const double two[] = {1.0, 2.0};
  const ShapiroWilk a = shapiro_wilk(two, 2);
  CHECK_FALSE(a.computed);
  CHECK(a.skip == NormalitySkip::TooFew);
  CHECK(std::isnan(a.w));
  CHECK(std::isnan(a.p_value));
  CHECK(a.note.find("fewer than 3") != std::string::npos);

  std::vector<double> big(5001);
  for (std::size_t i = 0; i < big.size(); ++i) big[i] = std::sin(0.37 * i);
  const ShapiroWilk b = shapiro_wilk(big.data(), big.size());
  CHECK_FALSE(b.computed);
  CHECK(b.n == 5001);
  CHECK(b.skip == NormalitySkip::TooMany);
  CHECK(b.note.find("5000") != std::string::npos);
  // One fewer value is inside the range and computed.
  CHECK(shapiro_wilk(big.data(), 5000).computed);

  const std::vector<double> flat(10, 2.5);
  const ShapiroWilk c = shapiro_wilk(flat.data(), flat.size());
  CHECK_FALSE(c.computed);
  CHECK(c.skip == NormalitySkip::Constant);
  CHECK(c.note.find("identical") != std::string::npos);
}

TEST_CASE("Normality statistics name non-finite elements", "[normality][errors]") {
  const double x[] = {1.0, NAN, 2.0, INFINITY, 3.0};
  try {
    shapiro_wilk(x, 5);
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK(e.count() == 2);
    CHECK(e.first_indices() == std::vector<std::size_t>{1, 3});
    CHECK(std::string(e.what()).find("remove missing values") != std::string::npos);
  }
  CHECK_THROWS_AS(sample_moments(x, 5), IndexedError);
}

TEST_CASE("Skewness G1 and kurtosis G2 equal scipy.stats with bias=False", "[normality][external]") {
  // Source: scipy.stats.skew(x, bias=False) and scipy.stats.kurtosis(x, bias=False) on the
  // samples of tests/fixtures/scipy_moments.csv, made by tests/fixtures/make_scipy_moments.py
  // (including a sample with mean 1e6 and unit spread). The same script also stores the two
  // estimators computed with exact rational central moments (Python fractions).
  // Tolerance against scipy: 1e-6 relative plus 1e-12 absolute, because on the offset sample
  // scipy's own rounding of the mean leaves about 4e-7 relative error in G1 (the exact value
  // settles it: -0.000998672844, which we match). Against the exact values: 1e-12 relative, except
  // 5e-8 on the offset sample, where every deviation from a mean of 1e6 carries up to 1e-10 of
  // rounding (the ulp of 1e6) and a G1 near zero turns that into about 1e-8 relative.
  const auto rows = pwbtest::read_csv("scipy_moments.csv");
  REQUIRE(rows.size() == 9);
  for (const auto& r : rows) {
    const std::vector<double> x = parse_values(r[6]);
    REQUIRE(x.size() == std::stoul(r[1]));
    const Moments m = sample_moments(x.data(), x.size());
    INFO(r[0]);
    CHECK(m.n == x.size());
    CHECK(m.skewness == Approx(std::stod(r[2])).epsilon(1e-6).margin(1e-12));
    CHECK(m.kurtosis == Approx(std::stod(r[3])).epsilon(1e-6).margin(1e-12));
    const double rel = r[0] == "n2000_offset" ? 5e-8 : 1e-12;
    CHECK(m.skewness == Approx(std::stod(r[4])).epsilon(rel));
    CHECK(m.kurtosis == Approx(std::stod(r[5])).epsilon(rel));
  }
}

TEST_CASE("Standard errors of G1 and G2 follow their formulas", "[normality]") {
  // SE(G1) = sqrt(6n(n-1)/((n-2)(n+1)(n+3))), SE(G2) = sqrt(24n(n-1)^2/((n-3)(n-2)(n+3)(n+5)))
  // (Joanes & Gill 1998). At n = 10: SE(G1) = sqrt(540/1144) = 0.6870 and
  // SE(G2) = sqrt(19440/10920) = 1.3342. Tolerance 1e-12 relative: arithmetic only.
  const double x[] = {1, 2, 2, 3, 3, 3, 4, 4, 5, 9};
  const Moments m = sample_moments(x, 10);
  CHECK(m.skewness_se == Approx(std::sqrt(540.0 / 1144.0)).epsilon(1e-12));
  CHECK(m.kurtosis_se == Approx(std::sqrt(19440.0 / 10920.0)).epsilon(1e-12));
  CHECK(m.skewness_z == Approx(m.skewness / m.skewness_se).epsilon(1e-12));
  CHECK(m.kurtosis_z == Approx(m.kurtosis / m.kurtosis_se).epsilon(1e-12));
  CHECK(m.mean == Approx(3.6).epsilon(1e-12));
  CHECK(m.skewness > 1.0);  // one long right tail (9 against a bulk at 1..5)
}

TEST_CASE("Moments of tiny or constant samples are NaN where undefined", "[normality]") {
  const double three[] = {1.0, 2.0, 6.0};
  const Moments a = sample_moments(three, 3);
  CHECK(std::isfinite(a.skewness));
  CHECK(std::isnan(a.kurtosis));  // G2 needs n >= 4
  const double flat[] = {7.0, 7.0, 7.0, 7.0, 7.0};
  const Moments b = sample_moments(flat, 5);
  CHECK(b.sd == 0.0);
  CHECK(std::isnan(b.skewness));
  CHECK(std::isnan(b.kurtosis));
  CHECK(std::isnan(sample_moments(nullptr, 0).mean));
}
