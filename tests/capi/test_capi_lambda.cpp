// The lambda estimators through the C ABI: structs, statuses, messages and profile curves.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <map>
#include <string>
#include <vector>

#include "fixture_csv.hpp"
#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
std::vector<double> sample(const std::string& name) {
  std::vector<double> x;
  for (const auto& r : pwbtest::read_csv("scipy_lambda_samples.csv"))
    if (r[0] == name) x.push_back(std::stod(r[2]));
  return x;
}
double reference(const std::string& name, const std::string& kind) {
  for (const auto& r : pwbtest::read_csv("scipy_lambda.csv"))
    if (r[0] == name && r[2] == kind) return std::stod(r[3]);
  return NAN;
}
pwb_lambda_result fresh() {
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  return r;
}
}  // namespace

TEST_CASE("options and result init set sizes and defaults", "[capi][lambda]") {
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  CHECK(o.struct_size == sizeof(pwb_lambda_options));
  CHECK(o.lower == -3.0);
  CHECK(o.upper == 3.0);
  CHECK(o.level == 0.95);
  const pwb_lambda_result r = fresh();
  CHECK(r.struct_size == sizeof(pwb_lambda_result));
  CHECK(std::isnan(r.lambda));
  pwb_lambda_options_init(nullptr);
  pwb_lambda_result_init(nullptr);
}

TEST_CASE("Box-Cox estimate through the ABI equals scipy boxcox", "[capi][lambda]") {
  // Reference: scipy.stats.boxcox(x, alpha=0.05) on sample bc_gamma (fixture make_scipy_lambda.py).
  const auto x = sample("bc_gamma");
  REQUIRE(x.size() == 60);
  pwb_lambda_result r = fresh();
  REQUIRE(pwb_estimate_lambda(x.data(), x.size(), PWB_BOX_COX, nullptr, &r) == PWB_OK);
  CHECK(std::string(pwb_last_error()).empty());
  // 1e-6: both maximisers stop at ~1.5e-8 relative; 1e-7 for the tightly solved endpoints.
  CHECK(r.lambda == Approx(reference("bc_gamma", "mle")).margin(1e-6));
  CHECK(r.conf_low == Approx(reference("bc_gamma", "ci_low")).margin(1e-7));
  CHECK(r.conf_high == Approx(reference("bc_gamma", "ci_high")).margin(1e-7));
  CHECK(r.convenient == 1.0 / 3.0);  // interval (-0.063, 0.502) holds 0, 1/3, 1/2; 1/3 is nearest 0.214
  CHECK(r.converged == 1);
  CHECK(r.at_bound == 0);
  CHECK(r.low_open == 0);
  CHECK(r.high_open == 0);
  CHECK(r.n == 60);
  CHECK(r.rank == 0);

  // A narrower level gives a narrower interval around the same lambda.
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.level = 0.5;
  pwb_lambda_result r50 = fresh();
  REQUIRE(pwb_estimate_lambda(x.data(), x.size(), PWB_BOX_COX, &o, &r50) == PWB_OK);
  CHECK(r50.lambda == Approx(r.lambda).margin(1e-6));
  CHECK(r50.conf_low > r.conf_low);
  CHECK(r50.conf_high < r.conf_high);
}

TEST_CASE("curve functions agree with the estimate and the profile", "[capi][lambda]") {
  const auto x = sample("yj_shifted_gamma");
  pwb_lambda_result r = fresh();
  std::vector<double> grid(101), ll(101), again(101);
  REQUIRE(pwb_estimate_lambda_curve(x.data(), x.size(), PWB_YEO_JOHNSON, nullptr, &r, 101,
                                    grid.data(), ll.data()) == PWB_OK);
  CHECK(r.lambda == Approx(reference("yj_shifted_gamma", "mle")).margin(1e-6));  // scipy.stats.yeojohnson
  CHECK(grid.front() <= r.conf_low);
  CHECK(grid.back() >= r.conf_high);
  REQUIRE(pwb_lambda_profile(x.data(), x.size(), PWB_YEO_JOHNSON, grid.data(), 101, again.data()) == PWB_OK);
  for (std::size_t i = 0; i < 101; ++i) {
    CHECK(ll[i] == again[i]);    // the same evaluation, bit for bit
    CHECK(ll[i] <= r.loglik + 1e-9);  // nothing on the grid beats the maximum (beyond rounding)
  }
}

TEST_CASE("response estimate and curve through the ABI", "[capi][lambda]") {
  // y = exp(1 + x / 2 + small noise): the log scale is right, so lambda-hat is near 0.
  const std::size_t n = 40;
  std::vector<double> X(n), y(n);
  for (std::size_t i = 0; i < n; ++i) {
    X[i] = static_cast<double>(i) / 4.0;
    y[i] = std::exp(1.0 + X[i] / 2.0 + 0.05 * std::sin(7.0 * static_cast<double>(i)));
  }
  pwb_lambda_result r = fresh(), rc = fresh();
  REQUIRE(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, nullptr, &r) == PWB_OK);
  CHECK(std::fabs(r.lambda) < 0.2);
  CHECK(r.rank == 2);
  CHECK(r.n_aliased == 0);
  std::vector<double> grid(21), ll(21), again(21);
  REQUIRE(pwb_estimate_response_lambda_curve(y.data(), X.data(), n, 1, PWB_BOX_COX, nullptr, &rc, 21,
                                             grid.data(), ll.data()) == PWB_OK);
  CHECK(rc.lambda == r.lambda);
  REQUIRE(pwb_response_lambda_profile(y.data(), X.data(), n, 1, PWB_BOX_COX, grid.data(), 21,
                                      again.data()) == PWB_OK);
  CHECK(ll == again);
  CHECK(pwb_convenient_lambda(r.lambda, r.conf_low, r.conf_high) == r.convenient);
  CHECK(std::isnan(pwb_convenient_lambda(NAN, -1, 1)));
}

TEST_CASE("ABI errors: statuses and messages", "[capi][lambda]") {
  pwb_lambda_result r = fresh();
  const std::vector<double> x = {1.0, 0.0, 2.0, -3.0};
  CHECK(pwb_estimate_lambda(x.data(), 4, PWB_BOX_COX, nullptr, &r) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("2 values <= 0") && Contains("1, 3") && Contains("Yeo-Johnson"));
  const std::vector<double> nf = {1.0, NAN, 2.0, 3.0};
  CHECK(pwb_estimate_lambda(nf.data(), 4, PWB_YEO_JOHNSON, nullptr, &r) == PWB_ERR_NONFINITE);
  CHECK(pwb_estimate_lambda(x.data(), 4, PWB_LOG, nullptr, &r) == PWB_ERR_ARGUMENT);
  CHECK(pwb_estimate_lambda(nullptr, 4, PWB_BOX_COX, nullptr, &r) == PWB_ERR_ARGUMENT);
  CHECK(pwb_estimate_lambda(x.data(), 4, PWB_YEO_JOHNSON, nullptr, nullptr) == PWB_ERR_ARGUMENT);
  pwb_lambda_result small = fresh();
  small.struct_size = sizeof(size_t);
  CHECK(pwb_estimate_lambda(x.data(), 4, PWB_YEO_JOHNSON, nullptr, &small) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("struct_size"));
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = 2.0;
  o.upper = -2.0;
  CHECK(pwb_estimate_lambda(x.data(), 4, PWB_YEO_JOHNSON, &o, &r) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("lower < upper"));
  const std::vector<double> y = {1.0, 2.0, 3.0}, X = {1.0, 4.0, 2.0};
  CHECK(pwb_estimate_response_lambda(y.data(), X.data(), 3, 1, PWB_BOX_COX, nullptr, &r) == PWB_ERR_SINGULAR);
  std::vector<double> g(1), l(1);
  CHECK(pwb_estimate_lambda_curve(x.data(), 4, PWB_YEO_JOHNSON, nullptr, &r, 1, g.data(), l.data()) ==
        PWB_ERR_ARGUMENT);
  // A good call clears the error text.
  const std::vector<double> ok = {1.0, 2.0, 5.0, 3.0};
  CHECK(pwb_estimate_lambda(ok.data(), 4, PWB_BOX_COX, nullptr, &r) == PWB_OK);
  CHECK(std::string(pwb_last_error()).empty());
}

TEST_CASE("C ABI: weights in the options, old struct sizes, rows of bad input as numbers", "[capi][lambda][weights]") {
  const std::size_t n = 60;
  std::vector<double> X(n), y(n), w(n);
  for (std::size_t i = 0; i < n; ++i) {
    X[i] = std::sin(0.37 * static_cast<double>(i)) * 2.0;
    y[i] = std::exp(1.0 + 0.4 * X[i] + 0.3 * std::cos(1.3 * static_cast<double>(i)));
    w[i] = 1.0 + static_cast<double>(i % 4);
  }
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  CHECK(o.weights == nullptr);
  pwb_lambda_result plain = fresh(), weighted = fresh(), old = fresh();
  REQUIRE(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &plain) == PWB_OK);
  o.weights = w.data();
  REQUIRE(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &weighted) == PWB_OK);
  CHECK(weighted.lambda != plain.lambda);
  CHECK(weighted.n == n);
  // A struct from a header older than the weights: accepted, the weights absent.
  o.struct_size = offsetof(pwb_lambda_options, weights);
  REQUIRE(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &old) == PWB_OK);
  CHECK(old.lambda == plain.lambda);
  o.struct_size = sizeof(pwb_lambda_options);
  // The weighted profile at lambda-hat is the weighted estimate's log-likelihood.
  double ll = 0.0;
  REQUIRE(pwb_response_lambda_profile_weighted(y.data(), X.data(), n, 1, PWB_BOX_COX, w.data(),
                                               &weighted.lambda, 1, &ll) == PWB_OK);
  CHECK(ll == Approx(weighted.loglik).epsilon(1e-12));  // the same evaluation
  REQUIRE(pwb_lambda_profile_weighted(y.data(), n, PWB_BOX_COX, nullptr, &weighted.lambda, 1, &ll) == PWB_OK);
  // Zero weights drop rows: n counts the others.
  w[0] = w[5] = 0.0;
  y[5] = -1.0;  // never looked at
  pwb_lambda_result dropped = fresh();
  REQUIRE(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &dropped) == PWB_OK);
  CHECK(dropped.n == n - 2);
  CHECK(pwb_lambda_error_rows(nullptr, 0, nullptr) == 0);
  // Rows at fault come back as numbers.
  y[9] = 0.0;
  y[30] = -2.0;
  CHECK(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &dropped) == PWB_ERR_DOMAIN);
  size_t rows[8] = {0};
  int input = -5;
  CHECK(pwb_lambda_error_rows(rows, 8, &input) == 2);
  CHECK(input == PWB_LAMBDA_INPUT_RESPONSE);
  CHECK(rows[0] == 9);
  CHECK(rows[1] == 30);
  y[9] = y[30] = 1.0;
  w[17] = -1.0;
  CHECK(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &dropped) == PWB_ERR_ARGUMENT);
  CHECK(pwb_lambda_error_rows(rows, 1, &input) == 1);
  CHECK(input == PWB_LAMBDA_INPUT_WEIGHTS);
  CHECK(rows[0] == 17);
  CHECK_THAT(pwb_last_error(), Contains("negative"));
  w[17] = 1.0;
  X[44] = NAN;
  CHECK(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &dropped) == PWB_ERR_NONFINITE);
  CHECK(pwb_lambda_error_rows(rows, 8, &input) == 1);
  CHECK(input == PWB_LAMBDA_INPUT_PREDICTORS);
  CHECK(rows[0] == 44);
  // A failure not about rows clears them.
  X[44] = 0.5;
  o.lower = -1e300;
  o.upper = 1e300;
  CHECK(pwb_estimate_response_lambda(y.data(), X.data(), n, 1, PWB_BOX_COX, &o, &dropped) == PWB_ERR_ARGUMENT);
  CHECK(pwb_lambda_error_rows(rows, 8, &input) == 0);
  CHECK(input == PWB_LAMBDA_INPUT_NONE);
  CHECK_THAT(pwb_last_error(), Contains("beyond +-100"));
}

TEST_CASE("C ABI: the convenient set holds the cube roots", "[capi][lambda]") {
  CHECK(pwb_convenient_lambda(0.22, 0.084, 0.365) == 1.0 / 3.0);
  CHECK(pwb_convenient_lambda(-0.3, -0.45, -0.2) == -1.0 / 3.0);
}
