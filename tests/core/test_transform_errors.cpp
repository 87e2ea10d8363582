// Bad input to transforms: every case is a clear error and nothing is silently changed.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/transform.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {
TransformSpec spec(Family f, double lambda = math::kNaN) {
  TransformSpec s;
  s.family = f;
  s.lambda = lambda;
  return s;
}
}  // namespace

TEST_CASE("values outside the domain name their count and indices and a remedy", "[errors]") {
  const Transform bc(spec(Family::BoxCox, 0.5));
  std::vector<double> x = {1, 2, 0, 4, -1, 5, -3};
  std::vector<double> out(x.size(), 123.0);
  const MapReport r = bc.apply(x.data(), x.size(), out.data());
  CHECK(r.n_outside == 3);
  CHECK(r.first_outside == std::vector<std::size_t>{2, 4, 6});
  CHECK(std::isnan(out[2]));
  CHECK(std::isnan(out[4]));
  CHECK(out[3] == Approx(2.0));  // good elements are still written
  try {
    bc.apply_checked(x, "flow");
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(e.count() == 3);
    CHECK_THAT(e.what(), Contains("box-cox needs v > 0") && Contains("3 of 7 values of flow") &&
                             Contains("2, 4, 6") && Contains("yeo-johnson"));
  }
}

TEST_CASE("positive families reject v <= 0 after the shift and logit needs 0 < v < 1", "[errors]") {
  for (Family f : {Family::BoxCox, Family::Log, Family::Log10, Family::Reciprocal}) {
    TransformSpec s = spec(f, 1.0);
    s.shift = 2.0;
    const Transform t(s);
    CHECK(!std::isnan(t.apply(-1.5)));  // v = 0.5
    CHECK(std::isnan(t.apply(-2.0)));   // v = 0
    CHECK_THROWS_AS(t.apply_checked({-3.0}, "x"), IndexedError);
  }
  const Transform lg(spec(Family::Logit));
  CHECK(std::isnan(lg.apply(0.0)));
  CHECK(std::isnan(lg.apply(1.0)));
  CHECK_THROWS_WITH(lg.apply_checked({0.2, 1.0}, "share"), Contains("0 < v < 1") && Contains("index 1"));
  const Transform pw(spec(Family::Power, -1.0));
  CHECK(std::isnan(pw.apply(-2.0)));
}

TEST_CASE("non-finite inputs are reported before domain errors", "[errors]") {
  const Transform lg(spec(Family::Log));
  const std::vector<double> x = {1.0, NAN, -2.0, INFINITY};
  try {
    lg.apply_checked(x, "x");
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK(e.first_indices() == std::vector<std::size_t>{1, 3});
  }
}

TEST_CASE("inverses outside the range are errors", "[errors]") {
  const Transform bc(spec(Family::BoxCox, 0.5));  // needs 1 + 0.5 z > 0, z > -2
  CHECK(std::isnan(bc.invert(-2.0)));
  CHECK(bc.invert(-1.999) > 0);
  CHECK_THROWS_WITH(bc.invert_checked({0.0, -3.0}, "z"), Contains("needs z > -2"));
  CHECK(std::isnan(Transform(spec(Family::BoxCox, -0.5)).invert(2.0)));  // z < 2
  CHECK(std::isnan(Transform(spec(Family::YeoJohnson, -1.0)).invert(1.0)));  // z < 1
  CHECK(std::isnan(Transform(spec(Family::YeoJohnson, 3.0)).invert(-1.0)));  // z > -1
  CHECK(std::isnan(Transform(spec(Family::Reciprocal)).invert(0.5)));
  CHECK(std::isnan(Transform(spec(Family::Sqrt)).invert(-0.5)));
}

TEST_CASE("invalid specs are argument errors", "[errors]") {
  CHECK_THROWS_WITH(Transform(spec(Family::BoxCox)), Contains("finite lambda"));
  CHECK_THROWS_WITH(Transform(spec(Family::YeoJohnson, INFINITY)), Contains("finite lambda"));
  CHECK_THROWS_WITH(Transform(spec(Family::Power, 0.0)), Contains("lambda != 0"));
  TransformSpec s = spec(Family::Log);
  s.shift = NAN;
  CHECK_THROWS_WITH(Transform(s), Contains("shift"));
  s = spec(Family::Log);
  s.reflect = true;
  CHECK_THROWS_WITH(Transform(s), Contains("pivot"));
  s.family = static_cast<Family>(42);
  CHECK_THROWS_WITH(Transform(s), Contains("unknown family"));
  CHECK_THROWS_WITH(family_from_name("boxcox"), Contains("box-cox"));
  // unused constants are normalised to NaN
  s = spec(Family::Log, 3.0);
  s.pivot = 7.0;
  const Transform t(s);
  CHECK(std::isnan(t.spec().lambda));
  CHECK(std::isnan(t.spec().pivot));
}
