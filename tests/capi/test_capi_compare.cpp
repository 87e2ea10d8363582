// The comparison tools through the C ABI: folds and scores.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_cv_folds and pwb_holdout_score", "[capi_compare]") {
  std::vector<int> f(20);
  REQUIRE(pwb_cv_folds(10, 3, 2, 7ull, f.data()) == PWB_OK);
  for (int v : f) CHECK((v >= 1 && v <= 3));
  CHECK(pwb_cv_folds(2, 3, 1, 7ull, f.data()) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("fewer rows"));
  const double y[] = {1, 2, 3}, fit[] = {1, 2, 5};
  pwb_holdout_scores s;
  s.struct_size = sizeof s;
  REQUIRE(pwb_holdout_score(y, fit, nullptr, nullptr, 3, &s) == PWB_OK);
  // errors 0, 0, -2: RMSE sqrt(4/3), SST 2, R^2 = 1 - 4/2 = -1 (hand arithmetic)
  CHECK(s.rmse == Approx(std::sqrt(4.0 / 3)).epsilon(1e-15));
  CHECK(s.r2 == Approx(-1.0).epsilon(1e-15));
  CHECK(std::isnan(s.coverage));
}
