// powerback::Model with precision weights: the weighted regression it amounts to, and
// predictions at its own rows.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback/diagnostics.hpp"
#include "powerback/model.hpp"

using namespace powerback;

namespace {
const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
const std::vector<double> kY = {2.2, 2.9, 4.1, 5.3, 5.8, 7.4, 7.9, 9.6, 9.9, 11.8};
const std::vector<double> kW = {1, 2, 1, 3, 1, 2, 1, 3, 1, 2};
}  // namespace

TEST_CASE("a weighted model is its weighted regression", "[model][weights]") {
  const Model m(kY.data(), kX.data(), kX.size(), 1, true, nullptr, 0, kW.data());
  const Model r = m.weighted_regression();
  REQUIRE(!r.weighted());
  REQUIRE(!r.intercept());  // sqrt(w) is not a constant column
  // The regression of sqrt(w) y on sqrt(w) [1 x] has the same coefficients and RSS
  // (weighted least squares by definition; 1e-12 relative for two factorisations).
  for (Eigen::Index j = 0; j < 2; ++j)
    CHECK(r.coefficients()(j) == Approx(m.coefficients()(j)).epsilon(1e-12));
  CHECK(r.rss() == Approx(m.rss()).epsilon(1e-12));
  for (std::size_t i = 0; i < kX.size(); ++i)
    CHECK(r.residuals()(static_cast<Eigen::Index>(i)) ==
          Approx(std::sqrt(kW[i]) * m.residuals()(static_cast<Eigen::Index>(i))).epsilon(1e-12));
  // Its checks are the weighted model's.
  const ResidualChecks a = residual_checks(m), b = residual_checks(r);
  CHECK(a.bp_statistic == b.bp_statistic);
  CHECK(a.reset_f == b.reset_f);
}

TEST_CASE("predictions at the model's own rows", "[model][weights]") {
  const Model m(kY.data(), kX.data(), kX.size(), 1, true, nullptr, 0, kW.data());
  PredictOptions o;
  o.interval = IntervalKind::Confidence;
  const Prediction a = m.predict_fitted(o);
  const Prediction b = m.predict(kX.data(), kX.size(), 1, o);
  // The weighted model's rows are recovered from sqrt(w) [1 x] by dividing by sqrt(w): equal to
  // a few ulps (1e-13 relative).
  for (std::size_t i = 0; i < kX.size(); ++i) {
    CHECK(a.fit[i] == Approx(b.fit[i]).epsilon(1e-13));
    CHECK(a.lower[i] == Approx(b.lower[i]).epsilon(1e-13));
    CHECK(a.fit[i] == Approx(m.fitted()(static_cast<Eigen::Index>(i))).epsilon(1e-13));
  }
}
