// LeastSquares::factor_with_response (one blocked pass over [design | y], no Q kept) against the
// Householder factorisation of the same design, which keeps Q.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <thread>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/tall_qr.hpp"

using namespace powerback;

namespace {

// Largest |a - b| / max(|b|, 1e-300) over the finite entries; NaN positions must agree.
double rel_diff(const Eigen::VectorXd& a, const Eigen::VectorXd& b) {
  REQUIRE(a.size() == b.size());
  double m = 0;
  for (Eigen::Index i = 0; i < a.size(); ++i) {
    REQUIRE(std::isnan(a(i)) == std::isnan(b(i)));
    if (std::isnan(b(i))) continue;
    m = std::max(m, std::fabs(a(i) - b(i)) / std::max(std::fabs(b(i)), 1e-300));
  }
  return m;
}

// n rows (more than one block of kTallBlockRows) of p predictors on very different scales.
std::vector<double> predictors(std::size_t n, std::size_t p, unsigned seed) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> z(0.0, 1.0);
  std::vector<double> x(n * p);
  for (std::size_t j = 0; j < p; ++j)
    for (std::size_t i = 0; i < n; ++i) x[j * n + i] = std::ldexp(z(rng), 40 * static_cast<int>(j) - 60);
  return x;
}

}  // namespace

// Both paths solve the same least-squares problem; on designs of condition about 1e3 (after the
// exact column scaling) they agree to rounding, so 1e-10 leaves about 1e3 units of slack.
TEST_CASE("the one-pass fit equals the Householder fit", "[lsq][response]") {
  const std::size_t n = 3 * kTallBlockRows + 123, p = 4;
  const std::vector<double> x = predictors(n, p, 11);
  std::mt19937_64 rng(5);
  std::normal_distribution<double> z(0.0, 1.0);
  Eigen::VectorXd y(static_cast<Eigen::Index>(n));
  for (std::size_t i = 0; i < n; ++i) y(static_cast<Eigen::Index>(i)) = 3.0 + std::ldexp(x[i], 60) + z(rng);
  const LeastSquares ref(x.data(), n, p, true);
  LeastSquares one(LeastSquares::Deferred{}, x.data(), n, p, true);
  const LeastSquares::ResponseFit f = one.factor_with_response(y);
  CHECK(one.rank() == ref.rank());
  CHECK(one.kept() == ref.kept());
  CHECK(rel_diff(f.coefficients, ref.coefficients(y)) < 1e-10);
  CHECK(std::fabs(f.rss - ref.rss(y)) < 1e-10 * ref.rss(y));
  CHECK(rel_diff(one.leverages(), ref.leverages()) < 1e-10);
  CHECK(one.leverages() == one.leverages());  // kept after the first call
  const Eigen::MatrixXd ca = one.unscaled_covariance(), cb = ref.unscaled_covariance();
  CHECK(rel_diff(Eigen::Map<const Eigen::VectorXd>(ca.data(), ca.size()),
                 Eigen::Map<const Eigen::VectorXd>(cb.data(), cb.size())) < 1e-10);
  // Q-based calls on the one-pass factor build their reflectors on first use.
  const Eigen::VectorXd u = y.array().square().matrix();
  CHECK(std::fabs(one.rss(u) - ref.rss(u)) < 1e-10 * ref.rss(u));
  CHECK(rel_diff(one.coefficients(y), ref.coefficients(y)) < 1e-10);
}

TEST_CASE("the one-pass fit drops the aliased columns lm drops", "[lsq][response]") {
  // Column 3 = column 1 + 2 * column 2 (aliased), column 4 is zero (aliased), column 5 is free.
  const std::size_t n = kTallBlockRows + 50;
  std::vector<double> x = predictors(n, 5, 3);
  for (std::size_t i = 0; i < n; ++i) {
    x[0 * n + i] = std::ldexp(x[0 * n + i], 60);
    x[1 * n + i] = std::ldexp(x[1 * n + i], 20);
    x[2 * n + i] = x[0 * n + i] + 2.0 * x[1 * n + i];
    x[3 * n + i] = 0.0;
    x[4 * n + i] = std::ldexp(x[4 * n + i], -100);
  }
  Eigen::VectorXd y(static_cast<Eigen::Index>(n));
  for (std::size_t i = 0; i < n; ++i) y(static_cast<Eigen::Index>(i)) = std::sin(0.01 * static_cast<double>(i)) + x[i];
  const LeastSquares ref(x.data(), n, 5, true);
  LeastSquares one(LeastSquares::Deferred{}, x.data(), n, 5, true);
  const LeastSquares::ResponseFit f = one.factor_with_response(y);
  REQUIRE(ref.aliased() == std::vector<std::size_t>{3, 4});
  CHECK(one.aliased() == ref.aliased());
  CHECK(std::isnan(f.coefficients(3)));
  CHECK(std::isnan(f.coefficients(4)));
  CHECK(rel_diff(f.coefficients, ref.coefficients(y)) < 1e-10);
  CHECK(std::fabs(f.rss - ref.rss(y)) < 1e-10 * ref.rss(y));
  CHECK(rel_diff(one.leverages(), ref.leverages()) < 1e-10);
}

TEST_CASE("an exact fit gives RSS 0 and the exact coefficients", "[lsq][response]") {
  // y = 2 + 3 x exactly (small integers: every product and sum is exact in double).
  const std::vector<double> x = {1, 2, 3, 4, 5, 6, 7, 8};
  Eigen::VectorXd y(8);
  for (int i = 0; i < 8; ++i) y(i) = 2.0 + 3.0 * x[static_cast<std::size_t>(i)];
  LeastSquares one(LeastSquares::Deferred{}, x.data(), 8, 1, true);
  const LeastSquares::ResponseFit f = one.factor_with_response(y);
  CHECK(f.coefficients(0) == Approx(2.0).epsilon(1e-13));
  CHECK(f.coefficients(1) == Approx(3.0).epsilon(1e-13));
  CHECK(f.rss < 1e-24);  // rounding of sums of values up to 26^2 * 8, far below any real RSS
}

TEST_CASE("the one-pass fit rejects a response of the wrong length or with NaN", "[lsq][response]") {
  const std::vector<double> x = {1, 2, 3, 4};
  LeastSquares one(LeastSquares::Deferred{}, x.data(), 4, 1, true);
  CHECK_THROWS_AS(one.factor_with_response(Eigen::VectorXd::Ones(3)), Error);
  Eigen::VectorXd y = Eigen::VectorXd::Ones(4);
  y(2) = std::nan("");
  CHECK_THROWS_AS(one.factor_with_response(y), Error);
}

TEST_CASE("reflectors built on first use are safe from several threads", "[lsq][response]") {
  const std::size_t n = 2000;
  const std::vector<double> x = predictors(n, 2, 9);
  Eigen::VectorXd y(static_cast<Eigen::Index>(n));
  for (std::size_t i = 0; i < n; ++i) y(static_cast<Eigen::Index>(i)) = std::cos(static_cast<double>(i));
  const LeastSquares ref(x.data(), n, 2, true);
  LeastSquares one(LeastSquares::Deferred{}, x.data(), n, 2, true);
  one.factor_with_response(y);
  std::vector<double> got(4, 0.0);
  std::vector<std::thread> ts;
  for (std::size_t t = 0; t < got.size(); ++t)
    ts.emplace_back([&, t] { got[t] = one.rss(y); });
  for (auto& th : ts) th.join();
  for (double g : got) CHECK(std::fabs(g - ref.rss(y)) < 1e-10 * ref.rss(y));
}
