// powerback::lambda_influence against brute-force refits without each row.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <random>
#include <type_traits>
#include <utility>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/influence.hpp"

using namespace powerback;

namespace {
// y = (2 + x1 + 0.5 x2 + e)^2 : a square-root response, positive
void simulate(int n, unsigned seed, std::vector<double>& y, std::vector<double>& X) {
  std::mt19937 gen(seed);
  std::normal_distribution<double> nd;
  std::uniform_real_distribution<double> u(0, 3);
  y.resize(n);
  X.resize(2 * n);
  for (int i = 0; i < n; ++i) {
    X[i] = u(gen);
    X[n + i] = nd(gen);
    const double m = 3 + X[i] + 0.5 * X[n + i] + 0.3 * nd(gen);
    y[i] = m * m;
  }
}
// The data without row k.
std::vector<double> drop_row(const std::vector<double>& v, int n, int cols, int k) {
  std::vector<double> out;
  for (int c = 0; c < cols; ++c)
    for (int i = 0; i < n; ++i)
      if (i != k) out.push_back(v[c * n + i]);
  return out;
}
}  // namespace

TEST_CASE("leave-one-out lambda equals refits without each row", "[influence]") {
  for (const Family fam : {Family::BoxCox, Family::YeoJohnson}) {
    const int n = 40;
    std::vector<double> y, X;
    simulate(n, 17u, y, X);
    y[5] *= 4;  // one strongly influential row
    const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, fam);
    const LambdaEstimate full = estimate_response_lambda(y.data(), X.data(), n, 2, fam);
    // 1e-7: the two factorisations (Householder of the design, blocked R-only) differ by
    // rounding, and Brent stops anywhere in a bracket about 4 * 2^-25 * |lambda| wide
    CHECK(inf.full.lambda == Approx(full.lambda).margin(1e-7));
    std::size_t n_outside = 0, n_at_bound = 0;
    for (int k = 0; k < n; ++k) {
      const std::vector<double> yk = drop_row(y, n, 1, k), Xk = drop_row(X, n, 2, k);
      const LambdaEstimate ref = estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, fam);
      CAPTURE(static_cast<int>(fam), k);
      // both maximisers stop within ~1.5e-8 relative of the same optimum (Brent, half the
      // mantissa), and the interpolation is exact to ~1e-15: 1e-6 leaves a wide margin
      CHECK(inf.loo_lambda[k] == Approx(ref.lambda).margin(1e-6));
      const bool out = ref.lambda < full.conf_low || ref.lambda > full.conf_high;
      CHECK(inf.outside[k] == out);
      CHECK(inf.at_bound[k] == ref.at_bound);
      CHECK(inf.converged[k] == 1);
      n_outside += out;
      n_at_bound += ref.at_bound;
    }
    // the core's counts are those of the refits
    CHECK(inf.n_outside == n_outside);
    CHECK(inf.n_at_bound == n_at_bound);
    // the inflated row is the one that moves lambda-hat most
    int most = 0;
    for (int k = 1; k < n; ++k)
      if (std::fabs(inf.loo_lambda[k] - full.lambda) > std::fabs(inf.loo_lambda[most] - full.lambda))
        most = k;
    CHECK(most == 5);
  }
}

TEST_CASE("a row whose deletion leaves the shared window is solved on the exact profile",
          "[influence]") {
  const int n = 30;
  std::vector<double> y, X;
  simulate(n, 5u, y, X);
  y[2] *= 30;  // a gross outlier: without it lambda-hat moves far beyond the interval
  const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox);
  const std::vector<double> yk = drop_row(y, n, 1, 2), Xk = drop_row(X, n, 2, 2);
  const LambdaEstimate ref = estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, Family::BoxCox);
  // the move is more than the window's reach of 1.5 interval half-widths
  const double half = std::max(inf.full.conf_high - inf.full.lambda, inf.full.lambda - inf.full.conf_low);
  REQUIRE(std::fabs(ref.lambda - inf.full.lambda) > 1.5 * half);
  CHECK(inf.n_exact >= 1);
  // Brent's stopping tolerance (~1.5e-8 relative) on both sides; 1e-6 as for every row
  CHECK(inf.loo_lambda[2] == Approx(ref.lambda).margin(1e-6));
  CHECK(inf.outside[2] == 1);
}

TEST_CASE("leave-one-out lambda at n = 6000 (binned profile) equals refits", "[influence]") {
  const int n = 6000;
  std::vector<double> y, X;
  simulate(n, 11u, y, X);
  const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox);
  CHECK(inf.n_exact == 0);
  for (int k : {0, 17, 2999, 5999}) {
    const std::vector<double> yk = drop_row(y, n, 1, k), Xk = drop_row(X, n, 2, k);
    const LambdaEstimate ref = estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, Family::BoxCox);
    CAPTURE(k);
    // Brent's tolerance (~1.5e-8 relative) on both maximisers
    CHECK(inf.loo_lambda[k] == Approx(ref.lambda).margin(1e-6));
  }
}

TEST_CASE("Yeo-Johnson with responses of both signs equals refits", "[influence]") {
  const int n = 35;
  std::vector<double> y, X;
  simulate(n, 41u, y, X);
  for (int i = 0; i < n; ++i) y[i] -= 20.0;  // about a third of the values below 0
  y[8] -= 30.0;
  const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, Family::YeoJohnson);
  for (int k = 0; k < n; ++k) {
    const std::vector<double> yk = drop_row(y, n, 1, k), Xk = drop_row(X, n, 2, k);
    const LambdaEstimate ref =
        estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, Family::YeoJohnson);
    CAPTURE(k);
    // Brent's tolerance (~1.5e-8 relative) on both maximisers
    CHECK(inf.loo_lambda[k] == Approx(ref.lambda).margin(1e-6));
  }
}

TEST_CASE("leverages come from the one factorisation", "[influence]") {
  const int n = 25;
  std::vector<double> y, X;
  simulate(n, 3u, y, X);
  const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox);
  double sum = 0;
  for (double h : inf.leverage) sum += h;
  // trace of the hat matrix = rank = 3 (intercept and two predictors); rounding only
  CHECK(sum == Approx(3.0).epsilon(1e-12));
}

TEST_CASE("lambda influence rejects bad input", "[influence]") {
  std::vector<double> y = {1, 2, 3, -4, 5, 6}, x = {1, 2, 3, 4, 5, 7};
  CHECK_THROWS_AS(lambda_influence(y.data(), x.data(), 6, 1, Family::BoxCox), IndexedError);
  y[3] = 4;
  CHECK_THROWS_AS(lambda_influence(y.data(), x.data(), 6, 1, Family::Log), Error);
  // 4 rows, rank 2: a left-out fit of 3 rows has 1 residual df, too few for a profile
  CHECK_THROWS_AS(lambda_influence(y.data(), x.data(), 4, 1, Family::BoxCox), Error);
}

namespace {
template <class O, class = void>
struct HasWeights : std::false_type {};
template <class O>
struct HasWeights<O, decltype(void(std::declval<O&>().weights))> : std::true_type {};

// Refits of the weighted data without row k, through the weighted lambda search.
template <class O>
double weighted_refit(const std::vector<double>& y, const std::vector<double>& X,
                      const std::vector<double>& w, int n, int k, O opt) {
  const std::vector<double> yk = drop_row(y, n, 1, k), Xk = drop_row(X, n, 2, k),
                            wk = drop_row(w, n, 1, k);
  if constexpr (HasWeights<O>::value) {
    opt.weights = wk.data();
    return estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, Family::BoxCox, opt).lambda;
  } else {
    return 0.0;
  }
}
// The same weights given through the options instead of the argument.
template <class O>
std::vector<double> through_options(const std::vector<double>& y, const std::vector<double>& X,
                                    const std::vector<double>& w, int n, O opt) {
  if constexpr (HasWeights<O>::value) {
    opt.weights = w.data();
    return lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox, opt).loo_lambda;
  } else {
    return {};
  }
}
}  // namespace

TEST_CASE("weighted leave-one-out lambda equals weighted refits without each row",
          "[influence]") {
  const int n = 40;
  std::vector<double> y, X, w(n);
  simulate(n, 23u, y, X);
  for (int i = 0; i < n; ++i) w[i] = 0.5 + (i % 4);  // precision weights 0.5 .. 3.5
  w[9] = 0.0;  // not used: its estimate is the full one, its leverage 0
  y[9] = -1.0;  // and its value is not checked
  if constexpr (!HasWeights<LambdaOptions>::value) {
    CHECK_THROWS_AS(lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox, {}, w.data()), Error);
    WARN("this core's lambda search has no weights: weighted influence is refused");
  } else {
    const LambdaInfluence inf = lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox, {}, w.data());
    CHECK(inf.loo_lambda[9] == inf.full.lambda);
    CHECK(inf.leverage[9] == 0.0);
    CHECK(through_options(y, X, w, n, LambdaOptions{}) == inf.loo_lambda);
    for (int k = 0; k < n; ++k) {
      if (k == 9) continue;
      CAPTURE(k);
      // Brent's tolerance (~1.5e-8 relative) on both maximisers
      CHECK(inf.loo_lambda[k] == Approx(weighted_refit(y, X, w, n, k, LambdaOptions{})).margin(1e-6));
    }
  }
  // bad weights name their rows
  w[3] = -2.0;
  try {
    lambda_influence(y.data(), X.data(), n, 2, Family::BoxCox, {}, w.data());
    FAIL("a negative weight was accepted");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(e.first_indices() == std::vector<std::size_t>{3});
  }
}
