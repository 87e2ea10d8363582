// powerback::Model: the fit on the transformed scale, the original-scale log-likelihood,
// predictions and their intervals.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <vector>

#include "powerback/errors.hpp"
#include "powerback/model.hpp"

using namespace powerback;

namespace {
constexpr double kPi = 3.141592653589793238462643383279502884;
Transform make(Family f, double lambda = math::kNaN) {
  TransformSpec s;
  s.family = f;
  s.lambda = lambda;
  return Transform(s);
}
struct Data {
  std::vector<double> x, y;
};
Data lognormal_data(int n, unsigned seed) {
  std::mt19937 gen(seed);
  std::normal_distribution<double> nd;
  std::uniform_real_distribution<double> ud(0, 4);
  Data d;
  for (int i = 0; i < n; ++i) {
    d.x.push_back(ud(gen));
    d.y.push_back(std::exp(1.0 + 0.5 * d.x.back() + 0.4 * nd(gen)));
  }
  return d;
}
}  // namespace

TEST_CASE("a log-response model fits log y and reports the lognormal log-likelihood", "[model]") {
  const Data d = lognormal_data(40, 11);
  const Transform tr = make(Family::Log);
  const Model m(d.y.data(), d.x.data(), d.x.size(), 1, true, &tr, 1);
  std::vector<double> ly;
  for (double v : d.y) ly.push_back(std::log(v));
  const LeastSquares ls(d.x.data(), d.x.size(), 1);
  const Eigen::VectorXd z = Eigen::Map<const Eigen::VectorXd>(ly.data(), 40);
  // Same least squares on log y; tolerance 1e-12 covers rounding of the transform.
  CHECK(m.coefficients()(1) == Approx(ls.coefficients(z)(1)).epsilon(1e-12));
  CHECK(m.sigma() == Approx(std::sqrt(ls.rss(z) / 38)).epsilon(1e-12));
  CHECK(m.df_residual() == 38);
  // SE of the slope = sigma / sqrt(Sxx) (simple regression; Seber & Lee ch. 3).
  double xb = 0;
  for (double v : d.x) xb += v / 40;
  double sxx = 0;
  for (double v : d.x) sxx += (v - xb) * (v - xb);
  CHECK(m.standard_errors()(1) == Approx(m.sigma() / std::sqrt(sxx)).epsilon(1e-12));
  // The original-scale log-likelihood is the sum of lognormal log-densities at the MLE sigma:
  // log f(y) = -log y - log(s) - log(2 pi)/2 - (log y - mu)^2 / (2 s^2) (the lognormal density).
  const double s = std::sqrt(ls.rss(z) / 40);
  const Eigen::VectorXd fit = ls.fitted(z);
  double ll = 0;
  for (int i = 0; i < 40; ++i)
    ll += -ly[i] - std::log(s) - 0.5 * std::log(2 * kPi) - std::pow(ly[i] - fit(i), 2) / (2 * s * s);
  CHECK(m.loglik() == Approx(ll).epsilon(1e-12));
  CHECK(m.loglik_df() == 4.0);  // 2 coefficients + sigma + the declared estimated lambda
}

TEST_CASE("prediction intervals on the transformed scale follow the textbook formula", "[model]") {
  // mu +- t * s * sqrt(h0 + 1) with t_{0.975, 10} = 2.2281388519649385 (Student t tables,
  // from memory). Tolerance 1e-10: the quantile is given to 16 digits.
  std::vector<double> x = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12};
  std::vector<double> y = {2.3, 2.9, 4.4, 4.6, 6.1, 6.3, 8.0, 8.1, 9.7, 10.4, 11.2, 12.9};
  const Model m(y.data(), x.data(), 12, 1, true, nullptr);
  PredictOptions o;
  o.interval = IntervalKind::Prediction;
  const double x0 = 4.5;
  const Prediction p = m.predict(&x0, 1, 1, o);
  double xb = 6.5, sxx = 0;
  for (double v : x) sxx += (v - xb) * (v - xb);
  const double mu = m.coefficients()(0) + m.coefficients()(1) * x0;
  const double h = 1.0 / 12 + (x0 - xb) * (x0 - xb) / sxx;
  const double half = 2.2281388519649385 * m.sigma() * std::sqrt(1 + h);
  CHECK(p.fit[0] == Approx(mu).epsilon(1e-12));
  CHECK(p.lower[0] == Approx(mu - half).epsilon(1e-10));
  CHECK(p.upper[0] == Approx(mu + half).epsilon(1e-10));
  o.interval = IntervalKind::Confidence;
  const Prediction c = m.predict(&x0, 1, 1, o);
  CHECK(c.upper[0] - c.fit[0] == Approx(2.2281388519649385 * m.sigma() * std::sqrt(h)).epsilon(1e-10));
  o.level = 1.0;
  CHECK_THROWS_WITH(m.predict(&x0, 1, 1, o), Catch::Contains("level must lie strictly between 0 and 1"));
}

TEST_CASE("predictions map back through the inverse and flag missing and bounded rows", "[model]") {
  const Data d = lognormal_data(30, 5);
  const Transform tr = make(Family::Log);
  const Model m(d.y.data(), d.x.data(), 30, 1, true, &tr);
  const std::vector<double> xn = {1.0, NAN, 3.0};
  PredictOptions o;
  o.interval = IntervalKind::Confidence;
  const Prediction p = m.predict(xn.data(), 3, 1, o);
  const double mu = m.coefficients()(0) + m.coefficients()(1) * 1.0;
  CHECK(p.fit[0] == Approx(std::exp(mu)).epsilon(1e-13));  // the median exp(mu), rounding only
  CHECK(p.lower[0] < p.fit[0]);
  CHECK(p.upper[0] > p.fit[0]);
  CHECK(p.flags[1] == kPredMissing);
  CHECK(std::isnan(p.fit[1]));
  CHECK(p.flags[0] == 0u);
  // Normal-theory mean of a log model: exp(mu + s^2/2), the lognormal mean (rounding only).
  o.center = Center::Mean;
  o.mean_method = MeanMethod::Normal;
  CHECK(m.predict(xn.data(), 3, 1, o).fit[0] ==
        Approx(std::exp(mu + 0.5 * m.sigma() * m.sigma())).epsilon(1e-13));
  // A Box-Cox 2 fit whose prediction interval reaches below z = -1/2 (y = 0): bounded, lwr 0.
  std::vector<double> y2, x2;
  for (int i = 0; i < 20; ++i) {
    x2.push_back(i);
    y2.push_back(0.2 + 0.05 * i + ((i % 3) - 1) * 0.15);
  }
  const Transform bc2 = make(Family::BoxCox, 2.0);
  const Model m2(y2.data(), x2.data(), 20, 1, true, &bc2);
  o = PredictOptions();
  o.interval = IntervalKind::Prediction;
  const double x0 = 0.0;
  const Prediction b = m2.predict(&x0, 1, 1, o);
  CHECK((b.flags[0] & kPredBounded) != 0u);
  CHECK(b.lower[0] == 0.0);
  CHECK(b.upper[0] > b.fit[0]);
}

TEST_CASE("bad input to a model is refused with the reason", "[model]") {
  std::vector<double> x = {1, 2, 3, 4};
  std::vector<double> y = {1, -2, 3, 4};
  const Transform tr = make(Family::Log);
  CHECK_THROWS_WITH(Model(y.data(), x.data(), 4, 1, true, &tr), Catch::Contains("y"));
  std::vector<double> y2 = {1, 2};
  CHECK_THROWS_AS(Model(y2.data(), x.data(), 2, 1, true, nullptr), Error);  // no residual df
  // Aliased column: the second predictor is twice the first; its coefficient is NaN as in lm.
  std::vector<double> X = {1, 2, 3, 4, 6, 2, 4, 6, 8, 12};
  std::vector<double> y3 = {1.1, 1.9, 3.2, 3.9, 6.1};
  const Model m(y3.data(), X.data(), 5, 2, true, nullptr);
  CHECK(m.rank() == 2);
  CHECK(m.aliased() == std::vector<bool>{false, false, true});
  CHECK(std::isnan(m.coefficients()(2)));
  CHECK(std::isnan(m.standard_errors()(2)));
  const std::vector<double> xn = {2.5, 5.0};
  const Prediction p = m.predict(xn.data(), 1, 2, PredictOptions());
  CHECK(p.fit[0] == Approx(m.coefficients()(0) + 2.5 * m.coefficients()(1)).epsilon(1e-13));
}
