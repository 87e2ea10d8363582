// The lambda summary: any partition of the rows, merged in any order or tree (and through bytes),
// finishes within the accuracy contract of accumulate.hpp of the one-pass estimate.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>
#include <vector>

#include "powerback/accumulate.hpp"
#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"

using namespace powerback;

namespace {

struct Data {
  std::size_t n = 0, p = 0;
  std::vector<double> y, X;  // X column-major, leading dimension n
};

Data simulate(std::size_t n, std::size_t p, unsigned seed, double (*response)(double, double)) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  Data d;
  d.n = n;
  d.p = p;
  d.X.resize(n * p);
  d.y.resize(n);
  for (auto& v : d.X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    double eta = 0.0;
    for (std::size_t j = 0; j < p; ++j) eta += (0.4 - 0.2 * static_cast<double>(j)) * d.X[j * n + i];
    d.y[i] = response(eta, nd(g));
  }
  return d;
}

double sqrt_scale(double eta, double e) { const double r = 3.0 + 0.5 * eta + 0.4 * e; return r * r; }
double both_signs(double eta, double e) { return 1.5 * eta + e + 0.3; }

// Random cut points (some partitions empty), summaries built per partition, merged in a random
// order (tree = false) or as a random binary tree, every other one through its bytes.
LambdaSummary summarise(const Data& d, Family family, std::size_t parts, unsigned seed, bool tree) {
  std::mt19937_64 g(seed);
  std::vector<std::size_t> cuts = {0, d.n};
  std::uniform_int_distribution<std::size_t> at(0, d.n);
  for (std::size_t k = 1; k < parts; ++k) cuts.push_back(k % 7 == 3 ? cuts[k % cuts.size()] : at(g));
  std::sort(cuts.begin(), cuts.end());
  std::vector<LambdaSummary> pieces;
  for (std::size_t k = 0; k + 1 < cuts.size(); ++k) {
    LambdaSummary s(family, d.p);
    const std::size_t r0 = cuts[k], rows = cuts[k + 1] - cuts[k];
    s.add(d.y.data() + r0, d.X.data() + r0, rows, d.n, nullptr);
    if (k % 2 == 1) {
      const std::vector<unsigned char> b = s.serialize();
      pieces.push_back(LambdaSummary::deserialize(b.data(), b.size()));
    } else {
      pieces.push_back(std::move(s));
    }
  }
  std::shuffle(pieces.begin(), pieces.end(), g);
  if (!tree) {
    LambdaSummary all(family, d.p);
    for (const auto& s : pieces) all.merge(s);
    return all;
  }
  while (pieces.size() > 1) {
    std::uniform_int_distribution<std::size_t> pick(0, pieces.size() - 2);
    const std::size_t i = pick(g);
    pieces[i].merge(pieces[i + 1]);
    pieces.erase(pieces.begin() + static_cast<std::ptrdiff_t>(i) + 1);
  }
  return pieces[0];
}

void within_contract(const SummaryLambdaResult& r, const LambdaEstimate& one) {
  REQUIRE_FALSE(r.needs_pass);
  const LambdaEstimate& e = r.estimate;
  // The documented contract: |delta lambda-hat| <= 1e-7, interval ends within 1e-9.
  CHECK(std::fabs(e.lambda - one.lambda) <= 1e-7);
  CHECK(std::fabs(e.conf_low - one.conf_low) <= 1e-9);
  CHECK(std::fabs(e.conf_high - one.conf_high) <= 1e-9);
  // The log-likelihood at the maximum: the same sums, taken in another order (1e-12 relative).
  CHECK(e.loglik == Approx(one.loglik).epsilon(1e-12));
  CHECK(e.n == one.n);
  CHECK(e.rank == one.rank);
  CHECK(e.convenient == one.convenient);
  CHECK(e.converged);
  CHECK(r.grid.size() == 101);
}

}  // namespace

TEST_CASE("a million rows in 1, 16 and 256 partitions equal one pass", "[accumulate][lambda]") {
  const Data d = simulate(1000000, 3, 41, sqrt_scale);
  const LambdaOptions opt;
  const LambdaEstimate one = estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, opt);
  REQUIRE(one.lambda == Approx(0.5).margin(0.05));  // simulated as a square: lambda 1/2
  unsigned seed = 1;
  for (std::size_t parts : {1u, 16u, 256u}) {
    INFO(parts << " partitions");
    within_contract(summarise(d, Family::BoxCox, parts, seed++, false).finish(opt), one);
    if (parts > 1) within_contract(summarise(d, Family::BoxCox, parts, seed++, true).finish(opt), one);
  }
}

TEST_CASE("Yeo-Johnson: partitions of one sign merge with the others", "[accumulate][lambda]") {
  Data d = simulate(200000, 2, 42, both_signs);
  // Sorted by y, so that most partitions hold values of one sign only.
  std::vector<std::size_t> order(d.n);
  std::iota(order.begin(), order.end(), 0);
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return d.y[a] < d.y[b]; });
  Data s = d;
  for (std::size_t i = 0; i < d.n; ++i) {
    s.y[i] = d.y[order[i]];
    for (std::size_t j = 0; j < d.p; ++j) s.X[j * d.n + i] = d.X[j * d.n + order[i]];
  }
  const LambdaOptions opt;
  const LambdaEstimate one = estimate_response_lambda(s.y.data(), s.X.data(), s.n, s.p, Family::YeoJohnson, opt);
  within_contract(summarise(s, Family::YeoJohnson, 16, 7, true).finish(opt), one);
  // All negative: the centred branch on Yeo-Johnson's second group.
  Data neg = s;
  for (auto& v : neg.y) v = -std::exp(0.3 * v);
  const LambdaEstimate one_neg =
      estimate_response_lambda(neg.y.data(), neg.X.data(), neg.n, neg.p, Family::YeoJohnson, opt);
  within_contract(summarise(neg, Family::YeoJohnson, 16, 8, false).finish(opt), one_neg);
}

TEST_CASE("weighted rows: the profile is the weighted least-squares one", "[accumulate][lambda]") {
  const Data d = simulate(6000, 2, 43, sqrt_scale);
  std::vector<double> w(d.n);
  for (std::size_t i = 0; i < d.n; ++i) w[i] = (i % 5 == 0) ? 0.0 : 0.5 + static_cast<double>(i % 3);
  LambdaSummary a(Family::BoxCox, d.p), b(Family::BoxCox, d.p);
  a.add(d.y.data(), d.X.data(), 2500, d.n, w.data());
  b.add(d.y.data() + 2500, d.X.data() + 2500, d.n - 2500, d.n, w.data() + 2500);
  a.merge(b);
  // By hand at fixed lambda: sqrt(w)-scaled least squares on the rows with w > 0, then
  // -n/2 (log 2 pi + 1 + log(RSS_w / n)) + 1/2 sum log w + (lambda - 1) sum log y (as logLik.lm).
  for (double lam : {-0.5, 0.0, 0.5, 1.3}) {
    std::vector<double> Xs, zs;
    std::size_t m = 0;
    double sum_log_w = 0, sum_log_y = 0;
    for (std::size_t i = 0; i < d.n; ++i)
      if (w[i] > 0) ++m;
    Xs.assign(m * (d.p + 1), 0.0);
    zs.assign(m, 0.0);
    std::size_t r = 0;
    for (std::size_t i = 0; i < d.n; ++i) {
      if (w[i] == 0) continue;
      const double sw = std::sqrt(w[i]);
      Xs[r] = sw;
      for (std::size_t j = 0; j < d.p; ++j) Xs[(j + 1) * m + r] = sw * d.X[j * d.n + i];
      zs[r] = sw * (lam == 0 ? std::log(d.y[i]) : std::expm1(lam * std::log(d.y[i])) / lam);
      sum_log_w += std::log(w[i]);
      sum_log_y += std::log(d.y[i]);
      ++r;
    }
    const LeastSquares ls(Xs.data(), m, d.p + 1, false);
    const double rss = ls.rss(Eigen::Map<Eigen::VectorXd>(zs.data(), static_cast<Eigen::Index>(m)));
    const double nn = static_cast<double>(m);
    const double want = -0.5 * nn * (std::log(2 * M_PI) + 1 + std::log(rss / nn)) + 0.5 * sum_log_w +
                        (lam - 1) * sum_log_y;
    double got;
    REQUIRE(a.loglik(lam, &got));
    // Series exact to rounding, sums in another order: 1e-10 relative.
    CHECK(got == Approx(want).epsilon(1e-10));
  }
  CHECK(a.n() == d.n - d.n / 5);
  // A summary merged with itself counts every row twice (the merge copes with aliasing).
  LambdaSummary twice = a;
  twice.merge(twice);
  CHECK(twice.n() == 2 * a.n());
}

TEST_CASE("fallback: a range beyond the bins and a near-exact fit take a grid pass", "[accumulate][lambda]") {
  const Data d = simulate(30000, 2, 44, sqrt_scale);
  LambdaOptions wide;
  wide.lower = -7.0;
  wide.upper = 7.0;
  const LambdaEstimate one = estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, wide);
  LambdaSummary s(Family::BoxCox, d.p);
  s.add(d.y.data(), d.X.data(), d.n, d.n, nullptr);
  SummaryLambdaResult r = s.finish(wide);
  REQUIRE(r.needs_pass);
  CHECK(r.pass_lower == -7.0);
  CHECK(r.pass_upper == 7.0);
  int passes = 0;
  while (r.needs_pass) {
    REQUIRE(++passes <= 3);
    std::vector<double> grid(r.pass_points);
    for (std::size_t i = 0; i < grid.size(); ++i)
      grid[i] = r.pass_lower + (r.pass_upper - r.pass_lower) * static_cast<double>(i) / (grid.size() - 1.0);
    // The pass in two partitions, merged through bytes.
    LambdaGridPass a(s, grid), b(s, grid);
    a.add(d.y.data(), d.X.data(), 10000, d.n, nullptr);
    b.add(d.y.data() + 10000, d.X.data() + 10000, d.n - 10000, d.n, nullptr);
    const std::vector<unsigned char> bytes = b.serialize();
    a.merge(LambdaGridPass::deserialize(bytes.data(), bytes.size()));
    // Each grid value is the exact profile (a QR, no series): 1e-9 relative.
    const std::vector<double> ll = a.profile(s);
    for (std::size_t i = 0; i < grid.size(); i += 7) {
      const std::vector<double> direct =
          response_lambda_profile(d.y.data(), d.X.data(), d.n, d.p, Family::BoxCox, &grid[i], 1);
      CHECK(ll[i] == Approx(direct[0]).epsilon(1e-9));
    }
    r = a.finish(s, wide);
  }
  CHECK(passes == 2);  // the whole range, then a narrower grid
  CHECK(r.from_grid);
  // The documented fallback accuracy: about 1e-6 after refinement.
  CHECK(std::fabs(r.estimate.lambda - one.lambda) <= 2e-6);
  CHECK(std::fabs(r.estimate.conf_low - one.conf_low) <= 2e-6);
  CHECK(std::fabs(r.estimate.conf_high - one.conf_high) <= 2e-6);

  // R^2 about 1 - 1e-9 at lambda 0: the subtraction would lose the residual's digits.
  Data tight = d;
  std::mt19937_64 g(5);
  std::normal_distribution<double> nd(0.0, 1.0);
  for (std::size_t i = 0; i < d.n; ++i) tight.y[i] = std::exp(0.4 * d.X[i] + 1e-5 * nd(g));
  LambdaSummary t(Family::BoxCox, d.p);
  t.add(tight.y.data(), tight.X.data(), d.n, d.n, nullptr);
  double v;
  CHECK_FALSE(t.loglik(0.0, &v));
  CHECK(t.finish(LambdaOptions()).needs_pass);
}

TEST_CASE("bad chunks, mismatched merges and empty summaries are clear errors", "[accumulate][lambda]") {
  LambdaSummary s(Family::BoxCox, 1);
  const double y[] = {1.0, -2.0, 3.0, 0.0}, X[] = {1, 2, 3, 4};
  try {
    s.add(y, X, 4, 4, nullptr);
    FAIL("no error");
  } catch (const IndexedError& e) {
    CHECK(e.code() == ErrorCode::Domain);
    CHECK(std::string(e.what()).find("rows 1, 3") != std::string::npos);
  }
  CHECK(s.n() == 0);  // unchanged by the failed add
  const double w[] = {1.0, -1.0, 1.0, 1.0}, ok[] = {1.0, 2.0, 3.0, 4.0};
  CHECK_THROWS_WITH(s.add(ok, X, 4, 4, w), Catch::Contains("weights must be finite and >= 0"));
  const double Xbad[] = {1, NAN, 3, 4};
  CHECK_THROWS_WITH(s.add(ok, Xbad, 4, 4, nullptr), Catch::Contains("non-finite value at row 1"));
  CHECK_THROWS_WITH(s.finish(LambdaOptions()), Catch::Contains("no rows"));
  CHECK_THROWS_WITH(s.merge(LambdaSummary(Family::YeoJohnson, 1)), Catch::Contains("same family"));
  CHECK_THROWS_WITH(LambdaSummary(Family::Log, 1), Catch::Contains("box-cox and yeo-johnson only"));
}

TEST_CASE("corrupted or truncated bytes are a parse error, never a crash", "[accumulate][lambda][bytes]") {
  const Data d = simulate(3000, 2, 45, both_signs);
  LambdaSummary s(Family::YeoJohnson, d.p);
  s.add(d.y.data(), d.X.data(), d.n, d.n, nullptr);
  const std::vector<unsigned char> good = s.serialize();
  const LambdaSummary back = LambdaSummary::deserialize(good.data(), good.size());
  CHECK(back.serialize() == good);
  const auto parse_error = [](const std::vector<unsigned char>& b) {
    try {
      LambdaSummary::deserialize(b.data(), b.size());
    } catch (const Error& e) {
      return e.code() == ErrorCode::Parse;
    }
    return false;
  };
  std::mt19937_64 g(9);
  std::uniform_int_distribution<int> bit(0, 7);
  std::size_t flips = 0, truncations = 0;
  for (std::size_t i = 0; i < good.size(); i += 1 + i / 64) {
    std::vector<unsigned char> b = good;
    b[i] ^= static_cast<unsigned char>(1u << bit(g));
    flips += parse_error(b);
    b = std::vector<unsigned char>(good.begin(), good.begin() + static_cast<std::ptrdiff_t>(i));
    truncations += parse_error(b);
  }
  std::size_t tried = 0;
  for (std::size_t i = 0; i < good.size(); i += 1 + i / 64) ++tried;
  CHECK(flips == tried);
  CHECK(truncations == tried);
  // A valid summary of another kind, and a NULL buffer.
  CHECK_THROWS_WITH(LambdaSummary::deserialize(nullptr, 0), Catch::Contains("fewer than any summary"));
}
