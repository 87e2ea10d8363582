// Many responses against one design: each response's estimate, interval, log-likelihood, flags
// and profile curve equal the single-response estimator's on that column (the reference: the
// core's own estimate_response_lambda_curve, itself checked against by-hand least-squares refits
// in test_lambda_weights.cpp and test_lambda_numerics.cpp); per-response failures are kept,
// shared-input failures thrown.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <random>
#include <vector>

#include "powerback/lambda.hpp"
#include "powerback/lambda_many.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {

struct ManyData {
  std::size_t n, p, q;
  std::vector<double> X, Y, w;
};

// q responses, column j Box-Cox-normal with the power lams[j % 5] (its inverse applied to a
// linear predictor plus noise), over p normal predictors; weights in [0.3, 3] (every 9th 0 when
// zeros).
ManyData simulate(std::size_t n, std::size_t p, std::size_t q, unsigned seed, bool zeros) {
  static const double lams[] = {0.0, 0.5, -0.5, 1.0, 0.33};
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::uniform_real_distribution<double> ud(0.3, 3.0);
  ManyData d{n, p, q, std::vector<double>(n * p), std::vector<double>(n * q), std::vector<double>(n)};
  for (auto& v : d.X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) d.w[i] = zeros && i % 9 == 4 ? 0.0 : ud(g);
  for (std::size_t j = 0; j < q; ++j) {
    const double lam = lams[j % 5];
    for (std::size_t i = 0; i < n; ++i) {
      double eta = 0.0;
      for (std::size_t c = 0; c < p; ++c) eta += 0.15 * (c % 2 ? -1.0 : 1.0) * d.X[c * n + i];
      const double z = eta + 0.25 * nd(g);
      d.Y[j * n + i] = lam == 0.0 ? 3.0 * std::exp(z) : std::pow(1.0 + lam * (1.0 + z / 3.0), 1.0 / lam);
    }
  }
  return d;
}

// 1e-10 absolute on lambdas, endpoints and log-likelihoods (values of order 1 to 1e4): the two
// paths run the same operations on the same blocks, so anything beyond rounding is a defect.
void check_same(const ResponseLambdaOutcome& got, const LambdaEstimate& want,
                const std::vector<double>& grid, const std::vector<double>& ll) {
  REQUIRE(got.ok);
  const LambdaEstimate& e = got.estimate;
  CHECK(std::fabs(e.lambda - want.lambda) <= 1e-10);
  CHECK(std::fabs(e.conf_low - want.conf_low) <= 1e-10);
  CHECK(std::fabs(e.conf_high - want.conf_high) <= 1e-10);
  CHECK(std::fabs(e.loglik - want.loglik) <= 1e-10 * std::max(1.0, std::fabs(want.loglik)));
  CHECK(e.convenient == want.convenient);
  CHECK(e.at_bound == want.at_bound);
  CHECK(e.converged == want.converged);
  CHECK(e.low_open == want.low_open);
  CHECK(e.high_open == want.high_open);
  CHECK(e.n == want.n);
  CHECK(e.rank == want.rank);
  CHECK(e.aliased == want.aliased);
  REQUIRE(got.grid.size() == grid.size());
  for (std::size_t k = 0; k < grid.size(); ++k) {
    CHECK(std::fabs(got.grid[k] - grid[k]) <= 1e-10);
    CHECK(std::fabs(got.loglik[k] - ll[k]) <= 1e-10 * std::max(1.0, std::fabs(ll[k])));
  }
}

void check_against_single(const ManyData& d, Family family, const LambdaOptions& o) {
  const auto many = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, family, o, 31);
  REQUIRE(many.size() == d.q);
  for (std::size_t j = 0; j < d.q; ++j) {
    INFO("response " << j);
    std::vector<double> grid, ll;
    const LambdaEstimate one = estimate_response_lambda_curve(d.Y.data() + j * d.n, d.X.data(), d.n,
                                                              d.p, family, o, 31, &grid, &ll);
    check_same(many[j], one, grid, ll);
  }
}

}  // namespace

TEST_CASE("many responses equal separate single-response estimates", "[lambda][many]") {
  SECTION("small n: direct evaluation") {
    const ManyData d = simulate(250, 3, 5, 71, false);
    check_against_single(d, Family::BoxCox, {});
    check_against_single(d, Family::YeoJohnson, {});
  }
  SECTION("large n: the binned path, several design blocks") {
    const ManyData d = simulate(9000, 4, 5, 72, false);
    check_against_single(d, Family::BoxCox, {});
  }
  SECTION("weights with zeros, both paths") {
    for (std::size_t n : {300u, 9000u}) {
      const ManyData d = simulate(n, 3, 5, 73, true);
      LambdaOptions o;
      o.weights = d.w.data();
      o.lower = -2.0;
      o.upper = 2.5;
      o.level = 0.9;
      check_against_single(d, Family::BoxCox, o);
    }
  }
  SECTION("an aliased predictor column") {
    ManyData d = simulate(400, 3, 3, 74, false);
    for (std::size_t i = 0; i < d.n; ++i) d.X[2 * d.n + i] = d.X[i] - 2.0 * d.X[d.n + i];
    check_against_single(d, Family::BoxCox, {});
    const auto many = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox);
    CHECK(many[0].estimate.rank == 3);
    CHECK(many[0].estimate.aliased == std::vector<std::size_t>{3});
  }
  SECTION("the estimates recover the simulated powers") {
    const ManyData d = simulate(9000, 2, 5, 75, false);
    const auto many = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox);
    const double lams[] = {0.0, 0.5, -0.5, 1.0, 0.33};
    for (std::size_t j = 0; j < d.q; ++j) {
      INFO("response " << j);
      REQUIRE(many[j].ok);
      CHECK(many[j].estimate.conf_low <= lams[j]);
      CHECK(many[j].estimate.conf_high >= lams[j]);
      CHECK(many[j].grid.empty());  // no curve asked for
    }
  }
}

TEST_CASE("a failing response is reported alone, the others proceed", "[lambda][many]") {
  ManyData d = simulate(200, 2, 4, 76, false);
  d.Y[2 * d.n + 5] = 0.0;
  d.Y[2 * d.n + 17] = -1.0;
  for (std::size_t i = 0; i < d.n; ++i) d.Y[3 * d.n + i] = 4.0;  // constant
  const auto many = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox);
  CHECK(many[0].ok);
  CHECK(many[1].ok);
  REQUIRE_FALSE(many[2].ok);
  CHECK(many[2].code == ErrorCode::Domain);
  CHECK(many[2].input == LambdaInput::Response);
  CHECK(many[2].count == 2);
  CHECK(many[2].first_rows == std::vector<std::size_t>{5, 17});
  CHECK_THAT(many[2].message, Contains("Y column 2 (0-based)") && Contains("Yeo-Johnson"));
  REQUIRE_FALSE(many[3].ok);
  CHECK(many[3].code == ErrorCode::Argument);
  CHECK_THAT(many[3].message, Contains("Y column 3") && Contains("constant"));
  const LambdaEstimate one = estimate_response_lambda(d.Y.data() + d.n, d.X.data(), d.n, d.p,
                                                      Family::BoxCox);
  CHECK(std::fabs(many[1].estimate.lambda - one.lambda) <= 1e-10);  // as above
  // Every response failing on its own values: outcomes, no throw.
  const auto bad = estimate_response_lambdas(d.Y.data() + 2 * d.n, d.n, 2, d.X.data(), d.p,
                                             Family::BoxCox);
  CHECK_FALSE(bad[0].ok);
  CHECK_FALSE(bad[1].ok);
}

TEST_CASE("shared-input failures are thrown", "[lambda][many]") {
  ManyData d = simulate(100, 2, 3, 77, false);
  SECTION("non-finite predictors name the rows") {
    d.X[d.n + 7] = std::numeric_limits<double>::quiet_NaN();
    try {
      estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox);
      FAIL("no error");
    } catch (const LambdaRowsError& e) {
      CHECK(e.input() == LambdaInput::Predictors);
      CHECK(e.first_indices() == std::vector<std::size_t>{7});
    }
  }
  SECTION("negative weights") {
    d.w[3] = -1.0;
    LambdaOptions o;
    o.weights = d.w.data();
    CHECK_THROWS_AS(estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox, o),
                    LambdaRowsError);
  }
  SECTION("too few rows for the design's rank") {
    CHECK_THROWS_WITH(estimate_response_lambdas(d.Y.data(), 3, d.q, d.X.data(), d.p, Family::BoxCox),
                      Contains("rank"));
  }
  SECTION("bad arguments") {
    CHECK_THROWS_AS(estimate_response_lambdas(d.Y.data(), d.n, 0, d.X.data(), d.p, Family::BoxCox), Error);
    CHECK_THROWS_AS(estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox, {}, 1),
                    Error);
    LambdaOptions o;
    o.level = 1.5;
    CHECK_THROWS_AS(estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox, o), Error);
  }
}

namespace {

// Every field of two outcomes, compared exactly: the threads change who computes a response,
// never how.
void check_identical(const ResponseLambdaOutcome& a, const ResponseLambdaOutcome& b) {
  REQUIRE(a.ok == b.ok);
  CHECK(a.code == b.code);
  CHECK(a.message == b.message);
  CHECK(a.count == b.count);
  CHECK(a.first_rows == b.first_rows);
  CHECK(a.input == b.input);
  if (!a.ok) return;
  CHECK(a.estimate.lambda == b.estimate.lambda);
  CHECK(a.estimate.conf_low == b.estimate.conf_low);
  CHECK(a.estimate.conf_high == b.estimate.conf_high);
  CHECK(a.estimate.loglik == b.estimate.loglik);
  CHECK(a.estimate.convenient == b.estimate.convenient);
  CHECK(a.estimate.at_bound == b.estimate.at_bound);
  CHECK(a.estimate.converged == b.estimate.converged);
  CHECK(a.estimate.n == b.estimate.n);
  CHECK(a.estimate.rank == b.estimate.rank);
  CHECK(a.grid == b.grid);
  CHECK(a.loglik == b.loglik);
}

}  // namespace

TEST_CASE("many responses on 1, 2 and 3 threads give identical results", "[lambda][many][threads]") {
  // 11 responses: groups of uneven size on every thread count; n spans three design blocks.
  ManyData d = simulate(9000, 3, 11, 78, true);
  d.Y[4 * d.n + 10] = -3.0;   // response 4: a value <= 0 at row 10 (weight > 0 there)
  d.Y[9 * d.n + 20] = std::numeric_limits<double>::infinity();  // response 9: at row 20
  for (bool weighted : {false, true}) {
    LambdaOptions o;
    if (weighted) o.weights = d.w.data();
    const auto serial = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p,
                                                  Family::BoxCox, o, 21, 1);
    for (unsigned threads : {0u, 2u, 3u}) {
      INFO("weighted " << weighted << " threads " << threads);
      const auto par = estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p,
                                                 Family::BoxCox, o, 21, threads);
      REQUIRE(par.size() == d.q);
      for (std::size_t j = 0; j < d.q; ++j) {
        INFO("response " << j);
        check_identical(par[j], serial[j]);
      }
      // The failures stay with their own responses.
      CHECK(par[4].code == ErrorCode::Domain);
      CHECK(par[4].first_rows == std::vector<std::size_t>{10});
      CHECK_THAT(par[4].message, Contains("Y column 4 (0-based)"));
      CHECK(par[9].code == ErrorCode::NonFinite);
      CHECK(par[9].first_rows == std::vector<std::size_t>{20});
      CHECK_THAT(par[9].message, Contains("Y column 9 (0-based)"));
      for (std::size_t j : {0u, 3u, 5u, 10u}) CHECK(par[j].ok);
    }
    // And each equals its single-response call (1e-10 as above).
    for (std::size_t j : {0u, 7u}) {
      std::vector<double> grid, ll;
      const LambdaEstimate one = estimate_response_lambda_curve(d.Y.data() + j * d.n, d.X.data(),
                                                                d.n, d.p, Family::BoxCox, o, 21,
                                                                &grid, &ll);
      check_same(serial[j], one, grid, ll);
    }
  }
}

TEST_CASE("shared failures on several threads are those of the serial call", "[lambda][many][threads]") {
  ManyData d = simulate(5000, 2, 6, 79, false);
  d.X[d.n + 33] = std::numeric_limits<double>::quiet_NaN();
  for (unsigned threads : {1u, 2u, 3u}) {
    INFO("threads " << threads);
    try {
      estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox, {}, 0, threads);
      FAIL("no error");
    } catch (const LambdaRowsError& e) {
      CHECK(e.input() == LambdaInput::Predictors);
      CHECK(e.first_indices() == std::vector<std::size_t>{33});
    }
  }
  d.X[d.n + 33] = 0.0;
  d.w[2] = -1.0;
  LambdaOptions o;
  o.weights = d.w.data();
  for (unsigned threads : {1u, 3u}) {
    INFO("threads " << threads);
    try {
      estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, Family::BoxCox, o, 0, threads);
      FAIL("no error");
    } catch (const LambdaRowsError& e) {
      CHECK(e.input() == LambdaInput::Weights);
      CHECK(e.first_indices() == std::vector<std::size_t>{2});
    }
  }
}
