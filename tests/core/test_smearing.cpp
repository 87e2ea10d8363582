// The linear-time smearing mean against the pairwise mean over every (row, residual) pair.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/errors.hpp"
#include "test_support.hpp"
#include "powerback/smearing.hpp"

using namespace powerback;

namespace {

using pwbtest::make;

std::vector<double> residuals(std::size_t n, double sd, unsigned seed, bool skewed = false) {
  std::mt19937 gen(seed);
  std::normal_distribution<double> nd(0.0, sd);
  std::vector<double> e(n);
  for (auto& v : e) {
    v = nd(gen);
    if (skewed) v = sd * (std::exp(v / sd) - std::exp(0.5));  // a lognormal shape, centred
  }
  return e;
}

// mean_j |T^{-1}(mu + e_j)|: the rounding scale of the pairwise sum itself.
double abs_scale(const Transform& t, double mu, const std::vector<double>& e) {
  double s = 0;
  for (double v : e) s += std::fabs(invert_bounded(t, mu + v).value);
  return s / static_cast<double>(e.size());
}

// Compares every row of a grid; returns the number of rows compared.
int compare_grid(const Transform& t, const std::vector<double>& e, double mu_lo, double mu_hi, int steps) {
  const Smearing sm(t, e.data(), e.size());
  int rows = 0;
  for (int i = 0; i <= steps; ++i) {
    const double mu = mu_lo + (mu_hi - mu_lo) * i / steps;
    const BackValue want = smearing_mean(t, mu, e.data(), e.size());
    const BackValue got = sm.mean(mu);
    INFO(t.describe() << " at mu = " << mu << ": pairwise " << want.value << ", fast " << got.value);
    CHECK(got.bounded == want.bounded);
    if (std::isfinite(want.value)) {
      // 1e-12 of mean |term|: the pairwise sum's own rounding is ~n * 1e-16 = 3e-13 of it, and the
      // series truncation is below 4^-26 = 2e-16 of each node's sum.
      CHECK(std::fabs(got.value - want.value) <= 1e-12 * abs_scale(t, mu, e));
    } else {
      CHECK(got.value == want.value);
    }
    ++rows;
  }
  return rows;
}

}  // namespace

TEST_CASE("smearing: closed forms for the identity and log families", "[smearing]") {
  const std::vector<double> e = residuals(2000, 0.7, 1);
  CHECK(compare_grid(make(Family::Log), e, -5, 5, 40) == 41);
  CHECK(compare_grid(make(Family::Log10), e, -3, 3, 40) == 41);
  CHECK(compare_grid(make(Family::BoxCox, 0.0), e, -5, 5, 20) == 21);
  CHECK(compare_grid(make(Family::Identity), e, -5, 5, 20) == 21);
  CHECK(compare_grid(make(Family::Log, math::kNaN, 0.5), e, -2, 4, 20) == 21);
  CHECK(compare_grid(make(Family::Log, math::kNaN, 0.0, true, 50.0), e, -2, 3, 20) == 21);
  // Terms that overflow: exp(708.5 + e) is infinite for e > 1.28, so the mean is Inf, flagged.
  compare_grid(make(Family::Log), e, 705, 712, 14);
  // Duan (1983) closed form for the log model: exp(mu) * mean(exp(e)). Tolerance 1e-14:
  // the same sums in a different order.
  double m = 0;
  for (double v : e) m += std::exp(v);
  m /= static_cast<double>(e.size());
  const Smearing sm(make(Family::Log), e.data(), e.size());
  CHECK(sm.mean(1.5).value == Approx(std::exp(1.5) * m).epsilon(1e-14));
}

TEST_CASE("smearing: power families match the pairwise mean, range limits included", "[smearing]") {
  const std::vector<double> e = residuals(3000, 0.5, 2);
  const std::vector<double> sk = residuals(3000, 0.4, 3, true);
  // Box-Cox: limit at z = -1/lambda (2 for lambda -0.5, -2 for 0.5); grids cross it.
  for (double l : {0.5, -0.5, 1.7, -1.3, 0.02, -0.02, 1.0, 3.0}) {
    compare_grid(make(Family::BoxCox, l), e, -1 / l - 3, -1 / l + 3, 60);
    compare_grid(make(Family::BoxCox, l), sk, -1 / l - 3, -1 / l + 3, 60);
    compare_grid(make(Family::BoxCox, l), e, l > 0 ? 5 : -5, l > 0 ? 40 : -40, 10);
  }
  compare_grid(make(Family::BoxCox, 0.5, 1.0), e, -4, 6, 40);
  compare_grid(make(Family::BoxCox, -0.5, 0.0, true, 30.0), e, -1, 3, 40);
  compare_grid(make(Family::Sqrt), e, -1.5, 6, 60);
  compare_grid(make(Family::Sqrt), sk, -1.5, 6, 60);
  compare_grid(make(Family::Reciprocal), e, -6, 1.5, 60);
  compare_grid(make(Family::Power, 0.3), e, -4, 4, 60);
  compare_grid(make(Family::Power, 2.0), e, -4, 4, 60);
  compare_grid(make(Family::Power, -0.7), e, -6, 1.5, 60);
  compare_grid(make(Family::Power, -2.5), sk, -6, 1.5, 60);
}

TEST_CASE("smearing: Yeo-Johnson, asinh and logit match the pairwise mean", "[smearing]") {
  const std::vector<double> e = residuals(3000, 0.6, 4);
  const std::vector<double> sk = residuals(3000, 0.5, 5, true);
  for (double l : {0.5, 0.0, 2.0, 1.3, -0.5, 2.5, -1.5, 3.5}) {
    compare_grid(make(Family::YeoJohnson, l), e, -5, 5, 80);
    compare_grid(make(Family::YeoJohnson, l), sk, -5, 5, 40);
  }
  compare_grid(make(Family::Asinh), e, -6, 6, 80);
  compare_grid(make(Family::Asinh), sk, -6, 6, 40);
  const std::vector<double> wide = residuals(3000, 1.5, 6);
  compare_grid(make(Family::Logit), wide, -12, 12, 80);
  compare_grid(make(Family::Logit), e, -40, 40, 40);
  compare_grid(make(Family::Logit, math::kNaN, 0.0, true, 1.0), wide, -5, 5, 20);
}

TEST_CASE("smearing: Yeo-Johnson across its branch point, long tails and tiny residuals", "[smearing]") {
  // A long right tail and a short left one: the tree splits clamp to an eighth there.
  const std::vector<double> sk = residuals(40000, 0.8, 11, true);
  for (double l : {0.5, 0.0, 2.0, 1.3, -0.5, 2.5}) compare_grid(make(Family::YeoJohnson, l), sk, -4, 3, 28);
  // Every term within 0.01 of the branch point: leaves and nodes there use the polynomials at
  // z = 0 instead of log1p/expm1.
  const std::vector<double> tiny = residuals(5000, 1e-3, 12);
  for (double l : {0.5, 0.0, 2.0, 1.3, -0.5, 2.5, -1.5, 3.5})
    compare_grid(make(Family::YeoJohnson, l), tiny, -0.004, 0.004, 16);
  for (double l : {0.5, 0.0, 2.5}) {
    SmearingWork w;
    Smearing(make(Family::YeoJohnson, l), tiny.data(), tiny.size()).mean(0.001, &w);
    CHECK(w.zero_polynomial >= 1);
  }
  // Rows whose branch point lies among the residuals: about one node per tree level on each side
  // of it (2 log2(40000 / 32) = 21) and a leaf or two summed directly (at most 32 each).
  const Smearing sm(make(Family::YeoJohnson, 0.5), sk.data(), sk.size());
  for (double mu : {-1.5, -0.3, 0.0, 0.4, 1.0, 2.5}) {
    SmearingWork w;
    sm.mean(mu, &w);
    INFO("mu = " << mu << ": " << w.series_nodes << " nodes, " << w.direct_terms << " direct terms");
    CHECK(w.series_nodes <= 40);
    CHECK(w.direct_terms <= 64);
  }
}

TEST_CASE("smearing: overflowing terms give the pairwise Inf and flag", "[smearing]") {
  const std::vector<double> e = residuals(2000, 1.0, 7);
  // sinh and expm1 overflow past z = 710.5 / 709.8; power 0.01 (z^100) past z = 1.2e3.
  compare_grid(make(Family::Asinh), e, 705, 713, 16);
  compare_grid(make(Family::YeoJohnson, 0.0), e, 704, 712, 16);
  compare_grid(make(Family::Power, 0.01), e, 1175, 1185, 20);
  compare_grid(make(Family::BoxCox, -0.5), e, 1.0, 2.5, 30);  // near the pole of the inverse
}

TEST_CASE("smearing does not visit every residual", "[smearing]") {
  const std::vector<double> e = residuals(20000, 0.5, 8);
  const Smearing sm(make(Family::BoxCox, 0.5), e.data(), e.size());
  SmearingWork far;
  const BackValue b = sm.mean(10.0, &far);  // W = 6, residual range ~ +-2: no limit nearby
  CHECK_FALSE(b.bounded);
  CHECK(far.direct_terms == 0);
  CHECK(far.series_nodes <= 16);
  // Beside the limit (z = -2), only the leaves it cuts are summed one by one.
  SmearingWork near;
  const BackValue c = sm.mean(-1.0, &near);
  CHECK(c.bounded);
  CHECK(near.direct_terms <= 64);
  CHECK(near.limit_nodes >= 1);
  const BackValue want = smearing_mean(make(Family::BoxCox, 0.5), -1.0, e.data(), e.size());
  CHECK(c.value == Approx(want.value).epsilon(1e-12));  // as in compare_grid
}

TEST_CASE("smearing: ties, tiny samples and bad input", "[smearing]") {
  const std::vector<double> ties(100, 0.25);
  compare_grid(make(Family::BoxCox, 0.5), ties, -3, 3, 30);
  const std::vector<double> one = {0.1};
  compare_grid(make(Family::YeoJohnson, 0.7), one, -2, 2, 8);
  std::vector<double> mixed = residuals(500, 0.3, 9);
  for (std::size_t i = 0; i < 200; ++i) mixed[i] = 0.0;  // a block of equal residuals
  compare_grid(make(Family::Sqrt), mixed, -1, 2, 30);
  const Smearing sm(make(Family::Log), one.data(), 1);
  CHECK(std::isnan(sm.mean(math::kNaN).value));
  CHECK_THROWS_AS(Smearing(make(Family::Log), nullptr, 0), Error);
  const std::vector<double> bad = {0.1, math::kNaN};
  CHECK_THROWS_AS(Smearing(make(Family::Log), bad.data(), 2), Error);
}
