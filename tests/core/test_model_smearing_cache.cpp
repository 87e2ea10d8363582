// The smearing summary a Model keeps after its first mean prediction: later predictions, from
// one thread or several at once, equal the pairwise smearing mean of the model's residuals.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <thread>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/model.hpp"
#include "powerback/transform.hpp"

using namespace powerback;

TEST_CASE("model: kept smearing summary gives the pairwise mean on every call and thread",
          "[model][smearing]") {
  std::mt19937 gen(11);
  std::normal_distribution<double> nd(0.0, 0.3);
  const std::size_t n = 400, m = 50;
  std::vector<double> x(n), y(n), xnew(m);
  for (std::size_t i = 0; i < n; ++i) {
    x[i] = 1.0 + 0.01 * static_cast<double>(i);
    y[i] = std::pow(1.0 + 0.25 * (0.5 + 0.4 * x[i] + nd(gen)), 4.0);  // Box-Cox 0.25 scale
  }
  for (std::size_t i = 0; i < m; ++i) xnew[i] = 1.0 + 0.07 * static_cast<double>(i);
  TransformSpec spec;
  spec.family = Family::BoxCox;
  spec.lambda = 0.25;
  const Transform t(spec);
  const Model model(y.data(), x.data(), n, 1, true, &t);
  PredictOptions opt;
  opt.center = Center::Mean;
  opt.interval = IntervalKind::Prediction;
  PredictOptions med = opt;
  med.center = Center::Median;
  med.interval = IntervalKind::None;
  med.transformed_scale = true;
  const Prediction mu = model.predict(xnew.data(), m, 1, med);
  const Eigen::VectorXd& e = model.residuals();
  std::vector<double> ref(m);
  for (std::size_t i = 0; i < m; ++i)
    ref[i] = smearing_mean(t, mu.fit[i], e.data(), static_cast<std::size_t>(e.size())).value;
  const Prediction first = model.predict(xnew.data(), m, 1, opt);
  const Prediction second = model.predict(xnew.data(), m, 1, opt);
  std::vector<Prediction> threaded(4);
  {
    std::vector<std::thread> workers;
    for (auto& out : threaded)
      workers.emplace_back([&model, &xnew, &opt, &out] { out = model.predict(xnew.data(), 50, 1, opt); });
    for (auto& w : workers) w.join();
  }
  for (std::size_t i = 0; i < m; ++i) {
    // the residual tree is exact to rounding against the pairwise sum (smearing.hpp): 1e-12
    CHECK(first.fit[i] == Approx(ref[i]).epsilon(1e-12));
    CHECK(second.fit[i] == first.fit[i]);  // the same kept summary: bit for bit
    for (const Prediction& p : threaded) CHECK(p.fit[i] == first.fit[i]);
  }
}
