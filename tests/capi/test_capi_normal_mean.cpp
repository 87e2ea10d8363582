// The normal-theory mean through the C ABI: the truncated normal, its cut mass per row, and
// the struct_size rule for the appended tail_mass field.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <vector>

#include "capi_test_support.hpp"
#include "powerback.h"

namespace {
using Handles = capitest::ModelHandles;
using capitest::kX;
using capitest::kY;
double Phi(double u) { return 0.5 * std::erfc(-u / std::sqrt(2.0)); }

void fit(Handles& h, pwb_family f, double lambda) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = f;
  s.lambda = lambda;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 10, 1, h.t, nullptr, &h.m) == PWB_OK);
}
}  // namespace

TEST_CASE("tail_mass gives the normal mass beyond the inverse's limit", "[capi][model]") {
  Handles h;
  fit(h, PWB_BOX_COX, 0.5);  // limit z = -2 (y = 0)
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(h.m, &info) == PWB_OK);
  double coef[2];
  REQUIRE(pwb_model_coefficients(h.m, coef, nullptr, nullptr, 2) == PWB_OK);
  // Rows whose fit sits at, near and far from the limit (x chosen on the transformed scale).
  const double xs[4] = {(-2.0 - coef[0]) / coef[1], (-1.0 - coef[0]) / coef[1], 5.0, NAN};
  double fit_[4], tail[4];
  unsigned flags[4];
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  CHECK(o.tail_mass == nullptr);
  o.center = PWB_CENTER_MEAN;
  o.mean_method = PWB_MEAN_NORMAL;
  o.tail_mass = tail;
  REQUIRE(pwb_model_predict(h.m, xs, 4, 1, &o, fit_, nullptr, nullptr, flags) == PWB_OK);
  for (int i = 0; i < 3; ++i) {
    const double mu = coef[0] + coef[1] * xs[i];
    // P(Z < -2), Z ~ N(mu, sigma^2); tolerance 1e-12: the same normal probability, computed
    // by erfc here and by Boost in the library.
    CHECK(tail[i] == Approx(Phi((-2.0 - mu) / info.sigma)).epsilon(1e-12));
    CHECK(std::isfinite(fit_[i]));
    CHECK(fit_[i] > 0);
  }
  CHECK(tail[0] == Approx(0.5).epsilon(1e-12));
  CHECK(std::isnan(tail[3]));
  CHECK(flags[3] == PWB_PRED_MISSING);
  // Not the normal-theory mean: NaN tail masses.
  o.mean_method = PWB_MEAN_SMEARING;
  REQUIRE(pwb_model_predict(h.m, xs, 4, 1, &o, fit_, nullptr, nullptr, nullptr) == PWB_OK);
  CHECK(std::isnan(tail[2]));
  // A caller built before tail_mass existed: struct_size ends before it, nothing is written.
  o.mean_method = PWB_MEAN_NORMAL;
  o.struct_size = offsetof(pwb_predict_options, tail_mass);
  tail[2] = -7.0;
  REQUIRE(pwb_model_predict(h.m, xs, 4, 1, &o, fit_, nullptr, nullptr, nullptr) == PWB_OK);
  CHECK(tail[2] == -7.0);
  o.struct_size = offsetof(pwb_predict_options, tail_mass) - 1;
  CHECK(pwb_model_predict(h.m, xs, 4, 1, &o, fit_, nullptr, nullptr, nullptr) == PWB_ERR_ARGUMENT);
}

TEST_CASE("the normal-theory mean is infinite where the integral diverges", "[capi][model]") {
  Handles h;
  fit(h, PWB_RECIPROCAL, NAN);  // y = -1/z grows like 1/distance at z = 0
  const double xs[1] = {5.0};
  double fit_[1], tail[1];
  unsigned flags[1];
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  o.center = PWB_CENTER_MEAN;
  o.mean_method = PWB_MEAN_NORMAL;
  o.tail_mass = tail;
  REQUIRE(pwb_model_predict(h.m, xs, 1, 1, &o, fit_, nullptr, nullptr, flags) == PWB_OK);
  CHECK(std::isinf(fit_[0]));
  CHECK(fit_[0] > 0);
  CHECK((flags[0] & PWB_PRED_BOUNDED) != 0);
  CHECK(tail[0] >= 0.0);
  CHECK(tail[0] < 1e-3);  // the fit lies over 4 sigma inside the range; the mean is still Inf
}
