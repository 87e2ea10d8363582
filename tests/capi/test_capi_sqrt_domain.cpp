// The square root through the C ABI: zero is inside its domain.
#include <catch2/catch.hpp>

#include <cmath>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_transform_apply: sqrt maps 0 to 0 and refuses negatives", "[capi_transform][sqrt]") {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = PWB_SQRT;
  pwb_transform *t = nullptr;
  REQUIRE(pwb_transform_new(&s, &t) == PWB_OK);
  const double x[] = {0.0, 9.0};
  double z[2] = {NAN, NAN};
  CHECK(pwb_transform_apply(t, x, 2, z) == PWB_OK);
  CHECK(z[0] == 0.0);
  CHECK(z[1] == 3.0);
  const double bad[] = {4.0, -1.0};
  CHECK(pwb_transform_apply(t, bad, 2, z) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("v >= 0"));
  CHECK(std::isnan(z[1]));
  pwb_transform_free(t);
}
