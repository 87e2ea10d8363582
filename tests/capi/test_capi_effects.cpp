// Effects in original units through the C ABI.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
struct Handles {
  pwb_transform* t = nullptr;
  pwb_transform* px = nullptr;
  pwb_model* m = nullptr;
  ~Handles() {
    pwb_model_free(m);
    pwb_transform_free(t);
    pwb_transform_free(px);
  }
};
const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
const std::vector<double> kY = {2.7, 3.1, 4.9, 5.2, 8.8, 9.1, 15.2, 14.8, 25.0, 27.5};
// qt(0.975, 8) from base R (stats::qt), the t quantile of a 95% interval with 8 residual df.
constexpr double kT8 = 2.306004135204166;

pwb_transform* make(pwb_family f, double lambda) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = f;
  s.lambda = lambda;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&s, &t) == PWB_OK);
  return t;
}
}  // namespace

TEST_CASE("percent change and elasticity of a log model", "[capi][effects]") {
  Handles h;
  h.t = make(PWB_LOG, NAN);
  h.px = make(PWB_LOG, NAN);
  std::vector<double> lx(10);
  for (int i = 0; i < 10; ++i) lx[i] = std::log(kX[i]);
  REQUIRE(pwb_model_fit(kY.data(), lx.data(), 10, 1, h.t, nullptr, &h.m) == PWB_OK);
  double coef[2], se[2];
  REQUIRE(pwb_model_coefficients(h.m, coef, se, nullptr, 2) == PWB_OK);
  pwb_effect e;
  pwb_effect_init(&e);
  const double unit[2] = {0.0, 1.0};
  REQUIRE(pwb_model_effect_percent(h.m, unit, 2, 0.95, &e) == PWB_OK);
  // 100 (exp(b) - 1) and the exponentiated t interval b -+ t se; 1e-12: same formula.
  CHECK(e.estimate == Approx(100 * std::expm1(coef[1])).epsilon(1e-12));
  CHECK(e.lower == Approx(100 * std::expm1(coef[1] - kT8 * se[1])).epsilon(1e-12));
  CHECK(e.upper == Approx(100 * std::expm1(coef[1] + kT8 * se[1])).epsilon(1e-12));
  CHECK(std::isnan(e.median0));
  REQUIRE(pwb_model_effect_elasticity(h.m, 1, h.px, 0.95, &e) == PWB_OK);
  CHECK(e.estimate == Approx(coef[1]).epsilon(1e-14));
  CHECK(e.lower == Approx(coef[1] - kT8 * se[1]).epsilon(1e-12));
  // Bad input.
  CHECK(pwb_model_effect_percent(h.m, unit, 3, 0.95, &e) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_effect_percent(h.m, unit, 2, 1.5, &e) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_effect_elasticity(h.m, 5, h.px, 0.95, &e) == PWB_ERR_ARGUMENT);
  pwb_transform* sq = make(PWB_SQRT, NAN);
  CHECK(pwb_model_effect_elasticity(h.m, 1, sq, 0.95, &e) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("elasticity"));
  pwb_transform_free(sq);
  e.struct_size = 8;
  CHECK(pwb_model_effect_percent(h.m, unit, 2, 0.95, &e) == PWB_ERR_ARGUMENT);
}

TEST_CASE("change in the median between two rows", "[capi][effects]") {
  Handles h;
  h.t = make(PWB_BOX_COX, 0.5);
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 10, 1, h.t, nullptr, &h.m) == PWB_OK);
  double coef[2], se[2];
  REQUIRE(pwb_model_coefficients(h.m, coef, se, nullptr, 2) == PWB_OK);
  const double x0[2] = {1, 3}, x1[2] = {1, 8};
  pwb_effect e;
  pwb_effect_init(&e);
  REQUIRE(pwb_model_effect_median_change(h.m, x0, x1, 2, 0.95, &e) == PWB_OK);
  // Median (1 + z/2)^2 at z = b0 + b1 x; 1e-12: the same closed form.
  auto med = [&](double x) { const double w = 1 + 0.5 * (coef[0] + coef[1] * x); return w * w; };
  CHECK(e.median0 == Approx(med(3)).epsilon(1e-12));
  CHECK(e.estimate == Approx(med(8) - med(3)).epsilon(1e-12));
  CHECK(e.upper - e.estimate == Approx(kT8 * e.se).epsilon(1e-12));
  CHECK(e.se > 0);
  // A percent change is refused for a non-log response, with the alternative named.
  const double unit[2] = {0.0, 1.0};
  CHECK(pwb_model_effect_percent(h.m, unit, 2, 0.95, &e) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("change in the median"));
  // Identity response: the change is linear, so its se is |x1 - x0| times the slope's se.
  Handles g;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 10, 1, nullptr, nullptr, &g.m) == PWB_OK);
  REQUIRE(pwb_model_coefficients(g.m, coef, se, nullptr, 2) == PWB_OK);
  REQUIRE(pwb_model_effect_median_change(g.m, x0, x1, 2, 0.95, &e) == PWB_OK);
  CHECK(e.estimate == Approx(5 * coef[1]).epsilon(1e-12));
  CHECK(e.se == Approx(5 * se[1]).epsilon(1e-10));  // (X'X)^-1 vs the QR's se: rounding only
}
