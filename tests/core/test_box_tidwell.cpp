// powerback::box_tidwell on simulated data with known powers, its first step against the
// closed form, and its errors.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "powerback/box_tidwell.hpp"
#include "powerback/errors.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {
struct Sim {
  std::vector<double> y, x, z;
};
// y = 1 + 4 x^alpha + 0.5 z + e, x ~ U(0.5, 6), z ~ N(0, 1), e ~ N(0, sd^2)
Sim simulate(double alpha, int n, double sd, unsigned seed) {
  std::mt19937 gen(seed);
  std::uniform_real_distribution<double> ux(0.5, 6.0);
  std::normal_distribution<double> nd;
  Sim s;
  for (int i = 0; i < n; ++i) {
    const double x = ux(gen), z = nd(gen);
    s.x.push_back(x);
    s.z.push_back(z);
    s.y.push_back(1 + 4 * std::pow(x, alpha) + 0.5 * z + sd * nd(gen));
  }
  return s;
}
// Coefficients by the normal equations (X'X) b = X'y, independent of the QR code under test.
Eigen::VectorXd normal_equations(const Eigen::MatrixXd& d, const std::vector<double>& y) {
  const Eigen::VectorXd yv = Eigen::Map<const Eigen::VectorXd>(y.data(), static_cast<Eigen::Index>(y.size()));
  return (d.transpose() * d).ldlt().solve(d.transpose() * yv);
}
}  // namespace

TEST_CASE("known powers 0.5 and -1 are recovered within 2 standard errors", "[box_tidwell]") {
  for (const double alpha : {0.5, -1.0}) {
    // 20 simulated data sets: the estimate is asymptotically normal around alpha (Box & Tidwell
    // 1962), so about 95% lie within 2 SE; at least 16 of 20 must (binomial P(fewer) < 0.003)
    int within = 0;
    for (unsigned rep = 0; rep < 20; ++rep) {
      const Sim s = simulate(alpha, 200, 0.3, 1000u * (alpha > 0 ? 1u : 2u) + rep);
      const BoxTidwellResult r = box_tidwell(s.y.data(), s.z.data(), s.y.size(), 1, s.x.data(), 1, {});
      CAPTURE(alpha, rep, r.alpha[0], r.se[0]);
      CHECK(r.converged);
      CHECK(r.se[0] > 0);
      within += std::fabs(r.alpha[0] - alpha) < 2 * r.se[0] ? 1 : 0;
      CHECK(r.history.front()[0] == 1.0);
      CHECK(r.history.back()[0] == Approx(r.alpha[0]).epsilon(1e-12));
    }
    CHECK(within >= 16);
    const Sim s = simulate(alpha, 300, 0.3, 11u);
    const BoxTidwellResult r = box_tidwell(s.y.data(), s.z.data(), s.y.size(), 1, s.x.data(), 1, {});
    CHECK(r.score_p[0] < 1e-6);  // a strongly curved truth: the score test of power 1 rejects
  }
}

TEST_CASE("the first update is the closed form 1 + g/b", "[box_tidwell]") {
  // Box & Tidwell (1962): from a = 1, a1 = 1 + g/b with b the slope of x in y ~ 1 + z + x and
  // g the coefficient of x log x in y ~ 1 + z + x + x log x; computed here by normal equations.
  const Sim s = simulate(0.5, 120, 0.5, 5u);
  const Eigen::Index n = 120;
  Eigen::MatrixXd d1(n, 3), d2(n, 4);
  for (Eigen::Index i = 0; i < n; ++i) {
    d1.row(i) << 1, s.z[i], s.x[i];
    d2.row(i) << 1, s.z[i], s.x[i], s.x[i] * std::log(s.x[i]);
  }
  const double b = normal_equations(d1, s.y)(2), g = normal_equations(d2, s.y)(3);
  BoxTidwellOptions opt;
  opt.max_iter = 1;
  const BoxTidwellResult r = box_tidwell(s.y.data(), s.z.data(), s.y.size(), 1, s.x.data(), 1, opt);
  // normal equations lose about cond(X'X) * eps ~ 1e-11 here; 1e-8 leaves room
  CHECK(r.history.at(1)[0] == Approx(1 + g / b).epsilon(1e-8));
  CHECK(r.iterations == 1);
  CHECK_FALSE(r.converged);  // one update cannot meet tol = 1e-6 from a start 0.5 away
  // score t at power 1: g / se(g) of the same fit
  const Eigen::VectorXd yv = Eigen::Map<const Eigen::VectorXd>(s.y.data(), n);
  const Eigen::VectorXd e = yv - d2 * normal_equations(d2, s.y);
  const double s2 = e.squaredNorm() / static_cast<double>(n - 4);
  const double se_g = std::sqrt(s2 * (d2.transpose() * d2).inverse()(3, 3));
  CHECK(r.score_t[0] == Approx(g / se_g).epsilon(1e-7));  // same fit, two algorithms
  CHECK(r.score_df == 116);
}

TEST_CASE("the powers do not depend on the scale of x", "[box_tidwell]") {
  const Sim s = simulate(-1.0, 150, 0.2, 9u);
  std::vector<double> x1000 = s.x;
  for (double& v : x1000) v *= 1000;
  const BoxTidwellResult a = box_tidwell(s.y.data(), nullptr, s.y.size(), 0, s.x.data(), 1, {});
  const BoxTidwellResult b = box_tidwell(s.y.data(), nullptr, s.y.size(), 0, x1000.data(), 1, {});
  // (c x)^a = c^a x^a spans the same column: identical up to rounding and tol = 1e-6
  CHECK(a.alpha[0] == Approx(b.alpha[0]).margin(1e-6));
  CHECK(a.se[0] == Approx(b.se[0]).epsilon(1e-5));
}

TEST_CASE("two variables at once", "[box_tidwell]") {
  std::mt19937 gen(3);
  std::uniform_real_distribution<double> u(1, 8);
  std::normal_distribution<double> nd;
  const int n = 400;
  std::vector<double> y(n), X(2 * n);
  for (int i = 0; i < n; ++i) {
    X[i] = u(gen);
    X[n + i] = u(gen);
    y[i] = 2 + 3 * std::sqrt(X[i]) + 5 / X[n + i] + 0.1 * nd(gen);
  }
  const BoxTidwellResult r = box_tidwell(y.data(), nullptr, n, 0, X.data(), 2, {});
  CHECK(r.converged);
  // simulated from powers 0.5 and -1; 2 SE as above
  CHECK(std::fabs(r.alpha[0] - 0.5) < 2 * r.se[0]);
  CHECK(std::fabs(r.alpha[1] + 1.0) < 2 * r.se[1]);
}

TEST_CASE("non-positive values name the variable and rows", "[box_tidwell]") {
  std::vector<double> y = {1, 2, 3, 4, 5, 6, 7, 8}, x = {1, 2, 0, 4, -5, 6, 7, 8};
  try {
    box_tidwell(y.data(), nullptr, 8, 0, x.data(), 1, {});
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(e.count() == 2);
    CHECK(e.first_indices() == std::vector<std::size_t>{2, 4});
    CHECK_THAT(e.what(), Contains("Box-Tidwell variable 0 must be > 0") && Contains("rows 2, 4"));
  }
  CHECK_THROWS_AS(box_tidwell(y.data(), nullptr, 8, 0, x.data(), 0, {}), Error);
  std::vector<double> few = {1, 2, 3};  // 3 rows, 3 columns in [1, x, x log x]
  CHECK_THROWS_WITH(box_tidwell(few.data(), nullptr, 3, 0, few.data(), 1, {}),
                    Contains("more rows"));
}

TEST_CASE("an unidentified power is flagged as not converged", "[box_tidwell]") {
  // y is pure noise, unrelated to x: the power has no information and this seed's iteration
  // oscillates (found by running seeds 1-5 with libstdc++'s distributions; 3 does not settle)
  std::mt19937 gen(3);
  std::uniform_real_distribution<double> u(1, 5);
  std::normal_distribution<double> nd;
  std::vector<double> y(50), x(50);
  for (int i = 0; i < 50; ++i) {
    x[i] = u(gen);
    y[i] = nd(gen);
  }
  const BoxTidwellResult r = box_tidwell(y.data(), nullptr, 50, 0, x.data(), 1, {});
  CHECK_FALSE(r.converged);
  CHECK(r.iterations == 50);
  CHECK(r.last_change > 1e-6);
  CHECK(r.history.size() == 51);
  // no information: the standard error dwarfs any plausible power
  CHECK(r.se[0] > 2);
}
