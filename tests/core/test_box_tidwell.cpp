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
#include "powerback/lambda.hpp"

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

TEST_CASE("advice: linear when the score test does not reject, else a convenient power",
          "[box_tidwell]") {
  // straight lines in x: the rule holds on each of 20 data sets, and since the score test has
  // size 5%, at least 16 of 20 say linear (binomial(20, 0.05): P(more than 4 rejections) < 0.003)
  int linear = 0;
  for (unsigned rep = 0; rep < 20; ++rep) {
    const Sim lin = simulate(1.0, 100, 0.5, 21u + rep);
    const BoxTidwellResult r1 = box_tidwell(lin.y.data(), lin.z.data(), 100, 1, lin.x.data(), 1, {});
    CAPTURE(rep, r1.score_p[0], r1.conf_low[0], r1.conf_high[0]);
    const bool keep = r1.score_p[0] >= 0.05 || (r1.conf_low[0] <= 1 && r1.conf_high[0] >= 1);
    CHECK((r1.advice[0] == BoxTidwellAdvice::Linear) == keep);
    if (keep) CHECK(r1.suggested[0] == 1.0);
    else CHECK(r1.suggested[0] == convenient_lambda(r1.alpha[0], r1.conf_low[0], r1.conf_high[0]));
    linear += keep;
  }
  CHECK(linear >= 16);
  // a reciprocal: the interval excludes 1 and holds -1, the convenient power
  const Sim rec = simulate(-1.0, 300, 0.3, 11u);
  const BoxTidwellResult r2 = box_tidwell(rec.y.data(), rec.z.data(), 300, 1, rec.x.data(), 1, {});
  REQUIRE(r2.conf_low[0] <= -1.0);
  REQUIRE(r2.conf_high[0] >= -1.0);
  CHECK(r2.advice[0] == BoxTidwellAdvice::Power);
  CHECK(r2.suggested[0] == -1.0);
  // the Wald interval is alpha +- 1.959964 se (normal quantile 0.975, from memory to 7 digits)
  CHECK(r2.conf_high[0] - r2.alpha[0] == Approx(1.959964 * r2.se[0]).epsilon(1e-6));
  CHECK(r2.level == 0.95);
}

TEST_CASE("a log relationship is advised as the log", "[box_tidwell]") {
  std::mt19937 gen(4u);
  std::uniform_real_distribution<double> ux(0.5, 20.0);
  std::normal_distribution<double> nd;
  std::vector<double> x, y;
  for (int i = 0; i < 300; ++i) {
    x.push_back(ux(gen));
    y.push_back(2 + 3 * std::log(x.back()) + 0.2 * nd(gen));
  }
  const BoxTidwellResult r = box_tidwell(y.data(), nullptr, 300, 0, x.data(), 1, {});
  REQUIRE(r.conf_low[0] <= 0.0);
  REQUIRE(r.conf_high[0] >= 0.0);
  CHECK(r.advice[0] == BoxTidwellAdvice::Log);
  CHECK(r.suggested[0] == 0.0);
}

TEST_CASE("weights: integer weights equal repeated rows, a zero weight drops its row",
          "[box_tidwell]") {
  const Sim s = simulate(0.5, 80, 0.4, 31u);
  std::vector<double> w(80, 1.0), yr = s.y, xr = s.x, zr = s.z;
  for (int i = 0; i < 80; i += 3) {  // weight 2 = the row twice (same coefficients at every step)
    w[i] = 2.0;
    yr.push_back(s.y[i]);
    xr.push_back(s.x[i]);
    zr.push_back(s.z[i]);
  }
  BoxTidwellOptions ow;
  ow.weights = w.data();
  const BoxTidwellResult rw = box_tidwell(s.y.data(), s.z.data(), 80, 1, s.x.data(), 1, ow);
  const BoxTidwellResult rr = box_tidwell(yr.data(), zr.data(), yr.size(), 1, xr.data(), 1, {});
  // the same weighted normal equations at every step: rounding only (1e-9 for ~10 updates)
  CHECK(rw.alpha[0] == Approx(rr.alpha[0]).epsilon(1e-9));
  CHECK(rw.iterations == rr.iterations);
  CHECK(rw.n == 80);
  // a zero weight is the row left out
  w.assign(80, 1.0);
  w[7] = 0.0;
  const BoxTidwellResult r0 = box_tidwell(s.y.data(), s.z.data(), 80, 1, s.x.data(), 1, ow);
  std::vector<double> y7 = s.y, x7 = s.x, z7 = s.z;
  y7.erase(y7.begin() + 7);
  x7.erase(x7.begin() + 7);
  z7.erase(z7.begin() + 7);
  const BoxTidwellResult rd = box_tidwell(y7.data(), z7.data(), 79, 1, x7.data(), 1, {});
  CHECK(r0.n == 79);
  CHECK(r0.alpha[0] == Approx(rd.alpha[0]).epsilon(1e-12));  // identical fits: rounding only
  CHECK(r0.se[0] == Approx(rd.se[0]).epsilon(1e-12));
  CHECK(r0.score_t[0] == Approx(rd.score_t[0]).epsilon(1e-12));
  // a zero weight lifts the domain check on its row
  std::vector<double> xb = s.x;
  xb[7] = -1.0;
  CHECK_NOTHROW(box_tidwell(s.y.data(), s.z.data(), 80, 1, xb.data(), 1, ow));
  // negative or non-finite weights name their rows
  w[7] = -1.0;
  try {
    box_tidwell(s.y.data(), s.z.data(), 80, 1, s.x.data(), 1, ow);
    FAIL("a negative weight was accepted");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(e.first_indices() == std::vector<std::size_t>{7});
  }
  w[7] = std::nan("");
  CHECK_THROWS_AS(box_tidwell(s.y.data(), s.z.data(), 80, 1, s.x.data(), 1, ow), IndexedError);
}
