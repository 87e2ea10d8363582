// The comparison tools through the C ABI: Box-Tidwell, lambda influence, folds and scores.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_box_tidwell fills the caller's buffers and history", "[capi_compare]") {
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

TEST_CASE("pwb_box_tidwell rejects bad input with a message", "[capi_compare]") {
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
