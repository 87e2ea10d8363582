// The response lambda at the edges: units, exact fits, range ends, extreme ranges, and the batched
// direct profile of wide designs.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <vector>

#include "../../core/src/lambda_internal.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

TEST_CASE("the response lambda does not depend on the units of y", "[lambda][edges]") {
  // y of order 1e8 with lambda-hat near -2: transformed values about 1e-16 apart if computed in
  // raw units. Box-Cox works on y / (its geometric mean), so every scale gives the same lambda,
  // interval, and log-likelihood shifted by exactly -n log(scale) (the Jacobian of the units).
  std::mt19937_64 g(51);
  std::normal_distribution<double> nd(0.0, 1.0);
  const std::size_t n = 300, p = 2;
  std::vector<double> X(n * p), y(n);
  for (auto& v : X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    const double z = 2.0 + 0.3 * X[i] - 0.2 * X[n + i] + 0.15 * nd(g);  // y^-2 linear
    y[i] = 1e8 * std::pow(z, -0.5);
  }
  const LambdaEstimate base = estimate_response_lambda(y.data(), X.data(), n, p, Family::BoxCox);
  CHECK(base.lambda == Approx(-2.0).margin(0.5));  // generated at -2; the interval is wide
  CHECK(base.converged);
  for (double scale : {1e-200, 1e-8, 1e200}) {
    std::vector<double> ys(y);
    for (auto& v : ys) v *= scale;
    const LambdaEstimate e = estimate_response_lambda(ys.data(), X.data(), n, p, Family::BoxCox);
    INFO("scale " << scale);
    // 1e-6: Brent stops on a bracket about 4 * 2^-25 * |lambda| = 3e-7 wide, so rounding-level
    // differences in the profile may move it anywhere inside; the interval ends are roots
    // solved to 40 bits and must agree far more closely
    CHECK(e.lambda == Approx(base.lambda).margin(1e-6));
    CHECK(e.conf_low == Approx(base.conf_low).margin(1e-9));
    CHECK(e.conf_high == Approx(base.conf_high).margin(1e-9));
    CHECK(e.loglik == Approx(base.loglik - n * std::log(scale * 1.0)).epsilon(1e-10));
  }
}

TEST_CASE("an exact fit is an error, not an arbitrary lambda", "[lambda][edges]") {
  const std::size_t n = 40;
  std::vector<double> X(n), y(n), ylog(n);
  for (std::size_t i = 0; i < n; ++i) {
    X[i] = 1.0 + 0.25 * static_cast<double>(i);
    y[i] = 3.0 + 2.0 * X[i];            // linear in X: exact at lambda = 1
    ylog[i] = std::exp(0.5 + 0.1 * X[i]);  // log-linear: exact at lambda = 0
  }
  for (const std::vector<double>* v : {&y, &ylog}) {
    try {
      estimate_response_lambda(v->data(), X.data(), n, 1, Family::BoxCox);
      FAIL("no error");
    } catch (const Error& e) {
      CHECK(e.code() == ErrorCode::Singular);
      CHECK_THAT(e.what(), Contains("exactly"));
    }
  }
}

TEST_CASE("at_bound follows the maximiser's tolerance, not the range's width", "[lambda][edges]") {
  std::mt19937_64 g(52);
  std::lognormal_distribution<double> ln(0.0, 0.8);
  std::vector<double> x(400);
  for (auto& v : x) v = ln(g);  // lambda-hat near 0
  LambdaOptions wide;
  wide.lower = -90.0;
  wide.upper = 90.0;
  const LambdaEstimate e = estimate_lambda(x.data(), x.size(), Family::BoxCox, wide);
  CHECK(std::fabs(e.lambda) < 0.3);
  CHECK_FALSE(e.at_bound);
  // An interior estimate 0.005 from the edge of a range 180 wide: not at the bound (the old
  // rule, 1e-4 of the width = 0.018, said it was).
  LambdaOptions close;
  close.lower = e.lambda - 0.005;
  close.upper = 90.0;
  const LambdaEstimate c = estimate_lambda(x.data(), x.size(), Family::BoxCox, close);
  CHECK(c.lambda == Approx(e.lambda).margin(1e-6));
  CHECK_FALSE(c.at_bound);
  // A maximum beyond the range: at the bound, exactly the edge.
  LambdaOptions narrow;
  narrow.lower = 0.5;
  narrow.upper = 2.0;
  const LambdaEstimate b = estimate_lambda(x.data(), x.size(), Family::BoxCox, narrow);
  CHECK(b.at_bound);
  CHECK(b.lambda == 0.5);
}

TEST_CASE("search ranges beyond +-100 are refused with a clear message", "[lambda][edges][errors]") {
  const std::vector<double> x = {1.0, 2.0, 3.5, 4.0, 7.0, 9.0};
  for (const auto& r : {std::pair<double, double>{-1e300, 1e300}, {-1e308, 0.0}, {-3.0, 200.0}}) {
    LambdaOptions o;
    o.lower = r.first;
    o.upper = r.second;
    try {
      estimate_lambda(x.data(), x.size(), Family::BoxCox, o);
      FAIL("no error");
    } catch (const Error& e) {
      CHECK(e.code() == ErrorCode::Argument);
      CHECK_THAT(e.what(), Contains("beyond +-100") && Contains("[-3, 3]"));
    }
  }
  LambdaOptions ok;
  ok.lower = -100.0;
  ok.upper = 100.0;
  const LambdaEstimate e = estimate_lambda(x.data(), x.size(), Family::BoxCox, ok);
  CHECK(std::isfinite(e.lambda));
  CHECK(std::isfinite(e.conf_low));
  CHECK(std::isfinite(e.conf_high));
}

TEST_CASE("a wide design's profile is evaluated in one batch, equal to lambda by lambda", "[lambda][edges]") {
  // 20 columns at n = 6000: bins * (10 + 8 * 21) exceeds n, so the binned series cannot serve.
  std::mt19937_64 g(53);
  std::normal_distribution<double> nd(0.0, 1.0);
  const std::size_t n = 6000, p = 20;
  std::vector<double> X(n * p), y(n);
  for (auto& v : X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) y[i] = std::exp(1.0 + 0.2 * X[i] + 0.5 * nd(g));
  const detail::LambdaProfile prof(y.data(), X.data(), n, p, Family::BoxCox, "y");
  CHECK_FALSE(prof.binned());
  std::vector<double> grid;
  for (int k = 0; k < 41; ++k) grid.push_back(-2.0 + 0.1 * k);
  std::vector<double> batch(grid.size());
  prof.loglik_batch(grid.data(), grid.size(), batch.data());
  const LeastSquares ls(X.data(), n, p);
  const auto ref = response_lambda_profile(y.data(), ls, Family::BoxCox, grid.data(), grid.size());
  for (std::size_t k = 0; k < grid.size(); ++k) {
    INFO("lambda " << grid[k]);
    CHECK(batch[k] == Approx(prof.loglik(grid[k])).epsilon(1e-13));  // same arithmetic per column
    // 1e-11 relative: against the Householder projection of a full LeastSquares, rounding only
    CHECK(batch[k] == Approx(ref[k]).epsilon(1e-11));
  }
}
