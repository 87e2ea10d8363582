// The aliased design columns of the response lambda estimators, reported through
// pwb_lambda_options' aliased_out / aliased_cap.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "powerback.h"

namespace {

constexpr std::size_t kN = 24;
constexpr std::size_t kP = 5;

// X (column-major, kN x kP): x1, x2 = 2 x1 (a copy up to scale), x3, x4 = x1 + x3 (a linear
// combination of earlier columns), x5. With the intercept first the design's columns are
// 0 = intercept, 1 = x1, 2 = x2, 3 = x3, 4 = x4, 5 = x5; worked by hand, lm's rule (a column is
// dropped when it depends on the columns kept before it) drops 2 and 4.
struct Design {
  std::vector<double> X, y;
  Design() : X(kN * kP), y(kN) {
    for (std::size_t i = 0; i < kN; ++i) {
      const double t = static_cast<double>(i);
      const double x1 = 1.0 + 0.37 * t, x3 = std::sin(1.3 * t), x5 = std::cos(0.7 * t) + 0.01 * t * t;
      X[0 * kN + i] = x1;
      X[1 * kN + i] = 2.0 * x1;
      X[2 * kN + i] = x3;
      X[3 * kN + i] = x1 + x3;
      X[4 * kN + i] = x5;
      y[i] = std::exp(0.2 + 0.1 * x1 + 0.3 * x3 - 0.2 * x5 + 0.15 * std::sin(3.1 * t + 0.4));
    }
  }
};

const std::vector<std::size_t> kExpected = {2, 4};
constexpr std::size_t kUntouched = 999;

pwb_lambda_result fresh() {
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  return r;
}

}  // namespace

TEST_CASE("init leaves no aliased-column output", "[capi][lambda][aliased]") {
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  CHECK(o.aliased_out == nullptr);
  CHECK(o.aliased_cap == 0);
}

TEST_CASE("the response estimators name the aliased design columns", "[capi][lambda][aliased]") {
  const Design d;
  std::vector<std::size_t> slots(kP + 1, kUntouched);
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.aliased_out = slots.data();
  o.aliased_cap = slots.size();

  SECTION("single estimate") {
    pwb_lambda_result r = fresh();
    REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, &o, &r) == PWB_OK);
    REQUIRE(r.n_aliased == 2);
    CHECK(r.rank == 4);
    CHECK(std::vector<std::size_t>(slots.begin(), slots.begin() + 2) == kExpected);
    CHECK(slots[2] == kUntouched);  // past the count: not written
  }
  SECTION("curve") {
    pwb_lambda_result r = fresh();
    std::vector<double> g(11), ll(11);
    REQUIRE(pwb_estimate_response_lambda_curve(d.y.data(), d.X.data(), kN, kP, PWB_YEO_JOHNSON, &o,
                                               &r, 11, g.data(), ll.data()) == PWB_OK);
    REQUIRE(r.n_aliased == 2);
    CHECK(std::vector<std::size_t>(slots.begin(), slots.begin() + 2) == kExpected);
  }
  SECTION("weighted: the zero-weight rows do not change which columns depend on others") {
    std::vector<double> w(kN, 1.0);
    w[3] = 0.0;
    w[7] = 2.5;
    o.weights = w.data();
    pwb_lambda_result r = fresh();
    REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, &o, &r) == PWB_OK);
    REQUIRE(r.n_aliased == 2);
    CHECK(std::vector<std::size_t>(slots.begin(), slots.begin() + 2) == kExpected);
  }
  SECTION("many responses share the design's columns") {
    std::vector<double> Y(kN * 2);
    for (std::size_t i = 0; i < kN; ++i) {
      Y[i] = d.y[i];
      Y[kN + i] = d.y[i] * d.y[i] + 1.0;
    }
    std::vector<pwb_lambda_result> res = {fresh(), fresh()};
    std::vector<pwb_status> st(2);
    REQUIRE(pwb_estimate_response_lambdas(Y.data(), kN, 2, d.X.data(), kP, PWB_BOX_COX, &o,
                                          res.data(), st.data(), 0, nullptr, nullptr) == PWB_OK);
    CHECK(res[0].n_aliased == 2);
    CHECK(res[1].n_aliased == 2);
    CHECK(std::vector<std::size_t>(slots.begin(), slots.begin() + 2) == kExpected);
  }
  SECTION("a capacity below the count writes the first ones; the count stays whole") {
    o.aliased_cap = 1;
    pwb_lambda_result r = fresh();
    REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, &o, &r) == PWB_OK);
    CHECK(r.n_aliased == 2);
    CHECK(slots[0] == 2);
    CHECK(slots[1] == kUntouched);
  }
}

TEST_CASE("an intercept copy is reported as column 1", "[capi][lambda][aliased]") {
  // X's only column is constant: it depends on the intercept (design column 0) kept before it.
  const Design d;
  std::vector<double> X(kN, 3.0);
  X.insert(X.end(), d.X.begin() + 2 * kN, d.X.begin() + 3 * kN);  // x3 as the second column
  std::size_t slot = kUntouched;
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.aliased_out = &slot;
  o.aliased_cap = 1;
  pwb_lambda_result r = fresh();
  REQUIRE(pwb_estimate_response_lambda(d.y.data(), X.data(), kN, 2, PWB_BOX_COX, &o, &r) == PWB_OK);
  CHECK(r.n_aliased == 1);
  CHECK(slot == 1);
}

TEST_CASE("an options struct from before the aliased output still works",
          "[capi][lambda][aliased]") {
  const Design d;
  // A caller compiled against the 0.1 header: its struct ends after weights. The memory past it
  // holds what this test put there; the library must not read it as a buffer.
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  std::size_t slot = kUntouched;
  o.aliased_out = &slot;
  o.aliased_cap = 1;
  o.struct_size = offsetof(pwb_lambda_options, aliased_out);
  pwb_lambda_result r = fresh(), ref = fresh();
  REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, &o, &r) == PWB_OK);
  CHECK(r.n_aliased == 2);
  CHECK(slot == kUntouched);
  REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, nullptr, &ref) == PWB_OK);
  CHECK(r.lambda == ref.lambda);  // same inputs, same defaults: the same number
}

TEST_CASE("a NULL aliased buffer with a capacity is an argument error", "[capi][lambda][aliased]") {
  const Design d;
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.aliased_cap = 3;
  pwb_lambda_result r = fresh();
  CHECK(pwb_estimate_response_lambda(d.y.data(), d.X.data(), kN, kP, PWB_BOX_COX, &o, &r) ==
        PWB_ERR_ARGUMENT);
  CHECK(std::string(pwb_last_error()).find("aliased_out") != std::string::npos);
}
