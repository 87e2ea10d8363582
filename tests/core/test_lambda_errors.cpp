// Lambda estimation: bad input gives errors naming the variable, the elements and a remedy.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

TEST_CASE("Box-Cox with values <= 0 names the count and indices and suggests Yeo-Johnson", "[lambda][errors]") {
  const std::vector<double> x = {1.0, 0.0, 2.0, 3.0, -1.0, 4.0, -0.5};
  try {
    estimate_lambda(x.data(), x.size(), Family::BoxCox);
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(e.count() == 3);
    CHECK(e.first_indices() == std::vector<std::size_t>{1, 4, 6});
    CHECK_THAT(e.what(), Contains("x > 0") && Contains("3 values <= 0") &&
                             Contains("1, 4, 6") && Contains("Yeo-Johnson"));
  }
  // Yeo-Johnson accepts the same values.
  CHECK_NOTHROW(estimate_lambda(x.data(), x.size(), Family::YeoJohnson));
}

TEST_CASE("non-finite values are named", "[lambda][errors]") {
  const std::vector<double> x = {1.0, NAN, 2.0, INFINITY, 4.0};
  try {
    estimate_lambda(x.data(), x.size(), Family::YeoJohnson);
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK(e.count() == 2);
    CHECK(e.first_indices() == std::vector<std::size_t>{1, 3});
  }
}

TEST_CASE("too few values and constant values are argument errors", "[lambda][errors]") {
  const std::vector<double> two = {1.0, 2.0}, flat = {3.0, 3.0, 3.0, 3.0};
  CHECK_THROWS_WITH(estimate_lambda(two.data(), 2, Family::BoxCox), Contains("at least 3"));
  CHECK_THROWS_WITH(estimate_lambda(flat.data(), 4, Family::BoxCox), Contains("constant"));
  CHECK_THROWS_WITH(estimate_lambda(flat.data(), 4, Family::Log), Contains("box-cox and yeo-johnson"));
}

TEST_CASE("bad options are argument errors", "[lambda][errors]") {
  const std::vector<double> x = {1.0, 2.0, 5.0, 3.0};
  LambdaOptions o;
  o.lower = 1.0;
  o.upper = 1.0;
  CHECK_THROWS_WITH(estimate_lambda(x.data(), 4, Family::BoxCox, o), Contains("lower < upper"));
  o = LambdaOptions{};
  o.level = 1.0;
  CHECK_THROWS_WITH(estimate_lambda(x.data(), 4, Family::BoxCox, o), Contains("between 0 and 1"));
  o.level = 0.0;
  CHECK_THROWS_AS(estimate_lambda(x.data(), 4, Family::BoxCox, o), Error);
}

TEST_CASE("response lambda needs n > rank + 1", "[lambda][errors]") {
  const std::vector<double> y = {1.0, 2.0, 4.0, 3.0};
  const std::vector<double> X = {0.1, 0.5, 0.2, 0.9, 1.0, 3.0, 2.0, 0.5};  // 4 x 2: rank 3
  try {
    estimate_response_lambda(y.data(), X.data(), 4, 2, Family::BoxCox);
    FAIL("no error");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::Singular);
    CHECK_THAT(e.what(), Contains("rank 3") && Contains("n > rank + 1"));
  }
  const std::vector<double> ybad = {1.0, -2.0, 4.0, 3.0, 5.0};
  const std::vector<double> X5 = {0.1, 0.5, 0.2, 0.9, 0.3};
  CHECK_THROWS_AS(estimate_response_lambda(ybad.data(), X5.data(), 5, 1, Family::BoxCox), IndexedError);
}
