// powerback::Model reading a borrowed design in place: the same results, bit for bit, as the
// model that copies its design (the reference throughout is that copying model), no copy kept,
// and the checks of the borrowed buffer.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "powerback/diagnostics.hpp"
#include "powerback/errors.hpp"
#include "powerback/mean_interval.hpp"
#include "powerback/model.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {
constexpr std::size_t kN = 40, kP = 3;

// Three predictors (the third is the sum of the first two, so it is aliased) and a positive
// response; deterministic.
struct Data {
  std::vector<double> x, y, w;
};
Data make_data() {
  Data d;
  d.x.resize(kN * kP);
  d.y.resize(kN);
  d.w.resize(kN);
  for (std::size_t i = 0; i < kN; ++i) {
    const double a = 1.0 + 0.25 * static_cast<double>(i), b = std::sin(0.7 * static_cast<double>(i));
    d.x[i] = a;
    d.x[kN + i] = b;
    d.x[2 * kN + i] = a + b;
    d.y[i] = std::exp(0.3 + 0.1 * a - 0.4 * b + 0.2 * std::cos(1.3 * static_cast<double>(i)));
    d.w[i] = (i % 7 == 3) ? 0.0 : 1.0 + static_cast<double>(i % 3);
  }
  return d;
}

// The full design [1 X] in one buffer, as a caller that owns it would hold it.
std::vector<double> full_design(const std::vector<double>& x) {
  std::vector<double> d(kN, 1.0);
  d.insert(d.end(), x.begin(), x.end());
  return d;
}

Transform log_transform() {
  TransformSpec s;
  s.family = Family::Log;
  return Transform(s);
}

// Equal bit for bit, NaN equal to NaN.
bool same(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }
template <class A, class B>
void check_same(const A& a, const B& b) {
  REQUIRE(static_cast<std::size_t>(a.size()) == static_cast<std::size_t>(b.size()));
  for (std::size_t i = 0; i < static_cast<std::size_t>(a.size()); ++i) {
    INFO("element " << i);
    CHECK(same(a[i], b[i]));
  }
}
void check_same_vec(const Eigen::VectorXd& a, const Eigen::VectorXd& b) {
  REQUIRE(a.size() == b.size());
  for (Eigen::Index i = 0; i < a.size(); ++i) {
    INFO("element " << i);
    CHECK(same(a(i), b(i)));
  }
}

void check_same_prediction(const Prediction& a, const Prediction& b) {
  check_same(a.fit, b.fit);
  check_same(a.lower, b.lower);
  check_same(a.upper, b.upper);
  check_same(a.cut_mass, b.cut_mass);
  CHECK(a.flags == b.flags);
}

void check_same_model(const Model& a, const Model& b) {
  CHECK(a.rank() == b.rank());
  CHECK(a.aliased() == b.aliased());
  check_same_vec(a.coefficients(), b.coefficients());
  check_same_vec(a.standard_errors(), b.standard_errors());
  check_same_vec(a.residuals(), b.residuals());
  check_same_vec(a.fitted(), b.fitted());
  check_same_vec(a.leverages(), b.leverages());
  CHECK(a.sigma() == b.sigma());
  CHECK(a.loglik() == b.loglik());
  const Eigen::MatrixXd ca = a.covariance(), cb = b.covariance();
  for (Eigen::Index j = 0; j < ca.cols(); ++j)
    for (Eigen::Index i = 0; i < ca.rows(); ++i) CHECK(same(ca(i, j), cb(i, j)));
  PredictOptions o;
  o.interval = IntervalKind::Prediction;
  o.center = Center::Mean;
  check_same_prediction(a.predict_fitted(o), b.predict_fitted(o));
  const std::vector<double> xnew = {2.0, 3.5, 0.1, -0.6, 2.1, 2.9};
  o.interval = IntervalKind::Confidence;
  check_same_prediction(a.predict(xnew.data(), 2, kP, o), b.predict(xnew.data(), 2, kP, o));
  check_same(a.fit_standard_errors(xnew.data(), 2, kP), b.fit_standard_errors(xnew.data(), 2, kP));
  const ResidualChecks ra = residual_checks(a), rb = residual_checks(b);
  CHECK(same(ra.sw_statistic, rb.sw_statistic));
  CHECK(same(ra.bp_statistic, rb.bp_statistic));
  CHECK(same(ra.reset_f, rb.reset_f));
  const MeanIntervals ma = mean_intervals(a, xnew.data(), 2, kP, nullptr, 0, MeanIntervalOptions());
  const MeanIntervals mb = mean_intervals(b, xnew.data(), 2, kP, nullptr, 0, MeanIntervalOptions());
  check_same(ma.fit, mb.fit);
  check_same(ma.lower, mb.lower);
  check_same(ma.upper, mb.upper);
}
}  // namespace

TEST_CASE("a borrowed design gives the copied design's model bit for bit", "[model][borrow]") {
  const Data d = make_data();
  const std::vector<double> D = full_design(d.x);
  const Transform t = log_transform();
  const Model copied(d.y.data(), d.x.data(), kN, kP, true, &t, 1);
  const Model borrowed(d.y.data(), D.data(), kN, kP, true, &t, 1, nullptr, true);
  REQUIRE(copied.rank() == 3);  // the third predictor is aliased
  CHECK(borrowed.intercept());
  CHECK(borrowed.least_squares().borrowed_design());
  CHECK(!copied.least_squares().borrowed_design());
  // The model reads the caller's buffer itself: no copy of the design is kept.
  CHECK(borrowed.least_squares().design().data() == D.data());
  check_same_model(borrowed, copied);
  // A copy of the model shares the buffer.
  const Model again = borrowed;  // NOLINT(performance-unnecessary-copy-initialization)
  CHECK(again.least_squares().design().data() == D.data());
  check_same_vec(again.leverages(), copied.leverages());
}

TEST_CASE("a borrowed design without an intercept is read as given", "[model][borrow]") {
  const Data d = make_data();
  const Model copied(d.y.data(), d.x.data(), kN, kP, false, nullptr);
  const Model borrowed(d.y.data(), d.x.data(), kN, kP, false, nullptr, 0, nullptr, true);
  CHECK(!borrowed.intercept());
  CHECK(borrowed.least_squares().design().data() == d.x.data());
  check_same_model(borrowed, copied);
}

TEST_CASE("a weighted model with a borrowed design equals the copying one", "[model][borrow][weights]") {
  const Data d = make_data();
  const std::vector<double> D = full_design(d.x);
  const Transform t = log_transform();
  const Model copied(d.y.data(), d.x.data(), kN, kP, true, &t, 0, d.w.data());
  const Model borrowed(d.y.data(), D.data(), kN, kP, true, &t, 0, d.w.data(), true);
  // The weighted rows sqrt(w) [1 X] are the model's own.
  CHECK(!borrowed.least_squares().borrowed_design());
  check_same_model(borrowed, copied);
}

TEST_CASE("a borrowed design is checked", "[model][borrow]") {
  const Data d = make_data();
  std::vector<double> D = full_design(d.x);
  D[5] = 0.5;  // the intercept column, row 5
  try {
    const Model m(d.y.data(), D.data(), kN, kP, true, nullptr, 0, nullptr, true);
    FAIL("no error for a first column that is not all ones");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::Argument);
    CHECK_THAT(e.what(), Contains("all ones") && Contains("row 5"));
  }
  try {  // the same check on the weighted path
    const Model m(d.y.data(), D.data(), kN, kP, true, nullptr, 0, d.w.data(), true);
    FAIL("no error for a first column that is not all ones (weighted)");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::Argument);
    CHECK_THAT(e.what(), Contains("row 5"));
  }
  D[5] = 1.0;
  D[kN + kN + 7] = std::nan("");  // predictor column 1, row 7
  try {
    const Model m(d.y.data(), D.data(), kN, kP, true, nullptr, 0, nullptr, true);
    FAIL("no error for a non-finite predictor");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK_THAT(e.what(), Contains("predictor column 1") && Contains("row 7"));
  }
}
