// The response lambda with precision weights: the weighted profile against a by-hand weighted
// least-squares fit, zero weights as dropped rows, the binned path with weights, bad weights.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <random>
#include <vector>

#include "../../core/src/lambda_internal.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {

struct Data {
  std::size_t n, p;
  std::vector<double> X, y, w;
};

Data simulate(std::size_t n, std::size_t p, unsigned seed, bool zeros) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::uniform_real_distribution<double> ud(0.2, 3.0);
  Data d{n, p, std::vector<double>(n * p), std::vector<double>(n), std::vector<double>(n)};
  for (auto& v : d.X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    double eta = 0.5;
    for (std::size_t j = 0; j < p; ++j) eta += 0.2 * (j % 2 ? -1.0 : 1.0) * d.X[j * n + i];
    d.w[i] = ud(g);
    // log-normal errors with variance 0.16 / w: the weights are the right ones
    d.y[i] = std::exp(eta + 0.4 / std::sqrt(d.w[i]) * nd(g));
    if (zeros && i % 7 == 3) d.w[i] = 0.0;
  }
  return d;
}

// By hand: weighted least squares of z on [1 X] by Eigen's column-pivoting QR of the rows
// scaled by sqrt(w) (zero weights dropped), then the weighted normal log-likelihood
// 0.5 sum log w - n/2 (log 2 pi + 1 - log n + log RSS_w) plus the Box-Cox Jacobian.
double by_hand(const Data& d, double lam) {
  std::vector<std::size_t> used;
  for (std::size_t i = 0; i < d.n; ++i)
    if (d.w[i] > 0) used.push_back(i);
  const Eigen::Index n = static_cast<Eigen::Index>(used.size());
  Eigen::MatrixXd D(n, static_cast<Eigen::Index>(d.p + 1));
  Eigen::VectorXd z(n);
  double slw = 0, jac = 0;
  for (Eigen::Index r = 0; r < n; ++r) {
    const std::size_t i = used[static_cast<std::size_t>(r)];
    const double s = std::sqrt(d.w[i]);
    D(r, 0) = s;
    for (std::size_t j = 0; j < d.p; ++j) D(r, static_cast<Eigen::Index>(j + 1)) = s * d.X[j * d.n + i];
    z(r) = s * (lam == 0 ? std::log(d.y[i]) : (std::pow(d.y[i], lam) - 1) / lam);
    slw += std::log(d.w[i]);
    jac += (lam - 1) * std::log(d.y[i]);
  }
  const Eigen::VectorXd b = D.colPivHouseholderQr().solve(z);
  const double rss = (z - D * b).squaredNorm();
  const double nn = static_cast<double>(n);
  return 0.5 * slw - 0.5 * nn * (std::log(2 * M_PI) + 1 - std::log(nn) + std::log(rss)) + jac;
}

const double kGrid[] = {-1.5, -0.4, 0.0, 0.6, 1.7};

}  // namespace

TEST_CASE("weighted response profile equals a by-hand weighted fit", "[lambda][weights]") {
  for (bool zeros : {false, true}) {
    const Data d = simulate(90, 3, 41, zeros);
    const auto prof = response_lambda_profile(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox,
                                              d.w.data(), kGrid, 5);
    for (int k = 0; k < 5; ++k) {
      INFO("zeros " << zeros << " lambda " << kGrid[k]);
      // 1e-11 relative: two least-squares solutions of one problem, rounding only
      CHECK(prof[static_cast<std::size_t>(k)] == Approx(by_hand(d, kGrid[k])).epsilon(1e-11));
    }
  }
}

TEST_CASE("binned weighted profile equals the direct weighted one", "[lambda][weights][binned]") {
  const Data d = simulate(40000, 3, 42, true);
  const detail::LambdaProfile prof(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, "y", d.w.data());
  REQUIRE(prof.binned());
  for (double lam : {-2.0, -0.7, 0.0, 0.3, 1.0, 2.5}) {
    INFO("lambda " << lam);
    // 1e-12 relative: the series are exact to rounding; only the order of the sums differs
    CHECK(prof.loglik(lam) == Approx(prof.loglik(lam, true)).epsilon(1e-12));
  }
  CHECK(prof.loglik(0.3) == Approx(by_hand(d, 0.3)).epsilon(1e-11));
  // The univariate weighted profile too.
  const detail::LambdaProfile uni(d.y.data(), d.n, Family::YeoJohnson, "x", d.w.data());
  REQUIRE(uni.binned());
  for (double lam : {-1.0, 0.5, 2.0}) CHECK(uni.loglik(lam) == Approx(uni.loglik(lam, true)).epsilon(1e-12));
}

TEST_CASE("zero weights drop their rows; scaling the weights changes nothing", "[lambda][weights]") {
  Data d = simulate(200, 2, 43, true);
  d.y[3] = -5.0;  // weight 0: never looked at, even by Box-Cox
  LambdaOptions o;
  o.weights = d.w.data();
  const LambdaEstimate e = estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, o);
  Data s{0, d.p, {}, {}, {}};
  for (std::size_t i = 0; i < d.n; ++i)
    if (d.w[i] > 0) {
      s.y.push_back(d.y[i]);
      s.w.push_back(d.w[i]);
    }
  s.n = s.y.size();
  s.X.resize(s.n * s.p);
  for (std::size_t j = 0; j < d.p; ++j)
    for (std::size_t i = 0, r = 0; i < d.n; ++i)
      if (d.w[i] > 0) s.X[j * s.n + r++] = d.X[j * d.n + i];
  LambdaOptions os;
  os.weights = s.w.data();
  const LambdaEstimate es = estimate_response_lambda(s.y.data(), s.X.data(), s.n, s.p, Family::BoxCox, os);
  CHECK(e.n == s.n);
  CHECK(e.lambda == Approx(es.lambda).epsilon(1e-12));  // the same numbers in the same order
  CHECK(e.conf_low == Approx(es.conf_low).epsilon(1e-12));
  CHECK(e.loglik == Approx(es.loglik).epsilon(1e-12));
  std::vector<double> w10(d.w);
  for (auto& v : w10) v *= 10.0;
  o.weights = w10.data();
  const LambdaEstimate e10 = estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, o);
  // 1e-8: the maximiser's own resolution (half the mantissa)
  CHECK(e10.lambda == Approx(e.lambda).margin(1e-8));
  CHECK(e10.loglik == Approx(e.loglik).epsilon(1e-12));
}

TEST_CASE("weights that are negative or not finite are errors naming the rows", "[lambda][weights][errors]") {
  Data d = simulate(30, 1, 44, false);
  d.w[4] = -1.0;
  d.w[11] = -0.5;
  LambdaOptions o;
  o.weights = d.w.data();
  try {
    estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, o);
    FAIL("no error");
  } catch (const LambdaRowsError& e) {
    CHECK(e.code() == ErrorCode::Argument);
    CHECK(e.input() == LambdaInput::Weights);
    CHECK(e.count() == 2);
    CHECK(e.first_indices() == std::vector<std::size_t>{4, 11});
    CHECK_THAT(e.what(), Contains("negative") && Contains("4, 11") && Contains("0 drops"));
  }
  d.w[4] = NAN;
  d.w[11] = 1.0;
  try {
    estimate_lambda(d.y.data(), d.n, Family::BoxCox, o);
    FAIL("no error");
  } catch (const LambdaRowsError& e) {
    CHECK(e.code() == ErrorCode::NonFinite);
    CHECK(e.input() == LambdaInput::Weights);
    CHECK(e.first_indices() == std::vector<std::size_t>{4});
  }
  // Non-finite predictors: every row named, as numbers.
  d.w[4] = 1.0;
  d.X[7] = INFINITY;
  d.X[20] = NAN;
  for (const double* w : {static_cast<const double*>(nullptr), static_cast<const double*>(d.w.data())}) {
    o.weights = w;
    try {
      estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, o);
      FAIL("no error");
    } catch (const LambdaRowsError& e) {
      CHECK(e.code() == ErrorCode::NonFinite);
      CHECK(e.input() == LambdaInput::Predictors);
      CHECK(e.first_indices() == std::vector<std::size_t>{7, 20});
    }
  }
  // Weighted estimation with a prepared design is refused.
  const LeastSquares ls(d.X.data(), 5, 1);
  o.weights = d.w.data();
  CHECK_THROWS_AS(estimate_response_lambda(d.y.data(), ls, Family::BoxCox, o), Error);
}
