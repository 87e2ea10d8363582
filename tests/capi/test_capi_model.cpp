// The model handle through the C ABI: fit, accessors, predictions, statuses and messages.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "capi_test_support.hpp"
#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
using Handles = capitest::ModelHandles;
using capitest::kX;
using capitest::kY;
}  // namespace

TEST_CASE("a log model through the C ABI", "[capi][model]") {
  Handles h;
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = PWB_LOG;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 10, 1, h.t, nullptr, &h.m) == PWB_OK);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(h.m, &info) == PWB_OK);
  CHECK(info.n == 10);
  CHECK(info.columns == 2);
  CHECK(info.rank == 2);
  CHECK(info.df_residual == 8);
  CHECK(info.loglik_df == 3.0);
  // Jacobian of log: -sum log y.
  double sly = 0;
  for (double v : kY) sly += std::log(v);
  CHECK(info.jacobian == Approx(-sly).epsilon(1e-13));  // same sum, rounding only
  double coef[2], se[2];
  int al[2];
  REQUIRE(pwb_model_coefficients(h.m, coef, se, al, 2) == PWB_OK);
  CHECK(al[0] == 0);
  CHECK(se[1] > 0);
  CHECK(pwb_model_coefficients(h.m, coef, se, al, 3) == PWB_ERR_ARGUMENT);
  std::vector<double> r(10), lev(10);
  REQUIRE(pwb_model_vector_get(h.m, PWB_MODEL_RESIDUALS, r.data(), 10) == PWB_OK);
  REQUIRE(pwb_model_vector_get(h.m, PWB_MODEL_LEVERAGES, lev.data(), 10) == PWB_OK);
  double rss = 0, hsum = 0;
  for (int i = 0; i < 10; ++i) { rss += r[i] * r[i]; hsum += lev[i]; }
  CHECK(rss == Approx(info.rss).epsilon(1e-12));
  CHECK(hsum == Approx(2.0).epsilon(1e-12));  // trace of the hat matrix = rank
  CHECK(pwb_model_vector_get(h.m, static_cast<pwb_model_vector>(9), r.data(), 10) == PWB_ERR_ARGUMENT);

  // Predictions: median exp(mu); smearing mean = exp(mu) mean(exp(e)) (Duan 1983).
  const double xn[3] = {2.5, NAN, 12.0};
  double fit[3], lwr[3], upr[3];
  unsigned flags[3];
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  o.interval = PWB_INTERVAL_PREDICTION;
  REQUIRE(pwb_model_predict(h.m, xn, 3, 1, &o, fit, lwr, upr, flags) == PWB_OK);
  const double mu = coef[0] + coef[1] * 2.5;
  CHECK(fit[0] == Approx(std::exp(mu)).epsilon(1e-13));
  CHECK(lwr[0] < fit[0]);
  CHECK(upr[0] > fit[0]);
  CHECK(flags[1] == PWB_PRED_MISSING);
  CHECK(std::isnan(fit[1]));
  o.center = PWB_CENTER_MEAN;
  REQUIRE(pwb_model_predict(h.m, xn, 3, 1, &o, fit, nullptr, nullptr, nullptr) == PWB_OK);
  double sm = 0;
  for (double e : r) sm += std::exp(e) / 10;
  CHECK(fit[0] == Approx(std::exp(mu) * sm).epsilon(1e-13));
  o.transformed_scale = 1;
  o.center = PWB_CENTER_MEDIAN;
  REQUIRE(pwb_model_predict(h.m, xn, 3, 1, &o, fit, lwr, upr, flags) == PWB_OK);
  CHECK(fit[0] == Approx(mu).epsilon(1e-13));
  o.level = 1.5;
  CHECK(pwb_model_predict(h.m, xn, 3, 1, &o, fit, lwr, upr, flags) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("level"));
  o.level = 0.9;
  o.interval = static_cast<pwb_interval>(7);
  CHECK(pwb_model_predict(h.m, xn, 3, 1, &o, fit, lwr, upr, flags) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("unknown interval kind 7"));
  o.interval = PWB_INTERVAL_NONE;
  o.struct_size = 8;
  CHECK(pwb_model_predict(h.m, xn, 3, 1, &o, fit, lwr, upr, flags) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_predict(h.m, xn, 3, 2, nullptr, fit, lwr, upr, flags) == PWB_ERR_ARGUMENT);
}

TEST_CASE("model fit errors come back as statuses with messages", "[capi][model]") {
  Handles h;
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = PWB_LOG;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  std::vector<double> y = kY;
  y[3] = -1;
  CHECK(pwb_model_fit(y.data(), kX.data(), 10, 1, h.t, nullptr, &h.m) == PWB_ERR_DOMAIN);
  CHECK(h.m == nullptr);
  CHECK_THAT(pwb_last_error(), Contains("y"));
  std::vector<double> x = kX;
  x[2] = INFINITY;
  CHECK(pwb_model_fit(kY.data(), x.data(), 10, 1, nullptr, nullptr, &h.m) == PWB_ERR_NONFINITE);
  CHECK(pwb_model_fit(nullptr, kX.data(), 10, 1, nullptr, nullptr, &h.m) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_fit(kY.data(), kX.data(), 2, 1, nullptr, nullptr, &h.m) == PWB_ERR_SINGULAR);
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.intercept = 0;
  o.estimated_parameters = 1;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 10, 1, nullptr, &o, &h.m) == PWB_OK);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(h.m, &info) == PWB_OK);
  CHECK(info.columns == 1);
  CHECK(info.intercept == 0);
  CHECK(info.loglik_df == 3.0);  // 1 coefficient + sigma + 1 estimated parameter
  info.struct_size = 4;
  CHECK(pwb_model_get_info(h.m, &info) == PWB_ERR_ARGUMENT);
  pwb_model_free(nullptr);
}
