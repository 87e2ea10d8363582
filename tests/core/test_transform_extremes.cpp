// Transforms at the edges of double precision: overflow is an error, the power family's
// log-derivative at v = 0 is a defined boundary, and the round trip keeps a stated accuracy.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/transform.hpp"
#include "test_support.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

using pwbtest::make;

TEST_CASE("finite input whose result overflows is a domain error, not Inf", "[transform][extremes]") {
  struct Case {
    Transform t;
    double x;
  };
  const std::vector<Case> cases = {
      {make(Family::BoxCox, 2.0), 1e300},                           // (1e600 - 1)/2
      {make(Family::Identity, math::kNaN, 1e308), 1e308},           // v = x + shift
      {make(Family::Identity, math::kNaN, 0.0, true, 1e308), -1e308},  // v = pivot - x
      {make(Family::YeoJohnson, 3.0), 1e200},                       // (v+1)^3
      {make(Family::Power, 2.0), -1e200},                           // -|v|^2
  };
  for (const Case& c : cases) {
    CAPTURE(c.t.describe(), c.x);
    double out = 0;
    const MapReport r = c.t.apply(&c.x, 1, &out);
    CHECK(r.n_overflow == 1);
    CHECK_FALSE(r.ok());
    CHECK(std::isnan(out));
    CHECK(std::isnan(c.t.apply(c.x)));
    try {
      c.t.apply_checked({1.0, c.x}, "flow");
      FAIL("no error");
    } catch (const IndexedError& e) {
      CHECK(e.code() == ErrorCode::Domain);
      CHECK(e.first_indices() == std::vector<std::size_t>{1});
      CHECK_THAT(e.what(), Contains("1 of 2 values of flow") && Contains("largest double") &&
                               Contains("rescale"));
    }
  }
  // The inverse overflows too: exp(1000).
  const Transform lg = make(Family::Log);
  double back = 0;
  const double z = 1000;
  CHECK(lg.invert(&z, 1, &back).n_overflow == 1);
  CHECK(std::isnan(back));
  // The largest finite results still map: Box-Cox lambda = 2 at 1e150 is 5e299. expm1 of
  // lambda log v = 690.8 carries log's rounding times 690 (about 1.5e-13 relative): 1e-12.
  CHECK(make(Family::BoxCox, 2.0).apply(1e150) == Approx(0.5e300).epsilon(1e-12));
}

TEST_CASE("the power family's log-derivative at v = 0 is the boundary -Inf", "[transform][extremes]") {
  // f(v) = sign(v)|v|^lambda: f'(0) is unbounded for lambda < 1 and zero for lambda > 1.
  for (double lambda : {0.25, 0.5, 0.999, 1.5, 3.0}) {
    CAPTURE(lambda);
    const Transform t = make(Family::Power, lambda);
    const std::vector<double> x = {2.0, 0.0, -1.0, 0.0};
    std::vector<double> d(x.size());
    const MapReport r = t.log_abs_derivative(x.data(), x.size(), d.data());
    CHECK(r.ok());
    CHECK(r.n_boundary == 2);
    CHECK(r.first_boundary == std::vector<std::size_t>{1, 3});
    CHECK(d[1] == -std::numeric_limits<double>::infinity());
    CHECK(d[0] == Approx(std::log(lambda) + (lambda - 1.0) * std::log(2.0)).epsilon(1e-14));
    CHECK(d[2] == Approx(std::log(lambda)).margin(1e-15));  // |v| = 1
    CHECK(t.log_abs_derivative(0.0) == -std::numeric_limits<double>::infinity());
  }
  // lambda = 1 is the identity: derivative 1 everywhere, also at 0 (no 0 * log 0).
  const Transform one = make(Family::Power, 1.0);
  CHECK(one.log_abs_derivative(0.0) == 0.0);
  // A zero after a shift is the same boundary.
  CHECK(make(Family::Power, 0.5, 3.0).log_abs_derivative(-3.0) == -std::numeric_limits<double>::infinity());
}

TEST_CASE("invert(apply(x)) keeps the stated relative accuracy for negative lambda", "[transform][extremes]") {
  // Relative error of the round trip ~ 2^-53 |z| / |v f'(v)|; for Box-Cox |v f'(v)| = v^lambda
  // and |z| = |v^lambda - 1| / |lambda|. The bound below allows 8 times that (rounding in
  // expm1, log1p and exp each adds an ulp or two).
  const double u = std::numeric_limits<double>::epsilon() / 2;
  for (double lambda : {-0.5, -1.0, -2.0, -3.0}) {
    const Transform t = make(Family::BoxCox, lambda);
    for (double x = 1e-3; x <= 1e7; x *= 3.7) {
      const double z = t.apply(x);
      if (1.0 + lambda * z <= 0.0) continue;  // rounded onto the limit: checked below
      CAPTURE(lambda, x, z);
      const double cond = std::fabs(z) / std::pow(x, lambda);
      const double back = t.invert(z);
      CHECK(std::fabs(back - x) <= 8.0 * u * std::max(cond, 1.0) * x);
    }
  }
  // Box-Cox lambda = -2 at x = 1e6: about 1e-4 relative is what the double z holds.
  const Transform t2 = make(Family::BoxCox, -2.0);
  CHECK(std::fabs(t2.invert(t2.apply(1e6)) / 1e6 - 1.0) < 1e-4);
  // At x = 1e9, 1 - x^-2 rounds to 1, so z is the limit 0.5 exactly: the inverse says the
  // precision is exhausted.
  const double z = t2.apply(1e9);
  CHECK(z == 0.5);
  try {
    t2.invert_checked({z}, "flow");
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK_THAT(e.what(), Contains("needs z < 0.5") && Contains("precision") && Contains("rescale"));
  }
}
