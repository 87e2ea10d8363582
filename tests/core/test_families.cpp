// The transform families of the core: definitions, round trips, derivatives, continuity.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <vector>

#include "fixture_csv.hpp"
#include "powerback/errors.hpp"
#include "powerback/transform.hpp"
#include "test_support.hpp"

using namespace powerback;

namespace {

using pwbtest::make;

std::vector<double> logspace(double lo, double hi, int n) {
  std::vector<double> x;
  for (int i = 0; i < n; ++i) x.push_back(std::pow(10.0, lo + (hi - lo) * i / (n - 1)));
  return x;
}

double rel_err(double a, double b) { return std::fabs(a - b) / std::max(std::fabs(b), 1e-300); }

const double kLambdas[] = {-3, -2, -1, -0.5, -1e-9, 0, 1e-9, 0.25, 0.5, 1, 1.5, 2, 2 + 1e-9, 3};

}  // namespace

TEST_CASE("Box-Cox and Yeo-Johnson equal scipy.stats at fixed lambda", "[families][external]") {
  // Source: scipy.stats.boxcox / scipy.stats.yeojohnson with lmbda given (Debian python3-scipy);
  // fixture tests/fixtures/scipy_families.csv made by tests/fixtures/make_scipy_families.py.
  // Tolerance: 1e-12 relative (the worst Box-Cox case, lambda = -2 at x = 1e-8 with z ~ -5e15,
  // carries about 40 ulp of exp() error), plus, for Yeo-Johnson, the rounding of scipy's own
  // formula: scipy 1.10 computes (p - 1) / m with p = (1 +- x)^m rounded, m = lambda or
  // 2 - lambda, an absolute error up to eps |p| / |m| = eps |1 + m z| / |m| that cancellation
  // turns into a large relative error near x = 0 (our expm1 form does not lose it).
  const double eps = std::numeric_limits<double>::epsilon();
  const auto rows = pwbtest::read_csv("scipy_families.csv");
  REQUIRE(rows.size() > 250);
  for (const auto& r : rows) {
    const Family f = family_from_name(r[0]);
    const double lam = std::stod(r[1]), x = std::stod(r[2]), want = std::stod(r[3]);
    const double got = make(f, lam).apply(x);
    double allowed = 1e-12 * std::fabs(want);
    const double m = x >= 0 ? lam : 2 - lam;
    if (f == Family::YeoJohnson && std::fabs(m) > eps) allowed += 2 * eps * std::fabs(1 + m * want) / std::fabs(m);
    INFO(r[0] << " lambda=" << r[1] << " x=" << r[2]);
    CHECK(std::fabs(got - want) <= allowed);
  }
}

TEST_CASE("Box-Cox round trip over wide ranges", "[families]") {
  // invert(apply(x)) = x to 1e-12 relative wherever v^lambda >= 1e-3: below that, v^lambda - 1
  // cancels and the transformed value itself no longer holds x to 12 digits (that is the data's
  // limit, not the inverse's). x runs over 1e-8 .. 1e8.
  for (double lam : kLambdas) {
    const Transform t = make(Family::BoxCox, lam);
    for (double x : logspace(-8, 8, 161)) {
      if (lam * std::log(x) < std::log(1e-3)) continue;
      INFO("lambda=" << lam << " x=" << x);
      CHECK(rel_err(t.invert(t.apply(x)), x) < 1e-12);
    }
  }
}

TEST_CASE("Yeo-Johnson round trip on both branches", "[families]") {
  // Same conditioning rule as Box-Cox, with (1 + v)^lambda for v >= 0 and (1 - v)^(2 - lambda)
  // for v < 0; zero maps to zero exactly.
  for (double lam : kLambdas) {
    const Transform t = make(Family::YeoJohnson, lam);
    CHECK(t.apply(0.0) == 0.0);
    CHECK(t.invert(0.0) == 0.0);
    for (double a : logspace(-8, 8, 161)) {
      for (double x : {a, -a}) {
        const double p = x >= 0 ? lam * std::log1p(x) : (2 - lam) * std::log1p(-x);
        if (p < std::log(1e-3)) continue;
        INFO("lambda=" << lam << " x=" << x);
        CHECK(rel_err(t.invert(t.apply(x)), x) < 1e-12);
      }
    }
  }
}

TEST_CASE("Every family round-trips including reflection and shift", "[families]") {
  struct Case { Family f; double lam; double lo, hi; };  // log10 range of v
  const Case cases[] = {{Family::Identity, 0, -8, 8},  {Family::Log, 0, -300, 300},
                        {Family::Log10, 0, -300, 300}, {Family::Sqrt, 0, -150, 150},
                        {Family::Reciprocal, 0, -300, 300}, {Family::Power, 0.3, -100, 100},
                        {Family::Power, -1.7, -100, 100},   {Family::Asinh, 0, -8, 300},
                        {Family::Logit, 0, -300, -0.5}};
  for (const Case& c : cases) {
    const Transform t = make(c.f, c.lam);
    for (double x : logspace(c.lo, c.hi, 121)) {
      INFO(family_name(c.f) << " x=" << x);
      CHECK(rel_err(t.invert(t.apply(x)), x) < 1e-12);
    }
  }
  // power with lambda > 0 and asinh accept negative values and keep their sign
  for (double x : {-1e5, -3.0, -1e-4}) {
    CHECK(rel_err(make(Family::Power, 0.3).invert(make(Family::Power, 0.3).apply(x)), x) < 1e-12);
    CHECK(make(Family::Power, 0.3).apply(x) < 0);
    CHECK(rel_err(make(Family::Asinh).invert(make(Family::Asinh).apply(x)), x) < 1e-12);
  }
  // logit near 1: the round trip is exact to a few ulp of 1 (2.2e-16 each)
  const Transform lg = make(Family::Logit);
  CHECK(std::fabs(lg.invert(lg.apply(1 - 1e-9)) - (1 - 1e-9)) <= 4 * 2.3e-16);

  // reflect -> shift -> family: v = (10 - x) + 1; box-cox(0.5) of v
  const Transform rs = make(Family::BoxCox, 0.5, 1.0, true, 10.0);
  CHECK(rs.apply(3.0) == Approx((std::sqrt(8.0) - 1) / 0.5).epsilon(1e-15));
  CHECK(rs.apply(1.0) < rs.apply(0.0));  // reflection reverses order
  // x passes through pivot - x, so the error is relative to max(|x|, pivot)
  for (double x : {-50.0, 0.0, 3.0, 10.5})
    CHECK(std::fabs(rs.invert(rs.apply(x)) - x) <= 1e-13 * std::max(std::fabs(x), 10.0));
}

TEST_CASE("log |derivative| matches a central finite difference", "[families]") {
  // Central difference with h = 1e-5 v (v = distance to the nearest domain edge or kink here):
  // truncation ~ (h/v)^2 = 1e-10 and rounding ~ eps |z| / (h f') < 1e-10 at these points, so a
  // 1e-6 relative tolerance leaves a wide margin while still catching any wrong formula.
  struct Case { Family f; double lam; };
  const Case cases[] = {{Family::Identity, 0}, {Family::BoxCox, -1.3}, {Family::BoxCox, 0},
                        {Family::BoxCox, 0.5}, {Family::BoxCox, 2.2}, {Family::YeoJohnson, -0.7},
                        {Family::YeoJohnson, 0}, {Family::YeoJohnson, 1.4}, {Family::YeoJohnson, 2},
                        {Family::YeoJohnson, 2.6}, {Family::Log, 0}, {Family::Log10, 0},
                        {Family::Sqrt, 0}, {Family::Reciprocal, 0}, {Family::Power, 0.4},
                        {Family::Power, -0.8}, {Family::Asinh, 0}, {Family::Logit, 0}};
  for (const Case& c : cases) {
    const Transform t = make(c.f, c.lam, 0.0, true, 1.2);  // reflected: |dv/dx| = 1 still
    for (double x : {-20.0, -3.0, 0.05, 0.3, 0.9, 1.1, 1.19}) {
      if (std::isnan(t.apply(x))) continue;  // outside the domain for this family
      const double v = 1.2 - x;  // distance to the edge at 0 (and to 1, logit's other edge)
      const double h = 1e-5 * std::min(std::fabs(v), std::fabs(1.0 - v));
      const double fd = std::fabs(t.apply(x + h) - t.apply(x - h)) / (2 * h);
      INFO(family_name(c.f) << " lambda=" << c.lam << " x=" << x);
      CHECK(rel_err(std::exp(t.log_abs_derivative(x)), fd) < 1e-6);
    }
  }
}

TEST_CASE("Box-Cox is continuous at lambda = 0 and Yeo-Johnson at 0 and 2", "[families]") {
  // Taylor expansion in lambda: psi(v; lambda) = log v + lambda (log v)^2 / 2 + O(lambda^2), so
  // the gap to the limit must be lambda (log v)^2 / 2 to about |lambda| relative.
  for (double v : {1e-6, 0.2, 3.0, 5e4}) {
    const double L = std::log(v);
    for (double lam : {1e-10, -1e-10, 1e-7, -1e-7}) {
      const double gap = make(Family::BoxCox, lam).apply(v) - make(Family::BoxCox, 0).apply(v);
      CHECK(gap == Approx(lam * L * L / 2).epsilon(1e-5).margin(1e-15));
      const double L1 = std::log1p(v);
      const double gy = make(Family::YeoJohnson, lam).apply(v) - make(Family::YeoJohnson, 0).apply(v);
      CHECK(gy == Approx(lam * L1 * L1 / 2).epsilon(1e-5).margin(1e-15));
      // At lambda = 2 - d for v < 0: psi = -log(1 - v) - d (log(1 - v))^2 / 2 + O(d^2)
      const double gy2 = make(Family::YeoJohnson, 2 - lam).apply(-v) - make(Family::YeoJohnson, 2).apply(-v);
      CHECK(gy2 == Approx(-lam * L1 * L1 / 2).epsilon(1e-5).margin(1e-15));
    }
  }
  // the inverses are continuous too
  CHECK(make(Family::BoxCox, 1e-12).invert(2.5) == Approx(std::exp(2.5)).epsilon(1e-11));
  CHECK(make(Family::YeoJohnson, 2 + 1e-12).invert(-2.5) == Approx(-std::expm1(2.5)).epsilon(1e-11));
}

TEST_CASE("Yeo-Johnson symmetry psi(lambda, -y) = -psi(2 - lambda, y)", "[families][external]") {
  // Identity stated by Yeo & Johnson (2000), Biometrika 87, 954-959, section 2.
  for (double lam : kLambdas) {
    for (double y : {1e-6, 0.3, 1.0, 7.0, 900.0}) {
      const double a = make(Family::YeoJohnson, lam).apply(-y);
      const double b = -make(Family::YeoJohnson, 2 - lam).apply(y);
      CHECK(a == Approx(b).epsilon(1e-13).margin(1e-300));
    }
  }
}

TEST_CASE("Textbook values", "[families][external]") {
  // From the definitions (hand arithmetic): reciprocal is -1/v, log10(1000) = 3, logit(0.5) = 0,
  // power(-8; 1/3) = -2, Box-Cox(4; 0.5) = 2, Yeo-Johnson(-1; 0.5) = -(2^1.5 - 1)/1.5.
  CHECK(make(Family::Reciprocal).apply(4.0) == -0.25);
  CHECK(make(Family::Log10).apply(1000.0) == Approx(3.0).epsilon(1e-15));
  CHECK(make(Family::Logit).apply(0.5) == 0.0);
  CHECK(make(Family::Power, 1.0 / 3).apply(-8.0) == Approx(-2.0).epsilon(1e-15));
  CHECK(make(Family::BoxCox, 0.5).apply(4.0) == Approx(2.0).epsilon(1e-15));
  CHECK(make(Family::YeoJohnson, 0.5).apply(-1.0) == Approx(-(std::pow(2.0, 1.5) - 1) / 1.5).epsilon(1e-15));
  CHECK(make(Family::Asinh).apply(std::sinh(2.0)) == Approx(2.0).epsilon(1e-15));
}

TEST_CASE("describe names the family and every stored constant", "[families]") {
  CHECK(make(Family::BoxCox, 0.5, 1.0, true, 10.0).describe() == "box-cox(lambda = 0.5) of ((10 - x) + 1)");
  CHECK(make(Family::Log, 0, -2.5).describe() == "log of (x - 2.5)");
  CHECK(make(Family::Sqrt).describe() == "sqrt of x");
  CHECK(make(Family::Log, 0, 0, true, 101).describe() == "log of (101 - x)");
  CHECK(format_number(0.1) == "0.1");
  CHECK(std::stod(format_number(1.0 / 3)) == 1.0 / 3);  // 17 digits when needed
}
