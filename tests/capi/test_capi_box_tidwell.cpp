// Box-Tidwell powers through the C ABI: both entry points, the advice, weights, errors.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_box_tidwell fills the caller's buffers and history", "[capi_box_tidwell]") {
  std::mt19937 gen(21);
  std::uniform_real_distribution<double> u(0.5, 5);
  std::normal_distribution<double> nd;
  const size_t n = 200;
  std::vector<double> y(n), x(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = u(gen);
    y[i] = 3 + 2 * std::log(x[i]) + 0.2 * nd(gen);
  }
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  CHECK(opt.max_iter == 50);
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  double alpha = NAN, se = NAN, t = NAN, p = NAN;
  std::vector<double> hist(static_cast<size_t>(opt.max_iter) + 1);
  REQUIRE(pwb_box_tidwell(y.data(), nullptr, n, 0, x.data(), 1, &opt, &alpha, &se, &t, &p,
                          hist.data(), &res) == PWB_OK);
  CHECK(res.converged == 1);
  CHECK(res.n == n);
  // simulated from log x, the limit of the power family at 0: 2 SE is a ~95% band
  CHECK(std::fabs(alpha) < 2 * se);
  CHECK(p < 1e-6);  // strong curvature in x: power 1 is rejected
  CHECK(hist[0] == 1.0);
  CHECK(hist[static_cast<size_t>(res.iterations)] == alpha);
  CHECK(std::isnan(hist.back()));
}

TEST_CASE("pwb_box_tidwell rejects bad input with a message", "[capi_box_tidwell]") {
  std::vector<double> y = {1, 2, 3, 4, 5, 6}, x = {1, -2, 3, 4, 5, 6};
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  double a, s;
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, x.data(), 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("must be > 0") && Contains("rows 1"));
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, nullptr, 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_ARGUMENT);
  res.struct_size = 1;
  x[1] = 2;
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, x.data(), 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("struct_size"));
}

namespace {
// y = 3 + 2 log x + e: the power of x is 0 (the log), far from 1
void log_data(size_t n, unsigned seed, std::vector<double>& y, std::vector<double>& x) {
  std::mt19937 gen(seed);
  std::uniform_real_distribution<double> u(0.5, 5);
  std::normal_distribution<double> nd;
  y.resize(n);
  x.resize(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = u(gen);
    y[i] = 3 + 2 * std::log(x[i]) + 0.2 * nd(gen);
  }
}
struct Out {
  double alpha = NAN, se = NAN, lo = NAN, hi = NAN, t = NAN, p = NAN, sugg = NAN;
  int advice = -1;
  pwb_box_tidwell_result res;
  Out() {
    res.struct_size = sizeof res;
    res.alpha = &alpha;
    res.se = &se;
    res.conf_low = &lo;
    res.conf_high = &hi;
    res.score_t = &t;
    res.score_p = &p;
    res.advice = &advice;
    res.suggested = &sugg;
    res.history = nullptr;
  }
};
}  // namespace

TEST_CASE("pwb_box_tidwell_fit fills the result's buffers: interval and advice",
          "[capi_box_tidwell]") {
  std::vector<double> y, x;
  log_data(200, 21u, y, x);
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  CHECK(opt.level == 0.95);
  CHECK(opt.weights == nullptr);
  Out o;
  REQUIRE(pwb_box_tidwell_fit(y.data(), nullptr, y.size(), 0, x.data(), 1, &opt, &o.res) == PWB_OK);
  // the same numbers as the 0.1 entry point
  double a0 = NAN, s0 = NAN;
  pwb_box_tidwell_result r0;
  r0.struct_size = sizeof r0;
  REQUIRE(pwb_box_tidwell(y.data(), nullptr, y.size(), 0, x.data(), 1, &opt, &a0, &s0, nullptr,
                          nullptr, nullptr, &r0) == PWB_OK);
  CHECK(o.alpha == a0);
  CHECK(o.se == s0);
  // Wald interval: z = 1.959964 (normal quantile 0.975, from memory to 7 digits)
  CHECK(o.hi - o.alpha == Approx(1.959964 * o.se).epsilon(1e-6));
  CHECK(o.alpha - o.lo == Approx(1.959964 * o.se).epsilon(1e-6));
  // simulated from log x: the interval holds 0 and not 1, the score test rejects: the log
  REQUIRE(o.lo < 0.0);
  REQUIRE(o.hi > 0.0);
  CHECK(o.p < 1e-6);
  CHECK(o.advice == PWB_BT_LOG);
  CHECK(o.sugg == 0.0);
  // a 90% interval is narrower (z = 1.644854, from memory)
  opt.level = 0.9;
  Out o90;
  REQUIRE(pwb_box_tidwell_fit(y.data(), nullptr, y.size(), 0, x.data(), 1, &opt, &o90.res) == PWB_OK);
  CHECK(o90.hi - o90.alpha == Approx(1.644854 * o90.se).epsilon(1e-6));
}

TEST_CASE("pwb_box_tidwell_fit reads a 0.1 options struct with the defaults for new fields",
          "[capi_box_tidwell]") {
  std::vector<double> y, x;
  log_data(100, 3u, y, x);
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  opt.level = 0.5;          // beyond the declared size: must not be read
  opt.weights = y.data();   // likewise
  opt.struct_size = offsetof(pwb_box_tidwell_options, level);
  Out a, b;
  REQUIRE(pwb_box_tidwell_fit(y.data(), nullptr, y.size(), 0, x.data(), 1, &opt, &a.res) == PWB_OK);
  REQUIRE(pwb_box_tidwell_fit(y.data(), nullptr, y.size(), 0, x.data(), 1, nullptr, &b.res) == PWB_OK);
  CHECK(a.alpha == b.alpha);
  CHECK(a.hi == b.hi);  // level 0.95, not 0.5
  opt.struct_size = offsetof(pwb_box_tidwell_options, level) - 1;
  CHECK(pwb_box_tidwell_fit(y.data(), nullptr, y.size(), 0, x.data(), 1, &opt, &a.res) ==
        PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("struct_size"));
}

TEST_CASE("pwb_box_tidwell_fit with weights: a zero weight drops its row, negatives are named",
          "[capi_box_tidwell]") {
  std::vector<double> y, x;
  log_data(60, 9u, y, x);
  std::vector<double> w(60, 1.0);
  w[4] = 0.0;
  x[4] = -3.0;  // outside the domain, but its row is not used
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  opt.weights = w.data();
  Out a;
  REQUIRE(pwb_box_tidwell_fit(y.data(), nullptr, 60, 0, x.data(), 1, &opt, &a.res) == PWB_OK);
  CHECK(a.res.n == 59);
  std::vector<double> y4 = y, x4 = x;
  y4.erase(y4.begin() + 4);
  x4.erase(x4.begin() + 4);
  Out b;
  REQUIRE(pwb_box_tidwell_fit(y4.data(), nullptr, 59, 0, x4.data(), 1, nullptr, &b.res) == PWB_OK);
  // the same 59 rows in the same order: rounding only
  CHECK(a.alpha == Approx(b.alpha).epsilon(1e-12));
  CHECK(a.se == Approx(b.se).epsilon(1e-12));
  w[9] = -1.0;
  CHECK(pwb_box_tidwell_fit(y.data(), nullptr, 60, 0, x.data(), 1, &opt, &a.res) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("weights") && Contains("rows 9"));
}
