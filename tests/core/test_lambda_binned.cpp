// The binned fast path of the lambda profile against the direct evaluation, value by value.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <vector>

#include "../../core/src/lambda_internal.hpp"

using namespace powerback;

namespace {
const double kLambdas[] = {-3.0, -2.2, -1.0, -0.3, 0.0, 1e-7, 0.4, 1.0, 1.9, 2.0, 2.5, 3.0};

void same_profile(const detail::LambdaProfile& prof) {
  REQUIRE(prof.binned());
  for (double lam : kLambdas) {
    INFO("lambda " << lam);
    // 1e-12 relative: the series are exact to rounding; what differs is the order of sums.
    CHECK(prof.loglik(lam) == Approx(prof.loglik(lam, true)).epsilon(1e-12));
  }
}
}  // namespace

TEST_CASE("binned profile equals the direct one for Box-Cox and Yeo-Johnson", "[lambda][binned]") {
  std::mt19937_64 g(21);
  std::lognormal_distribution<double> ln(1.0, 1.2);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::vector<double> x(50000), s(50000), huge(40000);
  for (auto& v : x) v = ln(g);
  for (auto& v : s) v = 3.0 * nd(g) + 1.0;                // both signs
  for (auto& v : huge) v = std::exp(138.0 + nd(g));       // k t > 300: the rescaled branch
  same_profile(detail::LambdaProfile(x.data(), x.size(), Family::BoxCox, "x"));
  same_profile(detail::LambdaProfile(x.data(), x.size(), Family::YeoJohnson, "x"));
  same_profile(detail::LambdaProfile(s.data(), s.size(), Family::YeoJohnson, "x"));
  same_profile(detail::LambdaProfile(huge.data(), huge.size(), Family::YeoJohnson, "x"));
  // Outside the covered |k| the direct evaluation is used: still the same number.
  const detail::LambdaProfile p(x.data(), x.size(), Family::BoxCox, "x");
  CHECK(p.loglik(7.5) == p.loglik(7.5, true));
}

TEST_CASE("binned response profile equals the projection of each transformed response", "[lambda][binned]") {
  std::mt19937_64 g(22);
  std::normal_distribution<double> nd(0.0, 1.0);
  const std::size_t n = 60000, p = 3;
  std::vector<double> X(n * p), y(n), yj(n), tight(n);
  for (auto& v : X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    const double eta = 0.3 * X[i] - 0.5 * X[n + i] + 0.2 * X[2 * n + i];
    y[i] = std::exp(1.0 + eta + 0.6 * nd(g));
    yj[i] = 2.0 * eta + nd(g);
    tight[i] = std::exp(1.0 + eta + 1e-5 * nd(g));  // R^2 about 1 at lambda 0: direct fallback
  }
  const LeastSquares ls(X.data(), n, p);
  same_profile(detail::LambdaProfile(y.data(), ls, Family::BoxCox, "y"));
  same_profile(detail::LambdaProfile(yj.data(), ls, Family::YeoJohnson, "y"));
  const detail::LambdaProfile t(tight.data(), ls, Family::BoxCox, "y");
  CHECK(t.loglik(0.0) == Approx(t.loglik(0.0, true)).epsilon(1e-12));
  CHECK(t.loglik(0.5) == Approx(t.loglik(0.5, true)).epsilon(1e-12));

  // The estimate is a maximum of the direct profile too.
  const LambdaEstimate e = estimate_response_lambda(y.data(), ls, Family::BoxCox);
  const detail::LambdaProfile d(y.data(), ls, Family::BoxCox, "y");
  CHECK(d.loglik(e.lambda - 1e-3, true) < d.loglik(e.lambda, true));
  CHECK(d.loglik(e.lambda + 1e-3, true) < d.loglik(e.lambda, true));
  CHECK(e.lambda == Approx(0.0).margin(0.05));  // generated on the log scale, n = 60000
}

TEST_CASE("streamed response profile (raw X) equals the one on a full factorisation", "[lambda][binned]") {
  std::mt19937_64 g(23);
  std::normal_distribution<double> nd(0.0, 1.0);
  for (const std::size_t n : {std::size_t(60000), std::size_t(3000)}) {  // binned; direct
    const std::size_t p = 4;
    std::vector<double> X(n * p), y(n), yj(n);
    for (auto& v : X) v = nd(g);
    for (std::size_t i = 0; i < n; ++i) {
      X[3 * n + i] = X[i] - 2.0 * X[n + i];  // aliased: dropped by both
      const double eta = 0.3 * X[i] - 0.5 * X[n + i] + 0.2 * X[2 * n + i];
      y[i] = std::exp(1.0 + eta + 0.6 * nd(g));
      yj[i] = 2.0 * eta + nd(g);
    }
    INFO("n = " << n);
    const LeastSquares ls(X.data(), n, p);
    for (const auto& fam : {std::make_pair(Family::BoxCox, &y), std::make_pair(Family::YeoJohnson, &yj)}) {
      const detail::LambdaProfile streamed(fam.second->data(), X.data(), n, p, fam.first, "y");
      const detail::LambdaProfile full(fam.second->data(), ls, fam.first, "y");
      CHECK(streamed.binned() == (n == 60000));
      CHECK(streamed.rank() == 4);
      CHECK(streamed.aliased() == std::vector<std::size_t>{4});
      for (double lam : kLambdas) {
        INFO("lambda " << lam);
        // 1e-12 relative: exact to rounding on both sides (see the test above).
        CHECK(streamed.loglik(lam) == Approx(full.loglik(lam, true)).epsilon(1e-12));
        CHECK(streamed.loglik(lam, true) == Approx(full.loglik(lam, true)).epsilon(1e-12));
      }
    }
    const LambdaEstimate a = estimate_response_lambda(y.data(), X.data(), n, p, Family::BoxCox);
    const LambdaEstimate b = estimate_response_lambda(y.data(), ls, Family::BoxCox);
    // The two profiles agree to ~1e-12, so their maximisers agree far inside Brent's 1.5e-8
    // relative location tolerance; 1e-6 leaves room for where the searches stop.
    CHECK(a.lambda == Approx(b.lambda).margin(1e-6));
    CHECK(a.conf_low == Approx(b.conf_low).margin(1e-6));
    CHECK(a.conf_high == Approx(b.conf_high).margin(1e-6));
    CHECK(a.rank == 4);
    CHECK(a.aliased == std::vector<std::size_t>{4});

    // Estimate and curve from one preparation: the grid is profile_grid's, the values the profile's.
    std::vector<double> grid, ll;
    const LambdaEstimate c = estimate_response_lambda_curve(y.data(), X.data(), n, p, Family::BoxCox,
                                                            LambdaOptions{}, 31, &grid, &ll);
    CHECK(c.lambda == a.lambda);
    REQUIRE(grid.size() == 31);
    REQUIRE(ll.size() == 31);
    CHECK(grid == profile_grid(c, 31));
    const std::vector<double> ref = response_lambda_profile(y.data(), ls, Family::BoxCox, grid.data(), 31);
    for (std::size_t i = 0; i < 31; ++i) CHECK(ll[i] == Approx(ref[i]).epsilon(1e-12));
  }
}

TEST_CASE("streamed response lambda: a lambda outside the bins and a near-exact fit go direct", "[lambda][binned]") {
  std::mt19937_64 g(24);
  std::normal_distribution<double> nd(0.0, 1.0);
  const std::size_t n = 50000, p = 2;
  std::vector<double> X(n * p), tight(n);
  for (auto& v : X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i)
    tight[i] = std::exp(1.0 + 0.4 * X[i] - 0.3 * X[n + i] + 1e-5 * nd(g));  // R^2 about 1 at 0
  const LeastSquares ls(X.data(), n, p);
  const detail::LambdaProfile streamed(tight.data(), X.data(), n, p, Family::BoxCox, "y");
  const detail::LambdaProfile full(tight.data(), ls, Family::BoxCox, "y");
  REQUIRE(streamed.binned());
  for (double lam : {0.0, 0.5, 7.5, -9.0}) {
    INFO("lambda " << lam);
    CHECK(streamed.loglik(lam) == Approx(full.loglik(lam, true)).epsilon(1e-12));
  }
  std::vector<double> grid, ll;
  LambdaOptions o;
  o.lower = -10.0;
  o.upper = 10.0;
  const LambdaEstimate e =
      estimate_response_lambda_curve(tight.data(), X.data(), n, p, Family::BoxCox, o, 5, &grid, &ll);
  CHECK(e.lambda == Approx(0.0).margin(0.01));  // generated on the log scale
  CHECK(e.converged);
}
