// factor_tall (the blocked, Q-less QR) against the full Householder QR of LeastSquares and
// against X'X formed directly.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <limits>
#include <random>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/tall_qr.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {

std::vector<double> normal_matrix(std::size_t n, std::size_t p, unsigned seed) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::vector<double> X(n * p);
  for (auto& v : X) v = nd(g);
  return X;
}

Eigen::MatrixXd with_intercept(const std::vector<double>& X, std::size_t n, std::size_t p) {
  Eigen::MatrixXd d(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(p + 1));
  d.col(0).setOnes();
  d.rightCols(static_cast<Eigen::Index>(p)) =
      Eigen::Map<const Eigen::MatrixXd>(X.data(), static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(p));
  return d;
}

// The rank decision and R'R of the kept columns agree with LeastSquares on the same design.
void same_as_least_squares(const std::vector<double>& X, std::size_t n, std::size_t p) {
  const TallFactor f = factor_tall(X.data(), n, p);
  const LeastSquares ls(X.data(), n, p);
  CHECK(f.kept == ls.kept());
  CHECK(f.aliased == ls.aliased());
  REQUIRE(f.rank() == ls.rank());
  const Eigen::MatrixXd a = f.r.transpose() * f.r, b = ls.r().transpose() * ls.r();
  // Both are X_k'X_k up to rounding of two backward-stable factorisations: 1e-12 of its size.
  CHECK((a - b).norm() <= 1e-12 * b.norm());
}

}  // namespace

TEST_CASE("tall QR: R'R equals X'X across many blocks", "[tallqr]") {
  const std::size_t n = 3 * kTallBlockRows + 17, p = 6;  // three full blocks and a short one
  std::vector<double> X = normal_matrix(n, p, 41);
  for (std::size_t i = 0; i < n; ++i) X[2 * n + i] = 1e3 * X[2 * n + i] + 5e3;  // uneven scales
  const TallFactor f = factor_tall(X.data(), n, p);
  CHECK(f.n == n);
  CHECK(f.columns == p + 1);
  CHECK(f.rank() == p + 1);
  CHECK(f.aliased.empty());
  const Eigen::MatrixXd d = with_intercept(X, n, p);
  const Eigen::MatrixXd xtx = d.transpose() * d;
  const Eigen::MatrixXd rtr = f.r.transpose() * f.r;
  // Entry by entry relative to the geometric mean of the two diagonals (the scale of each
  // entry): 1e-12, far above the O(n eps) rounding of either side.
  for (Eigen::Index i = 0; i < xtx.rows(); ++i)
    for (Eigen::Index j = 0; j < xtx.cols(); ++j)
      CHECK(std::fabs(rtr(i, j) - xtx(i, j)) <= 1e-12 * std::sqrt(xtx(i, i) * xtx(j, j)));
  CHECK((f.r.triangularView<Eigen::StrictlyLower>().toDenseMatrix().array() == 0.0).all());
  same_as_least_squares(X, n, p);
}

TEST_CASE("tall QR: lm's rank rule as LeastSquares applies it", "[tallqr]") {
  const std::size_t n = kTallBlockRows + 500, p = 6;
  std::mt19937_64 g(42);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::vector<double> X = normal_matrix(n, p, 43);
  for (std::size_t i = 0; i < n; ++i) {
    X[1 * n + i] = X[0 * n + i];                                   // exact duplicate of column 1
    X[3 * n + i] = 2.0 * X[0 * n + i] - X[2 * n + i] + 1.0;        // combination incl. intercept
    X[4 * n + i] = 0.0;                                            // zero column
    X[5 * n + i] = X[2 * n + i] + 1e-9 * nd(g);                    // aliased: 1e-9 below tol 1e-7
  }
  const TallFactor f = factor_tall(X.data(), n, p);
  CHECK(f.aliased == std::vector<std::size_t>{2, 4, 5, 6});  // design columns (0 = intercept)
  CHECK(f.kept == std::vector<std::size_t>{0, 1, 3});
  same_as_least_squares(X, n, p);

  // 1e-5 of its own norm left over is above lm's tolerance: kept.
  for (std::size_t i = 0; i < n; ++i) X[5 * n + i] = X[2 * n + i] + 1e-5 * nd(g);
  const TallFactor f2 = factor_tall(X.data(), n, p);
  CHECK(f2.kept == std::vector<std::size_t>{0, 1, 3, 6});
  same_as_least_squares(X, n, p);
}

TEST_CASE("tall QR: fewer rows than columns", "[tallqr]") {
  const std::vector<double> X = normal_matrix(3, 5, 44);  // 3 x 6 design: rank 3
  const TallFactor f = factor_tall(X.data(), 3, 5);
  CHECK(f.rank() == 3);
  CHECK(f.kept == std::vector<std::size_t>{0, 1, 2});
  same_as_least_squares(X, 3, 5);
  const TallFactor no_icpt = factor_tall(X.data(), 3, 5, false);
  CHECK(no_icpt.columns == 5);
  CHECK(no_icpt.kept == std::vector<std::size_t>{0, 1, 2});
  CHECK(no_icpt.aliased == std::vector<std::size_t>{3, 4});
}

TEST_CASE("tall QR: the visitor sees every row once, in order", "[tallqr]") {
  const std::size_t n = 2 * kTallBlockRows + 3, p = 2;
  const std::vector<double> X = normal_matrix(n, p, 45);
  Eigen::MatrixXd seen = Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(n), 3, std::nan(""));
  std::size_t next = 0, calls = 0;
  factor_tall(X.data(), n, p, true, kRankTolerance,
              [&](std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
                CHECK(r0 == next);
                REQUIRE(block.cols() == 3);
                seen.middleRows(static_cast<Eigen::Index>(r0), block.rows()) = block;
                next += static_cast<std::size_t>(block.rows());
                ++calls;
              });
  CHECK(next == n);
  CHECK(calls == 3);
  CHECK(seen == with_intercept(X, n, p));
}

TEST_CASE("tall QR: bad input", "[tallqr][errors]") {
  std::vector<double> X = normal_matrix(kTallBlockRows + 10, 3, 46);
  X[2 * (kTallBlockRows + 10) + kTallBlockRows + 4] = std::numeric_limits<double>::quiet_NaN();
  try {
    factor_tall(X.data(), kTallBlockRows + 10, 3);
    FAIL("no error");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK_THAT(e.what(), Contains("predictor column 2") && Contains("row 4100 (0-based)"));
  }
  CHECK_THROWS_AS(factor_tall(X.data(), 0, 3), Error);
  CHECK_THROWS_AS(factor_tall(nullptr, 5, 3), Error);
  CHECK_THROWS_AS(factor_tall(nullptr, 5, 0, false), Error);
  const std::vector<double> zeros(10, 0.0);
  try {
    factor_tall(zeros.data(), 5, 2, false);
    FAIL("no error");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::Singular);
  }
}
