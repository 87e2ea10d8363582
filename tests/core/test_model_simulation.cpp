// Simulations with a known truth: coverage of original-scale prediction intervals and bias of
// the back-transformed centers. Seeded, so each run draws the same numbers.
#include <catch2/catch.hpp>

#include <cmath>
#include <functional>
#include <random>
#include <vector>

#include "powerback/model.hpp"

using namespace powerback;

namespace {

Transform make(Family f) {
  TransformSpec s;
  s.family = f;
  return Transform(s);
}

// One truth: z = a + b x + sigma e with e ~ N(0, 1), y = inverse(z); x ~ U(0, 4).
struct Truth {
  double a, b, sigma;
  std::function<double(double)> inverse;
};

void draw(const Truth& t, int n, std::mt19937& gen, std::vector<double>& x, std::vector<double>& y) {
  std::normal_distribution<double> nd;
  std::uniform_real_distribution<double> ud(0, 4);
  x.resize(n);
  y.resize(n);
  for (int i = 0; i < n; ++i) {
    x[i] = ud(gen);
    y[i] = t.inverse(t.a + t.b * x[i] + t.sigma * nd(gen));
  }
}

// Coverage of 95% prediction intervals over 10 training sets of 400 rows, each followed by 400
// fresh draws (4000 in all). Averaging over training sets keeps the spread of sigma-hat (about
// 1% of coverage for one fit) from dominating: the result has SD about 0.5%.
double coverage(const Truth& t, Family f, unsigned seed) {
  std::mt19937 gen(seed);
  std::vector<double> x, y, xf, yf;
  const Transform tr = make(f);
  PredictOptions o;
  o.interval = IntervalKind::Prediction;
  int in = 0;
  for (int k = 0; k < 10; ++k) {
    draw(t, 400, gen, x, y);
    const Model m(y.data(), x.data(), x.size(), 1, true, &tr);
    draw(t, 400, gen, xf, yf);
    const Prediction p = m.predict(xf.data(), xf.size(), 1, o);
    for (std::size_t i = 0; i < yf.size(); ++i) in += (yf[i] >= p.lower[i] && yf[i] <= p.upper[i]);
  }
  return in / 4000.0;
}

struct Centers {
  double median, smearing, normal, se;  // averages over replications; se of the mean estimates
};

// Average predicted centers at x0 over `reps` independent training sets of size n.
Centers centers(const Truth& t, Family f, double x0, int reps, int n, unsigned seed) {
  std::mt19937 gen(seed);
  std::vector<double> x, y;
  const Transform tr = make(f);
  double med = 0, sm = 0, nm = 0, sm2 = 0;
  PredictOptions o;
  for (int r = 0; r < reps; ++r) {
    draw(t, n, gen, x, y);
    const Model m(y.data(), x.data(), x.size(), 1, true, &tr);
    o.center = Center::Median;
    med += m.predict(&x0, 1, 1, o).fit[0];
    o.center = Center::Mean;
    o.mean_method = MeanMethod::Smearing;
    const double s = m.predict(&x0, 1, 1, o).fit[0];
    sm += s;
    sm2 += s * s;
    o.mean_method = MeanMethod::Normal;
    nm += m.predict(&x0, 1, 1, o).fit[0];
  }
  Centers c;
  c.median = med / reps;
  c.smearing = sm / reps;
  c.normal = nm / reps;
  c.se = std::sqrt((sm2 / reps - c.smearing * c.smearing) / reps);
  return c;
}

}  // namespace

TEST_CASE("lognormal truth: 95% prediction intervals cover 95% of fresh draws", "[simulation]") {
  // +-1.5% is the tolerance the issue asks for; about 3 SD of the averaged coverage.
  const Truth t{1.0, 0.5, 0.5, [](double z) { return std::exp(z); }};
  CHECK(std::fabs(coverage(t, Family::Log, 2024) - 0.95) <= 0.015);
}

TEST_CASE("square-root-normal truth: 95% prediction intervals cover 95% of fresh draws", "[simulation]") {
  // z = sqrt(y) ~ N(3 + 0.5 x, 0.4^2), so z < 0 has probability below 1e-13 and y = z^2.
  const Truth t{3.0, 0.5, 0.4, [](double z) { return z * z; }};
  CHECK(std::fabs(coverage(t, Family::Sqrt, 77) - 0.95) <= 0.015);
}

TEST_CASE("lognormal truth: mean estimates unbiased and the median biased low", "[simulation]") {
  // True mean at x0 = 2: exp(a + 2b + sigma^2/2) (lognormal mean); median exp(a + 2b).
  const Truth t{1.0, 0.5, 0.5, [](double z) { return std::exp(z); }};
  const double truth = std::exp(2.0 + 0.125);
  const Centers c = centers(t, Family::Log, 2.0, 400, 60, 99);
  // Unbiased within Monte-Carlo error: 4 standard errors of the average of 400 replications
  // (the normal-theory mean has a small-sample bias of order sigma^2/n, well inside that band).
  CHECK(std::fabs(c.smearing - truth) < 4 * c.se);
  CHECK(std::fabs(c.normal - truth) < 4 * c.se);
  // The median back-transform estimates exp(a + 2b), 1 - exp(-1/8) = 11.8% below the mean.
  CHECK(c.median < truth - 10 * c.se);
  CHECK(c.median / truth == Approx(std::exp(-0.125)).epsilon(0.02));  // 2%: a few SE of the average
}

TEST_CASE("square-root-normal truth: mean estimates unbiased and the median biased low", "[simulation]") {
  // y = z^2 with z ~ N(mu, s^2): E[y] = mu^2 + s^2 (normal second moment); the median is mu^2.
  const Truth t{3.0, 0.5, 0.4, [](double z) { return z * z; }};
  const double mu = 4.0, truth = mu * mu + 0.16;
  const Centers c = centers(t, Family::Sqrt, 2.0, 400, 60, 123);
  CHECK(std::fabs(c.smearing - truth) < 4 * c.se);  // Monte-Carlo error, as above
  CHECK(std::fabs(c.normal - truth) < 4 * c.se);
  CHECK(c.median < truth - 0.1);  // biased low by s^2 = 0.16, about 16 SE
}
