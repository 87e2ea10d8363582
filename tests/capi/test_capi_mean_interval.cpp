// Intervals for the original-scale mean through the C ABI: the Cox interval, the identity
// family against predict_se, groups, the bootstrap seed, options and errors.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <cstring>
#include <vector>

#include "powerback.h"

namespace {
struct Handles {
  pwb_transform* t = nullptr;
  pwb_model* m = nullptr;
  ~Handles() {
    pwb_model_free(m);
    pwb_transform_free(t);
  }
};
const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12};
const std::vector<double> kY = {2.7, 3.1, 4.9, 5.2, 8.8, 9.1, 15.2, 14.8, 25.0, 27.5, 41.0, 39.2};
// qnorm(0.975) from base R.
constexpr double kZ975 = 1.959963984540054;

void fit(Handles& h, pwb_family f, std::size_t p) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = f;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  REQUIRE(pwb_model_fit(kY.data(), p ? kX.data() : nullptr, kY.size(), p, h.t, nullptr, &h.m) == PWB_OK);
}
}  // namespace

TEST_CASE("the normal-theory log mean of an intercept-only model is the Cox interval", "[capi][mean_interval]") {
  // Cox method for a lognormal mean (Zhou & Gao 1997, Statistics in Medicine;
  // formula from memory): ybar + s^2/2 -+ z sqrt(s^2/n + s^4/(2(n-1))) on the log scale. The
  // same arithmetic on both sides: 1e-12 relative.
  Handles h;
  fit(h, PWB_LOG, 0);
  const double n = static_cast<double>(kY.size());
  double ybar = 0, s2 = 0;
  for (double y : kY) ybar += std::log(y) / n;
  for (double y : kY) s2 += std::pow(std::log(y) - ybar, 2) / (n - 1);
  const double half = kZ975 * std::sqrt(s2 / n + s2 * s2 / (2 * (n - 1)));
  pwb_mean_interval_options o;
  pwb_mean_interval_options_init(&o);
  o.mean_method = PWB_MEAN_NORMAL;
  double fit_, se, lo, up;
  unsigned flags = 99;
  REQUIRE(pwb_model_predict_mean_interval(h.m, nullptr, 1, 0, &o, &fit_, &se, &lo, &up, &flags, 1) == PWB_OK);
  CHECK(fit_ == Approx(std::exp(ybar + s2 / 2)).epsilon(1e-12));
  CHECK(lo == Approx(std::exp(ybar + s2 / 2 - half)).epsilon(1e-12));
  CHECK(up == Approx(std::exp(ybar + s2 / 2 + half)).epsilon(1e-12));
  CHECK(flags == 0u);
}

TEST_CASE("identity family: the smearing mean's se follows from predict_se", "[capi][mean_interval]") {
  // With an identity response the smearing mean is x0'b + mean(e) = x0'b, and its delta variance
  // is sigma^2 (x0 - xbar)'(X'X)^{-1}(x0 - xbar) + var(e)/n = se_fit(x0)^2 - sigma^2/n +
  // RSS/(n (n-1)) (the intercept-model identity se_fit(x0)^2 = sigma^2/n + the centred form).
  Handles h;
  fit(h, PWB_IDENTITY, 1);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(h.m, &info) == PWB_OK);
  const double xs[3] = {2.0, 6.5, 11.0};
  double sefit[3], fit_[3], se[3], med[3];
  REQUIRE(pwb_model_predict_se(h.m, xs, 3, 1, sefit) == PWB_OK);
  REQUIRE(pwb_model_predict(h.m, xs, 3, 1, nullptr, med, nullptr, nullptr, nullptr) == PWB_OK);
  REQUIRE(pwb_model_predict_mean_interval(h.m, xs, 3, 1, nullptr, fit_, se, nullptr, nullptr, nullptr, 3) == PWB_OK);
  const double n = 12;
  for (int i = 0; i < 3; ++i) {
    CHECK(fit_[i] == Approx(med[i]).epsilon(1e-12));
    const double want = sefit[i] * sefit[i] - info.sigma * info.sigma / n + info.rss / (n * (n - 1));
    CHECK(se[i] * se[i] == Approx(want).epsilon(1e-10));
  }
}

TEST_CASE("group ids average rows; the bootstrap repeats with its seed", "[capi][mean_interval]") {
  Handles h;
  fit(h, PWB_LOG, 1);
  const double xs[4] = {2.0, 3.0, 9.0, 10.0};
  const std::size_t group[4] = {0, 0, 1, 1};
  double row_fit[4], g_fit[2], g_lo[2], g_up[2];
  REQUIRE(pwb_model_predict_mean_interval(h.m, xs, 4, 1, nullptr, row_fit, nullptr, nullptr, nullptr, nullptr, 4) == PWB_OK);
  pwb_mean_interval_options o;
  pwb_mean_interval_options_init(&o);
  CHECK(o.replicates == 999u);
  CHECK(o.seed == 1ull);
  CHECK(o.group == nullptr);
  o.group = group;
  o.n_groups = 2;
  REQUIRE(pwb_model_predict_mean_interval(h.m, xs, 4, 1, &o, g_fit, nullptr, g_lo, g_up, nullptr, 2) == PWB_OK);
  CHECK(g_fit[0] == Approx((row_fit[0] + row_fit[1]) / 2).epsilon(1e-14));
  CHECK(g_fit[1] == Approx((row_fit[2] + row_fit[3]) / 2).epsilon(1e-14));

  o.method = PWB_MEAN_INTERVAL_BOOTSTRAP;
  o.replicates = 200;
  o.seed = 77;
  double b1[2], b2[2], u1[2], u2[2];
  REQUIRE(pwb_model_predict_mean_interval(h.m, xs, 4, 1, &o, g_fit, nullptr, b1, u1, nullptr, 2) == PWB_OK);
  REQUIRE(pwb_model_predict_mean_interval(h.m, xs, 4, 1, &o, g_fit, nullptr, b2, u2, nullptr, 2) == PWB_OK);
  CHECK(std::memcmp(b1, b2, sizeof b1) == 0);
  CHECK(std::memcmp(u1, u2, sizeof u1) == 0);
  CHECK(b1[0] < g_fit[0]);
  CHECK(u1[0] > g_fit[0]);
}

TEST_CASE("mean interval errors name the problem", "[capi][mean_interval]") {
  Handles h;
  fit(h, PWB_LOG, 1);
  const double xs[2] = {2.0, 3.0};
  double f[2];
  pwb_mean_interval_options o;
  pwb_mean_interval_options_init(&o);
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 1, &o, f, nullptr, nullptr, nullptr, nullptr, 3) == PWB_ERR_ARGUMENT);
  CHECK(std::strstr(pwb_last_error(), "outputs is 3") != nullptr);
  o.method = PWB_MEAN_INTERVAL_BOOTSTRAP;
  o.replicates = 5;
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 1, &o, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
  CHECK(std::strstr(pwb_last_error(), "at least 10") != nullptr);
  pwb_mean_interval_options_init(&o);
  const int bad = 7;
  std::memcpy(&o.method, &bad, sizeof bad);
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 1, &o, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
  CHECK(std::strstr(pwb_last_error(), "unknown mean interval method 7") != nullptr);
  pwb_mean_interval_options_init(&o);
  o.struct_size = 8;
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 1, &o, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
  pwb_mean_interval_options_init(&o);
  const std::size_t group[2] = {0, 3};
  o.group = group;
  o.n_groups = 2;
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 1, &o, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
  CHECK(std::strstr(pwb_last_error(), "group id 3") != nullptr);
  CHECK(pwb_model_predict_mean_interval(nullptr, xs, 2, 1, nullptr, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_predict_mean_interval(h.m, xs, 2, 2, nullptr, f, nullptr, nullptr, nullptr, nullptr, 2) == PWB_ERR_ARGUMENT);
}
