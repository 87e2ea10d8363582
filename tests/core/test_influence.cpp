// powerback::lambda_influence against brute-force refits without each row.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
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
    int n_outside = 0;
    for (int k = 0; k < n; ++k) {
      const std::vector<double> yk = drop_row(y, n, 1, k), Xk = drop_row(X, n, 2, k);
      const LambdaEstimate ref = estimate_response_lambda(yk.data(), Xk.data(), n - 1, 2, fam);
      CAPTURE(static_cast<int>(fam), k);
      // both maximisers stop within ~1.5e-8 relative of the same optimum (Brent, half the
      // mantissa); 1e-6 is the agreement the method promises
      CHECK(inf.loo_lambda[k] == Approx(ref.lambda).margin(1e-6));
      CHECK(inf.outside[k] == (ref.lambda < full.conf_low || ref.lambda > full.conf_high));
      n_outside += inf.outside[k];
    }
    // the inflated row is the one that moves lambda-hat most
    int most = 0;
    for (int k = 1; k < n; ++k)
      if (std::fabs(inf.loo_lambda[k] - full.lambda) > std::fabs(inf.loo_lambda[most] - full.lambda))
        most = k;
    CHECK(most == 5);
    CHECK(n_outside <= n);
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
