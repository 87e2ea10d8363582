// Normality statistics, the ladder and the variable screen through the C ABI.
#include <catch2/catch.hpp>

#include "test_support.hpp"

#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include "fixture_csv.hpp"
#include "powerback.h"

using Catch::Matchers::Contains;

namespace {

using pwbtest::parse_values;

}  // namespace

TEST_CASE("pwb_shapiro_wilk equals R's shapiro.test", "[capi][screen][external]") {
  // Source: base R stats::shapiro.test, stored by tests/fixtures/make_r_shapiro.R. Tolerance
  // 1e-9 absolute, as in the core test (the same arithmetic behind the ABI).
  for (const auto& r : pwbtest::read_csv("r_shapiro.csv")) {
    const std::vector<double> x = parse_values(r[4]);
    pwb_normality_result out;
    pwb_normality_result_init(&out);
    REQUIRE(pwb_shapiro_wilk(x.data(), x.size(), &out) == PWB_OK);
    INFO(r[0]);
    CHECK(out.computed == 1);
    CHECK(std::string(out.note).empty());
    CHECK(out.w == Approx(std::stod(r[2])).margin(1e-9).epsilon(0));
    CHECK(out.p_value == Approx(std::stod(r[3])).margin(1e-9).epsilon(1e-7));
  }
}

TEST_CASE("pwb_shapiro_wilk skips with a static note; bad calls are errors", "[capi][screen]") {
  pwb_normality_result out;
  pwb_normality_result_init(&out);
  const double two[] = {1.0, 2.0};
  REQUIRE(pwb_shapiro_wilk(two, 2, &out) == PWB_OK);
  CHECK(out.computed == 0);
  CHECK(std::isnan(out.w));
  CHECK_THAT(out.note, Contains("fewer than 3"));

  const double bad[] = {1.0, NAN, 3.0, 4.0};
  CHECK(pwb_shapiro_wilk(bad, 4, &out) == PWB_ERR_NONFINITE);
  CHECK_THAT(pwb_last_error(), Contains("index 1"));
  CHECK(pwb_shapiro_wilk(two, 2, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_shapiro_wilk(nullptr, 3, &out) == PWB_ERR_ARGUMENT);
  out.struct_size = sizeof(size_t);
  CHECK(pwb_shapiro_wilk(two, 2, &out) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("sizeof(pwb_normality_result)"));
}

TEST_CASE("pwb_sample_moments equals scipy skew and kurtosis", "[capi][screen][external]") {
  // Source: scipy.stats.skew / kurtosis with bias=False, stored by
  // tests/fixtures/make_scipy_moments.py; compared with the exact-arithmetic columns of the same
  // file. Tolerance as the core test: 1e-12 relative, 5e-8 on the sample offset by 1e6.
  for (const auto& r : pwbtest::read_csv("scipy_moments.csv")) {
    const std::vector<double> x = parse_values(r[6]);
    pwb_moments m;
    pwb_moments_init(&m);
    REQUIRE(pwb_sample_moments(x.data(), x.size(), &m) == PWB_OK);
    INFO(r[0]);
    const double rel = r[0] == "n2000_offset" ? 5e-8 : 1e-12;
    CHECK(m.n == x.size());
    CHECK(m.skewness == Approx(std::stod(r[4])).epsilon(rel));
    CHECK(m.kurtosis == Approx(std::stod(r[5])).epsilon(rel));
  }
  pwb_moments empty;
  pwb_moments_init(&empty);
  REQUIRE(pwb_sample_moments(nullptr, 0, &empty) == PWB_OK);
  CHECK(std::isnan(empty.skewness));
}

TEST_CASE("pwb_ladder_recommend returns a spec the transform handle accepts", "[capi][screen]") {
  // Left-skewed: 30 values bunched near 100 with a long lower tail.
  std::vector<double> x;
  for (int i = 0; i < 30; ++i) x.push_back(100.0 - std::exp(0.15 * i));
  pwb_transform_spec spec;
  pwb_transform_spec_init(&spec);
  pwb_ladder_info info;
  pwb_ladder_info_init(&info);
  REQUIRE(pwb_ladder_recommend(x.data(), x.size(), &spec, &info) == PWB_OK);
  CHECK(info.skewed == 1);
  CHECK(info.by_size == 0);
  CHECK(info.skewness < 0.0);
  CHECK(info.n == 30);
  CHECK(info.step != PWB_LADDER_NONE);
  CHECK(spec.reflect == 1);
  CHECK(spec.pivot == 100.0 - 1.0 + 1.0);  // max (100 - e^0) + 1
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&spec, &t) == PWB_OK);
  std::vector<double> z(x.size());
  CHECK(pwb_transform_apply(t, x.data(), x.size(), z.data()) == PWB_OK);
  pwb_transform_free(t);
  // info may be NULL; a constant sample is an argument error.
  REQUIRE(pwb_ladder_recommend(x.data(), x.size(), &spec, nullptr) == PWB_OK);
  const double flat[] = {3.0, 3.0, 3.0};
  CHECK(pwb_ladder_recommend(flat, 3, &spec, nullptr) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("identical"));
}

TEST_CASE("pwb_screen_variable fills every figure and reports unusable input", "[capi][screen]") {
  std::vector<double> x;
  for (int i = 1; i <= 40; ++i) x.push_back(std::exp(0.08 * i) + 0.01 * (i % 3));
  pwb_screen_result r;
  pwb_screen_result_init(&r);
  REQUIRE(pwb_screen_variable(x.data(), x.size(), nullptr, &r) == PWB_OK);
  CHECK(r.usable == 1);
  CHECK(r.n == 40);
  CHECK(std::string(r.note).empty());
  pwb_normality_result sw;
  pwb_normality_result_init(&sw);
  REQUIRE(pwb_shapiro_wilk(x.data(), x.size(), &sw) == PWB_OK);
  CHECK(r.sw_w == sw.w);
  CHECK(r.ml_done == 1);
  CHECK(r.ml.family == PWB_BOX_COX);
  CHECK(r.ml.lambda == r.ml_convenient);
  CHECK(r.ml_conf_low <= r.ml_lambda);
  CHECK(r.ml_lambda <= r.ml_conf_high);
  CHECK(std::isfinite(r.ml_sw_p));
  CHECK(std::isfinite(r.ladder_sw_p));

  pwb_screen_options opt;
  pwb_screen_options_init(&opt);
  CHECK(opt.level == 0.95);
  opt.level = 0.0;
  CHECK(pwb_screen_variable(x.data(), x.size(), &opt, &r) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("level"));

  const double flat[] = {2.0, 2.0, 2.0, 2.0};
  REQUIRE(pwb_screen_variable(flat, 4, nullptr, &r) == PWB_OK);
  CHECK(r.usable == 0);
  CHECK_THAT(r.note, Contains("identical"));
  CHECK(std::isnan(r.sw_w));
  CHECK(r.ml_done == 0);
  r.struct_size = 8;
  CHECK(pwb_screen_variable(flat, 4, nullptr, &r) == PWB_ERR_ARGUMENT);
}
