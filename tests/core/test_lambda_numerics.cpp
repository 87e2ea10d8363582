// Lambda estimation: overflow-free profiles, identities the profile must satisfy, flags and the
// convenient rule.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;

namespace {
std::vector<double> lognormal(std::size_t n, double sd, unsigned seed) {
  std::mt19937_64 g(seed);
  std::lognormal_distribution<double> d(0.0, sd);
  std::vector<double> x(n);
  for (auto& v : x) v = d(g);
  return x;
}
double at(const std::vector<double>& x, Family f, double lam) {
  return lambda_profile(x.data(), x.size(), f, &lam, 1)[0];
}
}  // namespace

TEST_CASE("Box-Cox profile shifts by -n log c when the data are scaled by c", "[lambda][numerics]") {
  // Scaling x by c leaves the fitted model unchanged and multiplies the density by c^-n
  // (the Jacobian), so l(lambda; c x) = l(lambda; x) - n log c exactly. With c = 1e190 the
  // data reach 1e190+ and lambda = 3 or -3 would overflow a direct evaluation.
  const auto x = lognormal(200, 2.0, 7);
  std::vector<double> big(x), tiny(x);
  for (auto& v : big) v *= 1e190;
  for (auto& v : tiny) v *= 1e-190;
  const double n = 200;
  for (double lam : {-3.0, -1.0, 0.0, 0.5, 3.0}) {
    INFO("lambda " << lam);
    const double l0 = at(x, Family::BoxCox, lam);
    REQUIRE(std::isfinite(at(big, Family::BoxCox, lam)));
    // 1e-12 relative: the two sides differ only by rounding of sums of 200 logs.
    CHECK(at(big, Family::BoxCox, lam) == Approx(l0 - n * std::log(1e190)).epsilon(1e-12));
    CHECK(at(tiny, Family::BoxCox, lam) == Approx(l0 + n * std::log(1e190)).epsilon(1e-12));
  }
  const LambdaEstimate a = estimate_lambda(x.data(), x.size(), Family::BoxCox);
  const LambdaEstimate b = estimate_lambda(big.data(), big.size(), Family::BoxCox);
  CHECK(b.lambda == Approx(a.lambda).margin(1e-6));  // minimiser precision
  CHECK(b.conf_low == Approx(a.conf_low).margin(1e-8));
}

TEST_CASE("Box-Cox on values up to 1e200 at lambda 3 stays finite", "[lambda][numerics]") {
  const std::vector<double> x = {1.0, 5.0, 1e10, 3e50, 1e100, 2e150, 1e200};
  const double l3 = at(x, Family::BoxCox, 3.0);
  CHECK(std::isfinite(l3));
  const LambdaEstimate e = estimate_lambda(x.data(), x.size(), Family::BoxCox);
  CHECK(std::isfinite(e.loglik));
  CHECK(e.loglik >= l3);
}

TEST_CASE("Yeo-Johnson profile matches a long double evaluation for huge values", "[lambda][numerics]") {
  // Reference: the transformed values and their variance in long double (range to 1e4932),
  // straight from the definition (Yeo & Johnson 2000, eq. 2.1), where double would overflow.
  const std::vector<double> x = {-4e120, -30.0, -1.5, 0.0, 2.0, 17.0, 9e80, 3e150};
  for (double lam : {-2.5, 0.7, 1.0, 2.0, 3.0}) {
    long double mean = 0, ss = 0, jac = 0;
    std::vector<long double> z;
    for (double v : x) {
      long double zi;
      if (v >= 0) {
        zi = lam == 0 ? std::log1p((long double)v)
                      : (std::pow((long double)v + 1, (long double)lam) - 1) / lam;
        jac += (lam - 1) * std::log1p((long double)v);
      } else {
        const long double m = 2 - lam;
        zi = m == 0 ? -std::log1p(-(long double)v) : -(std::pow(1 - (long double)v, m) - 1) / m;
        jac += (1 - lam) * std::log1p(-(long double)v);
      }
      z.push_back(zi);
      mean += zi / x.size();
    }
    for (auto zi : z) ss += (zi - mean) * (zi - mean);
    const long double n = x.size();
    const long double want = -n / 2 * (std::log(2 * M_PIl) + 1 + std::log(ss / n)) + jac;
    INFO("lambda " << lam);
    // 1e-12 relative: double evaluation of the same quantity in log space.
    CHECK(at(x, Family::YeoJohnson, lam) == Approx(static_cast<double>(want)).epsilon(1e-12));
  }
}

TEST_CASE("profile is continuous through lambda 0 and Yeo-Johnson's lambda 2", "[lambda][numerics]") {
  const auto x = lognormal(50, 0.8, 3);
  // expm1-based powers: the profile at +-1e-9 differs from the log limit by O(1e-9) only.
  const double l0 = at(x, Family::BoxCox, 0.0);
  CHECK(at(x, Family::BoxCox, 1e-9) == Approx(l0).epsilon(1e-9));
  CHECK(at(x, Family::BoxCox, -1e-9) == Approx(l0).epsilon(1e-9));
  std::vector<double> s(x);
  for (auto& v : s) v = std::log(v) * 3.0;  // mixed signs
  const double l2 = at(s, Family::YeoJohnson, 2.0);
  CHECK(at(s, Family::YeoJohnson, 2.0 + 1e-9) == Approx(l2).epsilon(1e-9));
  CHECK(at(s, Family::YeoJohnson, 2.0 - 1e-9) == Approx(l2).epsilon(1e-9));
}

TEST_CASE("estimate at a range edge is flagged with an open side", "[lambda][numerics]") {
  const auto x = lognormal(300, 1.0, 11);  // lambda-hat near 0
  LambdaOptions opt;
  opt.lower = 0.5;
  opt.upper = 3.0;
  const LambdaEstimate e = estimate_lambda(x.data(), x.size(), Family::BoxCox, opt);
  CHECK(e.at_bound);
  CHECK(e.lambda == 0.5);
  CHECK(e.low_open);
  CHECK(e.conf_low == 0.5);
  CHECK_FALSE(e.high_open);
  CHECK(e.conf_high > 0.5);
  CHECK(e.conf_high < 1.0);
  CHECK(e.convenient == 0.5);
}

TEST_CASE("a flat profile gives open sides and no error", "[lambda][numerics]") {
  const std::vector<double> x = {1.0, 2.0, 3.5, 2.5};
  LambdaOptions opt;
  opt.lower = -1.0;
  opt.upper = 1.0;
  const LambdaEstimate e = estimate_lambda(x.data(), x.size(), Family::BoxCox, opt);
  CHECK(e.low_open);
  CHECK(e.high_open);
  CHECK(e.conf_low == -1.0);
  CHECK(e.conf_high == 1.0);
  CHECK(e.converged);
}

TEST_CASE("convenient lambda follows the contract rule", "[lambda]") {
  CHECK(convenient_lambda(-0.8, -1.2, -0.3) == -1.0);
  CHECK(convenient_lambda(1.2, 0.6, 2.5) == 1.0);
  CHECK(convenient_lambda(0.3, 0.1, 0.45) == 1.0 / 3.0);  // the cube root lies inside
  CHECK(convenient_lambda(0.3, 0.1, 0.3) == 0.3);        // none inside: rounded lambda
  CHECK(convenient_lambda(0.2345, 0.1, 0.3) == 0.23);
  CHECK(convenient_lambda(-0.3, -0.32, -0.1) == -0.3);
  CHECK(convenient_lambda(-0.3, -0.4, -0.1) == -1.0 / 3.0);
  CHECK(convenient_lambda(1.0 / 6.0, -0.2, 0.7) == 0.0);  // tie between 0 and 1/3: the smaller
  CHECK(convenient_lambda(0.42, 0.0, 0.7) == 0.5);        // 1/2 nearer than 1/3
  // Ozone ~ Solar.R + Wind + Temp on datasets::airquality has the interval [0.084, 0.365]
  // around 0.22 (this package's estimate): the cube root.
  CHECK(convenient_lambda(0.22, 0.084, 0.365) == 1.0 / 3.0);
  CHECK(convenient_lambda(-2.7, -3.0, -2.0) == -2.0);  // interval endpoints count as inside
}

TEST_CASE("response profile equals a refit of the transformed response", "[lambda][numerics]") {
  // Reference: z computed directly, least squares by Eigen's column-pivoting QR solve, RSS of
  // its residuals, then the profile formula with the Box-Cox Jacobian (lambda - 1) sum log y.
  std::mt19937_64 g(5);
  std::normal_distribution<double> nd(0.0, 1.0);
  const int n = 80, p = 3;
  Eigen::MatrixXd X(n, p);
  std::vector<double> y(n);
  for (int i = 0; i < n; ++i) {
    for (int j = 0; j < p; ++j) X(i, j) = nd(g);
    y[i] = std::exp(0.5 + 0.3 * X(i, 0) - 0.2 * X(i, 2) + 0.4 * nd(g));
  }
  const LeastSquares ls(X.data(), n, p);
  const double grid[] = {-1.5, -0.3, 0.0, 0.8, 2.2};
  const auto prof = response_lambda_profile(y.data(), ls, Family::BoxCox, grid, 5);
  Eigen::MatrixXd D(n, p + 1);
  D.col(0).setOnes();
  D.rightCols(p) = X;
  double slog = 0;
  for (double v : y) slog += std::log(v);
  for (int k = 0; k < 5; ++k) {
    Eigen::VectorXd z(n);
    for (int i = 0; i < n; ++i) z(i) = grid[k] == 0 ? std::log(y[i]) : (std::pow(y[i], grid[k]) - 1) / grid[k];
    const Eigen::VectorXd b = D.colPivHouseholderQr().solve(z);
    const double rss = (z - D * b).squaredNorm();
    const double want = -0.5 * n * (std::log(2 * M_PI) + 1 + std::log(rss / n)) + (grid[k] - 1) * slog;
    INFO("lambda " << grid[k]);
    CHECK(prof[static_cast<std::size_t>(k)] == Approx(want).epsilon(1e-11));  // two QRs, rounding only
  }
  const LambdaEstimate e = estimate_response_lambda(y.data(), ls, Family::BoxCox);
  CHECK(e.lambda > -0.6);  // generated on the log scale: lambda-hat near 0
  CHECK(e.lambda < 0.6);
  CHECK(e.conf_low < 0.0);
  CHECK(e.conf_high > 0.0);
  CHECK(e.convenient == Approx(0.0).margin(0.34));  // one of 0 and -+1/3
  CHECK((e.convenient == 0.0 || std::fabs(std::fabs(e.convenient) - 1.0 / 3.0) < 1e-15));
  const auto grid101 = profile_grid(e);
  REQUIRE(grid101.size() == 101);
  CHECK(grid101.front() <= e.conf_low - 0.5);
  CHECK(grid101.back() >= e.conf_high + 0.5);
  CHECK(grid101.front() >= -3.0);
  CHECK(grid101.back() <= 3.0);
}
