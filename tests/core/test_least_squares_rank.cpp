// LeastSquares and factor_tall on wide designs, on columns of extreme magnitude, and under a
// cancellation check.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <random>
#include <vector>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "powerback/tall_qr.hpp"

using namespace powerback;

namespace {

// lm's rule by its definition, one least-squares solve per column: a column is aliased when the
// residual of regressing it on the columns kept before it has norm < tol * its own norm, or when
// as many columns as rows are already kept. An independent reference for the one-pass code.
std::vector<std::size_t> aliased_by_definition(const Eigen::MatrixXd& d, double tol) {
  std::vector<std::size_t> kept, aliased;
  for (Eigen::Index j = 0; j < d.cols(); ++j) {
    const double own = d.col(j).norm();
    double resid = own;
    if (!kept.empty()) {
      Eigen::MatrixXd k(d.rows(), static_cast<Eigen::Index>(kept.size()));
      for (std::size_t i = 0; i < kept.size(); ++i) k.col(static_cast<Eigen::Index>(i)) = d.col(static_cast<Eigen::Index>(kept[i]));
      const Eigen::VectorXd b = k.colPivHouseholderQr().solve(d.col(j));
      resid = (d.col(j) - k * b).norm();
    }
    if (static_cast<Eigen::Index>(kept.size()) == d.rows() || !(own > 0) || resid < tol * own)
      aliased.push_back(static_cast<std::size_t>(j));
    else
      kept.push_back(static_cast<std::size_t>(j));
  }
  return aliased;
}

Eigen::MatrixXd normal(Eigen::Index n, Eigen::Index p, unsigned seed) {
  std::mt19937 g(seed);
  std::normal_distribution<double> nd;
  Eigen::MatrixXd x(n, p);
  for (Eigen::Index j = 0; j < p; ++j)
    for (Eigen::Index i = 0; i < n; ++i) x(i, j) = nd(g);
  return x;
}

}  // namespace

TEST_CASE("wide designs: one pass keeps the columns lm keeps", "[lsq][rank]") {
  // 25 rows, 600 predictors, with dependent columns planted before and after the 25th kept one.
  const Eigen::Index n = 25, p = 600;
  Eigen::MatrixXd x = normal(n, p, 11);
  x.col(3) = 2 * x.col(0) - x.col(1);            // depends on earlier columns
  x.col(7) = x.col(5);                            // duplicate
  x.col(10).setConstant(4.0);                     // aliased with the intercept
  x.col(12) = x.col(2) + 1e-9 * x.col(11);        // within lm's 1e-7 of column 2
  x.col(15).setZero();                            // zero column
  x.col(40) = x.col(39);                          // beyond the rank: aliased either way
  const LeastSquares ls(x.data(), static_cast<std::size_t>(n), static_cast<std::size_t>(p));
  Eigen::MatrixXd d(n, p + 1);
  d << Eigen::VectorXd::Ones(n), x;
  CHECK(ls.aliased() == aliased_by_definition(d, kRankTolerance));
  REQUIRE(ls.rank() == static_cast<std::size_t>(n));
  CHECK(ls.aliased().size() == static_cast<std::size_t>(p + 1 - n));
  // Design columns 4, 8, 11, 13, 16 (X columns 3, 7, 10, 12, 15) are among the aliased.
  for (std::size_t c : {4u, 8u, 11u, 13u, 16u})
    CHECK(std::find(ls.aliased().begin(), ls.aliased().end(), c) != ls.aliased().end());
  // With rank = n the fit is exact: every response is reproduced, nothing is left over.
  const Eigen::VectorXd y = normal(n, 1, 12).col(0);
  CHECK(ls.rss(y) <= 1e-20 * y.squaredNorm());  // rounding only: 1e-20 ~ (1e-10 relative)^2
  CHECK((ls.fitted(y) - y).norm() <= 1e-10 * y.norm());
  // factor_tall decides the same on R alone.
  const TallFactor f = factor_tall(x.data(), static_cast<std::size_t>(n), static_cast<std::size_t>(p));
  CHECK(f.kept == ls.kept());
  CHECK(f.aliased == ls.aliased());
}

TEST_CASE("wide designs: 50 rows and 5000 columns in one factorisation", "[lsq][rank]") {
  const Eigen::Index n = 50, p = 5000;
  Eigen::MatrixXd x = normal(n, p, 21);
  x.col(20) = x.col(4) - 3 * x.col(9);
  const LeastSquares ls(x.data(), static_cast<std::size_t>(n), static_cast<std::size_t>(p));
  REQUIRE(ls.rank() == static_cast<std::size_t>(n));
  // The kept columns: the intercept and X columns 0..48 except column 20, then column 49.
  std::vector<std::size_t> want;
  for (std::size_t c = 0; c <= 50; ++c)
    if (c != 21) want.push_back(c);
  CHECK(ls.kept() == want);
  CHECK(ls.aliased().size() == static_cast<std::size_t>(p + 1 - n));
}

TEST_CASE("columns of extreme magnitude give the same fit in any units", "[lsq][rank][scale]") {
  const Eigen::Index n = 40;
  Eigen::MatrixXd x = normal(n, 3, 31);
  x.col(2) = x.col(0) - 0.5 * x.col(1);  // aliased at every scale
  const Eigen::VectorXd y = (1.0 + 2.0 * x.col(0).array() - x.col(1).array()).matrix() + 0.3 * normal(n, 1, 32).col(0);
  const LeastSquares base(x.data(), static_cast<std::size_t>(n), 3);
  REQUIRE(base.aliased() == std::vector<std::size_t>{3});
  const Eigen::VectorXd b0 = base.coefficients(y), h0 = base.leverages();
  for (double unit : {1e-200, 1e-155, 1e-8, 1e8, 1e200}) {
    CAPTURE(unit);
    const Eigen::MatrixXd xs = x * unit;
    const LeastSquares ls(xs.data(), static_cast<std::size_t>(n), 3);
    CHECK(ls.aliased() == base.aliased());
    // The fit is the same up to the rounding of x * unit (one ulp per entry, times the design's
    // small condition number): 1e-12 relative.
    CHECK(ls.rss(y) == Approx(base.rss(y)).epsilon(1e-12));
    CHECK((ls.leverages() - h0).norm() <= 1e-12 * h0.norm());
    const Eigen::VectorXd b = ls.coefficients(y);
    CHECK(b(0) == Approx(b0(0)).epsilon(1e-12));
    CHECK(b(1) * unit == Approx(b0(1)).epsilon(1e-12));
    CHECK(b(2) * unit == Approx(b0(2)).epsilon(1e-12));
    // The tall factor decides alike and its R carries the units: R'R = X'X.
    const TallFactor f = factor_tall(xs.data(), static_cast<std::size_t>(n), 3);
    CHECK(f.aliased == base.aliased());
    CHECK(f.r(1, 1) / unit == Approx(base.r()(1, 1)).epsilon(1e-12));
  }
  // A column of 1e-160 next to a column of 1e+160: neither is mistaken for zero.
  Eigen::MatrixXd mixed(n, 2);
  mixed << 1e-160 * x.col(0), 1e160 * x.col(1);
  const LeastSquares ls(mixed.data(), static_cast<std::size_t>(n), 2);
  CHECK(ls.aliased().empty());
  CHECK(ls.rss(y) == Approx(LeastSquares(x.data(), static_cast<std::size_t>(n), 2).rss(y)).epsilon(1e-12));
}

TEST_CASE("a cancellation check stops a long rank decision", "[lsq][rank][cancel]") {
  const Eigen::Index n = 30, p = 400;
  Eigen::MatrixXd x = normal(n, p, 41);
  x.col(1) = x.col(0);  // an early alias: the decision continues column by column
  int polls = 0;
  {
    CancelScope scope([&polls] { return ++polls >= 5; });
    try {
      const LeastSquares ls(x.data(), static_cast<std::size_t>(n), static_cast<std::size_t>(p));
      FAIL("no cancellation");
    } catch (const Error& e) {
      CHECK(e.code() == ErrorCode::Cancelled);
    }
    CHECK(polls == 5);
  }
  // Outside the scope no check is installed: the same design factors.
  const LeastSquares ls(x.data(), static_cast<std::size_t>(n), static_cast<std::size_t>(p));
  CHECK(ls.rank() == static_cast<std::size_t>(n));
  CHECK(polls == 5);
  // A check that throws counts as asking to stop.
  CancelScope scope([]() -> bool { throw 1; });
  CHECK_THROWS_AS(poll_cancel(), Error);
}
