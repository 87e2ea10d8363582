// Residual checks: Breusch-Pagan (Koenker), RESET, Shapiro-Wilk and skewness of residuals.
#include <catch2/catch.hpp>

#include <boost/math/distributions/chi_squared.hpp>
#include <cmath>
#include <random>
#include <vector>

#include "powerback/diagnostics.hpp"
#include "powerback/least_squares.hpp"

using namespace powerback;

namespace {
struct Sim {
  std::vector<double> x, y;
};
// y = 1 + 2x + curve x^2 + (1 + hetero x) e, e ~ N(0, 1), x ~ U(0, 3)
Sim simulate(int n, double curve, double hetero, unsigned seed) {
  std::mt19937 gen(seed);
  std::normal_distribution<double> nd;
  std::uniform_real_distribution<double> ud(0, 3);
  Sim s;
  for (int i = 0; i < n; ++i) {
    const double x = ud(gen);
    s.x.push_back(x);
    s.y.push_back(1 + 2 * x + curve * x * x + (1 + hetero * x) * nd(gen));
  }
  return s;
}
}  // namespace

TEST_CASE("Koenker's Breusch-Pagan is n R^2 of the squared residuals on the regressors", "[diagnostics]") {
  const Sim s = simulate(200, 0.0, 1.5, 3);
  const Model m(s.y.data(), s.x.data(), 200, 1, true, nullptr);
  const ResidualChecks c = residual_checks(m);
  // Definition (Koenker 1981): auxiliary regression of e^2 on [1 x], statistic n R^2 with the
  // centred R^2; computed here with a separate fit of e^2. Tolerance 1e-10: two QR fits of the
  // same data agree to rounding.
  const Eigen::VectorXd e2 = m.residuals().array().square().matrix();
  const LeastSquares aux(s.x.data(), 200, 1);
  const double tss = (e2.array() - e2.mean()).square().sum();
  const double stat = 200 * (1 - aux.rss(e2) / tss);
  CHECK(c.bp_statistic == Approx(stat).epsilon(1e-10));
  CHECK(c.bp_df == 1.0);
  const boost::math::chi_squared cs(1);
  CHECK(c.bp_p == Approx(boost::math::cdf(boost::math::complement(cs, stat))).epsilon(1e-12));
  CHECK(c.bp_p < 1e-4);  // the simulated spread grows 5-fold across x
}

TEST_CASE("RESET equals the F test of the nested fit with fitted^2 and fitted^3", "[diagnostics]") {
  const Sim s = simulate(120, 1.0, 0.0, 8);
  const Model m(s.y.data(), s.x.data(), 120, 1, true, nullptr);
  const ResidualChecks c = residual_checks(m);
  // Ramsey (1969): F = ((RSS0 - RSS1)/2) / (RSS1/(n - 4)) with the raw (uncentred) powers of
  // the fitted values as extra columns. Tolerance 1e-8: the raw powers make a worse-conditioned
  // design than the centred ones the implementation uses.
  std::vector<double> X(120 * 3);
  for (int i = 0; i < 120; ++i) {
    const double f = m.fitted()(i);
    X[i] = s.x[i];
    X[120 + i] = f * f;
    X[240 + i] = f * f * f;
  }
  const LeastSquares big(X.data(), 120, 3);
  const Eigen::VectorXd y = Eigen::Map<const Eigen::VectorXd>(s.y.data(), 120);
  const double rss1 = big.rss(y);
  const double f = ((m.rss() - rss1) / 2) / (rss1 / 116);
  CHECK(c.reset_f == Approx(f).epsilon(1e-8));
  CHECK(c.reset_df1 == 2.0);
  CHECK(c.reset_df2 == 116.0);
  CHECK(c.reset_p < 1e-6);  // the x^2 term is strong and omitted
  const Sim l = simulate(120, 0.0, 0.0, 9);
  CHECK(residual_checks(Model(l.y.data(), l.x.data(), 120, 1, true, nullptr)).reset_p > 0.01);
}

TEST_CASE("normality of residuals and the tests that cannot be computed", "[diagnostics]") {
  // Right-skewed errors (exponential): Shapiro-Wilk rejects and the skewness is positive.
  std::mt19937 gen(12);
  std::exponential_distribution<double> ed(1.0);
  std::vector<double> x, y;
  for (int i = 0; i < 150; ++i) {
    x.push_back(i % 10);
    y.push_back(2 + 0.3 * x.back() + ed(gen));
  }
  const ResidualChecks c = residual_checks(Model(y.data(), x.data(), 150, 1, true, nullptr));
  CHECK(c.sw_computed);
  CHECK(c.sw_p < 1e-4);
  CHECK(c.skewness > 1.0);  // the exponential distribution has skewness 2
  // Intercept-only: no regressor for Breusch-Pagan; the fitted values are constant for RESET.
  const ResidualChecks i0 = residual_checks(Model(y.data(), nullptr, 150, 0, true, nullptr));
  CHECK(std::isnan(i0.bp_statistic));
  CHECK(std::isnan(i0.reset_f));
  CHECK(i0.n == 150);
}
