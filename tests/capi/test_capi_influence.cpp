// Leave-one-out lambda through the C ABI.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_lambda_influence agrees with its full estimate and flags rows", "[capi_influence]") {
  std::mt19937 gen(8);
  std::normal_distribution<double> nd;
  const size_t n = 30;
  std::vector<double> y(n), x(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = static_cast<double>(i) / 3.0;
    y[i] = std::exp(1 + 0.2 * x[i] + 0.1 * nd(gen));
  }
  y[0] = 40;  // a gross outlier at the low end
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  pwb_influence_summary s;
  s.struct_size = sizeof s;
  std::vector<double> loo(n), h(n);
  std::vector<int> out(n), bound(n);
  REQUIRE(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &s, loo.data(), h.data(),
                               out.data(), bound.data()) == PWB_OK);
  CHECK(s.n == n);
  CHECK(s.conf_low < s.lambda);
  CHECK(s.lambda < s.conf_high);
  size_t flagged = 0;
  for (size_t i = 0; i < n; ++i) flagged += static_cast<size_t>(out[i]);
  CHECK(flagged == s.n_outside);
  // deleting the outlier moves lambda-hat out of the interval (it drives the fit alone)
  CHECK(out[0] == 1);
  opt.family = PWB_LOG;
  CHECK(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &s, nullptr, nullptr, nullptr,
                             nullptr) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("PWB_BOX_COX"));
}

TEST_CASE("pwb_lambda_influence reads a 0.1 options struct without the weights",
          "[capi_influence]") {
  std::mt19937 gen(2);
  std::normal_distribution<double> nd;
  const size_t n = 25;
  std::vector<double> y(n), x(n), w(n, 2.0);
  for (size_t i = 0; i < n; ++i) {
    x[i] = static_cast<double>(i);
    y[i] = std::exp(1 + 0.1 * x[i] + 0.2 * nd(gen));
  }
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  CHECK(opt.weights == nullptr);
  opt.weights = w.data();  // beyond the declared size: must not be read
  opt.struct_size = offsetof(pwb_influence_options, weights);
  pwb_influence_summary a, b;
  a.struct_size = b.struct_size = sizeof a;
  std::vector<double> la(n), lb(n);
  REQUIRE(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &a, la.data(), nullptr, nullptr,
                               nullptr) == PWB_OK);
  REQUIRE(pwb_lambda_influence(y.data(), x.data(), n, 1, nullptr, &b, lb.data(), nullptr, nullptr,
                               nullptr) == PWB_OK);
  CHECK(a.lambda == b.lambda);
  CHECK(la == lb);
  opt.struct_size = offsetof(pwb_influence_options, weights) - 1;
  CHECK(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &a, nullptr, nullptr, nullptr,
                             nullptr) == PWB_ERR_ARGUMENT);
}
