// powerback::maximise_profile: interior maxima, maxima at a range end, and the end check.
#include <catch2/catch.hpp>

#include <cmath>

#include "powerback/lambda_maximise.hpp"

using namespace powerback;

TEST_CASE("an interior maximum is found to Brent's tolerance", "[lambda_maximise]") {
  int calls = 0;
  const ProfileMaximum m = maximise_profile(
      [&](double l) {
        ++calls;
        return -3.0 * (l - 0.37) * (l - 0.37) + 5.0;
      },
      -3.0, 3.0);
  // half the mantissa: ~1.5e-8 relative; 1e-7 leaves room
  CHECK(m.lambda == Approx(0.37).margin(1e-7));
  CHECK(m.loglik == Approx(5.0).epsilon(1e-12));
  CHECK_FALSE(m.at_bound);
  CHECK(m.converged);
  CHECK(calls < 100);
}

TEST_CASE("a maximum beyond a range end is that end, flagged", "[lambda_maximise]") {
  const auto rising = [](double l) { return 2.0 * l; };
  const ProfileMaximum up = maximise_profile(rising, -1.0, 0.5);
  CHECK(up.lambda == 0.5);  // the end itself is evaluated and kept
  CHECK(up.loglik == 1.0);
  CHECK(up.at_bound);
  const ProfileMaximum down = maximise_profile([](double l) { return -l; }, -2.0, 2.0);
  CHECK(down.lambda == -2.0);
  CHECK(down.at_bound);
}
