// The coefficient variances without the full covariance matrix: the diagonal of
// (X_k' X_k)^{-1}, NaN for aliased columns, equal to the matrix's own diagonal.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>

#include "powerback/least_squares.hpp"

using namespace powerback;

TEST_CASE("unscaled variances are the covariance's diagonal, NaN where aliased", "[lsq][wide]") {
  // 30 rows, an intercept and 80 random columns: 29 columns can be kept, the rest are aliased.
  std::mt19937_64 gen(31);
  std::normal_distribution<double> nd(0.0, 1.0);
  Eigen::MatrixXd d(30, 81);
  d.col(0).setOnes();
  for (Eigen::Index j = 1; j < d.cols(); ++j)
    for (Eigen::Index i = 0; i < d.rows(); ++i) d(i, j) = nd(gen);
  const LeastSquares ls(d);
  REQUIRE(ls.rank() == 30);
  const Eigen::VectorXd v = ls.unscaled_variances();
  const Eigen::MatrixXd c = ls.unscaled_covariance();
  REQUIRE(v.size() == 81);
  int nan = 0;
  for (Eigen::Index j = 0; j < 81; ++j) {
    if (std::isnan(c(j, j))) {
      CHECK(std::isnan(v(j)));
      ++nan;
    } else {
      // the same sum of squares of a row of R^-1, accumulated in another order
      CHECK(v(j) == Approx(c(j, j)).epsilon(1e-12));
      CHECK(v(j) > 0.0);
    }
  }
  CHECK(nan == 81 - 30);
  CHECK(static_cast<std::size_t>(nan) == ls.aliased().size());
}
