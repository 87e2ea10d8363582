// powerback::LeastSquares against closed forms and hand-built references.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"

using namespace powerback;

TEST_CASE("simple regression matches the textbook formulas", "[lsq]") {
  // Closed forms of simple linear regression (any regression text, e.g. Seber & Lee ch. 3):
  // b1 = Sxy / Sxx, b0 = ybar - b1 xbar, h_ii = 1/n + (x_i - xbar)^2 / Sxx.
  const std::vector<double> x = {1, 2, 4, 7, 11, 12};
  const std::vector<double> yv = {2.1, 2.9, 5.2, 8.1, 12.5, 13.0};
  const LeastSquares ls(x.data(), x.size(), 1);
  Eigen::VectorXd y = Eigen::Map<const Eigen::VectorXd>(yv.data(), 6);
  double xb = 0, yb = 0;
  for (int i = 0; i < 6; ++i) { xb += x[i] / 6; yb += yv[i] / 6; }
  double sxx = 0, sxy = 0;
  for (int i = 0; i < 6; ++i) { sxx += (x[i] - xb) * (x[i] - xb); sxy += (x[i] - xb) * (yv[i] - yb); }
  const Eigen::VectorXd b = ls.coefficients(y);
  CHECK(b(1) == Approx(sxy / sxx).epsilon(1e-13));
  CHECK(b(0) == Approx(yb - sxy / sxx * xb).epsilon(1e-13));
  const Eigen::VectorXd h = ls.leverages();
  double rss = 0;
  for (int i = 0; i < 6; ++i) {
    CHECK(h(i) == Approx(1.0 / 6 + (x[i] - xb) * (x[i] - xb) / sxx).epsilon(1e-13));
    const double e = yv[i] - b(0) - b(1) * x[i];
    rss += e * e;
  }
  CHECK(ls.rss(y) == Approx(rss).epsilon(1e-12));
  CHECK(ls.residuals(y).squaredNorm() == Approx(rss).epsilon(1e-12));
  CHECK(ls.df_residual() == 4);
  // unscaled covariance: Var(b1)/sigma^2 = 1/Sxx
  CHECK(ls.unscaled_covariance()(1, 1) == Approx(1 / sxx).epsilon(1e-12));
  Eigen::MatrixXd row(1, 2);
  row << 1, x[2];
  CHECK(ls.variance_factor(row)(0) == Approx(h(2)).epsilon(1e-12));
}

TEST_CASE("aliased columns are dropped in order as lm does", "[lsq]") {
  std::mt19937 gen(7);
  std::normal_distribution<double> nd;
  const int n = 30;
  Eigen::MatrixXd X(n, 4);
  for (int i = 0; i < n; ++i) {
    X(i, 0) = nd(gen);
    X(i, 1) = nd(gen);
    X(i, 2) = 2 * X(i, 0) - X(i, 1) + 3;  // depends on the intercept and the first two
    X(i, 3) = nd(gen);
  }
  const LeastSquares ls(X.data(), n, 4);
  CHECK(ls.rank() == 4);
  CHECK(ls.aliased() == std::vector<std::size_t>{3});  // design column 3 = X column 2
  Eigen::VectorXd y(n);
  for (int i = 0; i < n; ++i) y(i) = 1 + X(i, 0) + 0.5 * X(i, 3) + 0.1 * nd(gen);
  const Eigen::VectorXd b = ls.coefficients(y);
  CHECK(std::isnan(b(3)));
  // same fit as the design without the aliased column
  Eigen::MatrixXd X3(n, 3);
  X3 << X.col(0), X.col(1), X.col(3);
  const LeastSquares ref(X3.data(), n, 3);
  CHECK(ls.rss(y) == Approx(ref.rss(y)).epsilon(1e-12));
  CHECK(b(4) == Approx(ref.coefficients(y)(3)).epsilon(1e-12));
}

TEST_CASE("more columns than rows and degenerate designs", "[lsq]") {
  Eigen::MatrixXd X(3, 4);
  X << 1, 2, 3, 4, 2, 1, 0, 5, 7, 1, 2, 2;
  const LeastSquares ls(X.data(), 3, 4);
  CHECK(ls.rank() == 3);
  CHECK(ls.df_residual() == 0);
  CHECK(ls.aliased() == std::vector<std::size_t>{3, 4});
  const std::vector<double> zero(5, 0.0);
  CHECK_THROWS_AS(LeastSquares(zero.data(), 5, 1, false), Error);
  const std::vector<double> bad = {1, NAN, 3};
  CHECK_THROWS_WITH(LeastSquares(bad.data(), 3, 1), Catch::Matchers::Contains("row 1"));
}
