// The square root's domain is v >= 0: zero maps to zero and back, negatives are refused.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/transform.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

TEST_CASE("sqrt accepts zero and refuses negative values", "[families][sqrt]") {
  TransformSpec s;
  s.family = Family::Sqrt;
  const Transform t(s);
  CHECK(t.apply(0.0) == 0.0);
  CHECK(t.invert(0.0) == 0.0);
  CHECK(t.apply(4.0) == 2.0);
  CHECK(std::isnan(t.apply(-1e-300)));
  CHECK_THROWS_WITH(t.apply_checked({1.0, -2.0}, "count"),
                    Contains("needs v >= 0") && Contains("index 1") && Contains(">= 0"));
  // with a shift of 2, v = x + 2: x = -2 gives v = 0, inside the domain
  s.shift = 2.0;
  const Transform shifted(s);
  CHECK(shifted.apply(-2.0) == 0.0);
  CHECK(std::isnan(shifted.apply(-2.5)));
}

TEST_CASE("log and reciprocal keep v > 0", "[families][sqrt]") {
  for (Family f : {Family::Log, Family::Log10, Family::Reciprocal}) {
    TransformSpec s;
    s.family = f;
    const Transform t(s);
    CHECK(std::isnan(t.apply(0.0)));
  }
}
