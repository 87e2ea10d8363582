// The fit summary and its check pass against Model and residual_checks on the same rows.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <vector>

#include "powerback/accumulate.hpp"
#include "powerback/backtransform.hpp"
#include "powerback/diagnostics.hpp"
#include "powerback/errors.hpp"
#include "powerback/model.hpp"

using namespace powerback;

namespace {

struct Rows {
  std::size_t n = 0, p = 0;
  std::vector<double> y, X;
};

// Three predictors and a fourth that is the sum of the first two (aliased); heteroscedastic
// errors so that Breusch-Pagan has something to find.
Rows simulate(std::size_t n, unsigned seed) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  Rows r;
  r.n = n;
  r.p = 4;
  r.X.resize(n * 4);
  r.y.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = 0; j < 3; ++j) r.X[j * n + i] = nd(g);
    r.X[3 * n + i] = r.X[i] + r.X[n + i];
    const double eta = 1.0 + 0.3 * r.X[i] - 0.2 * r.X[n + i] + 0.1 * r.X[2 * n + i];
    r.y[i] = std::exp(eta + (0.3 + 0.05 * r.X[i]) * nd(g) + 0.02 * eta * eta);
  }
  return r;
}

Transform box_cox(double lambda) {
  TransformSpec s;
  s.family = Family::BoxCox;
  s.lambda = lambda;
  return Transform(s);
}

// Partitions of 5 uneven parts, merged in reverse, every other one through its bytes.
template <class Summary, class Make>
Summary in_parts(const Rows& d, Make make, const std::vector<double>* w = nullptr) {
  const std::size_t cuts[] = {0, 1, d.n / 3, d.n / 3, d.n - 7, d.n};
  std::vector<Summary> parts;
  for (int k = 0; k < 5; ++k) {
    Summary s = make();
    const std::size_t r0 = cuts[k];
    s.add(d.y.data() + r0, d.X.data() + r0, cuts[k + 1] - r0, d.n, w ? w->data() + r0 : nullptr);
    if (k % 2) {
      const std::vector<unsigned char> b = s.serialize();
      parts.push_back(Summary::deserialize(b.data(), b.size()));
    } else {
      parts.push_back(std::move(s));
    }
  }
  Summary all = parts.back();
  for (int k = 3; k >= 0; --k) all.merge(parts[static_cast<std::size_t>(k)]);
  return all;
}

}  // namespace

TEST_CASE("a fit summary equals Model, and its check pass equals residual_checks", "[accumulate][fit]") {
  const Rows d = simulate(20000, 51);
  const Transform t = box_cox(0.25);
  const Model m(d.y.data(), d.X.data(), d.n, d.p, true, &t, 1);
  const FitSummary fs = in_parts<FitSummary>(d, [&] { return FitSummary(t, d.p, 1); });
  const SummaryFit f = fs.finish();
  // Both are Householder QRs of the same rows, taken in other blocks: 1e-10 relative.
  CHECK(f.n == m.n());
  CHECK(f.rank == m.rank());
  CHECK(f.rank == 4);
  CHECK(f.aliased == m.aliased());
  CHECK(f.rss == Approx(m.rss()).epsilon(1e-10));
  CHECK(f.sigma == Approx(m.sigma()).epsilon(1e-10));
  CHECK(f.loglik == Approx(m.loglik()).epsilon(1e-10));
  CHECK(f.loglik_df == m.loglik_df());
  CHECK(f.jacobian == Approx(m.jacobian()).epsilon(1e-10));
  for (Eigen::Index j = 0; j < 5; ++j) {
    if (f.aliased[static_cast<std::size_t>(j)]) {
      CHECK(std::isnan(f.coef(j)));
      continue;
    }
    CHECK(f.coef(j) == Approx(m.coefficients()(j)).epsilon(1e-10));
    CHECK(f.se(j) == Approx(m.standard_errors()(j)).epsilon(1e-10));
    CHECK(std::sqrt(f.covariance(j, j)) == Approx(m.standard_errors()(j)).epsilon(1e-10));
  }

  const FitCheckPass cp = in_parts<FitCheckPass>(d, [&] { return FitCheckPass(fs); });
  const SummaryChecks c = cp.finish();
  const ResidualChecks want = residual_checks(m);
  // Other QRs of the same auxiliary regressions: 1e-8 relative on statistics of order 1..100.
  CHECK(c.bp_statistic == Approx(want.bp_statistic).epsilon(1e-8));
  CHECK(c.bp_df == want.bp_df);
  CHECK(c.bp_p == Approx(want.bp_p).epsilon(1e-6));
  CHECK(c.reset_f == Approx(want.reset_f).epsilon(1e-8));
  CHECK(c.reset_df1 == want.reset_df1);
  CHECK(c.reset_df2 == want.reset_df2);
  CHECK(c.skewness == Approx(want.skewness).epsilon(1e-8));
  CHECK(want.bp_p < 1e-6);  // the simulated heteroscedasticity is found

  // Smearing from the binned residual sums against the residual-by-residual mean: the quadratic
  // per bin of width sigma/128 leaves a relative error near (h/2)^3 / 6, below 1e-9.
  const double etas[] = {m.fitted()(0), 0.5, 1.5, 2.5};
  const std::vector<double> got = cp.smearing_mean(etas, 4);
  for (int i = 0; i < 4; ++i) {
    const BackValue b = smearing_mean(t, etas[i], m.residuals().data(), m.n());
    CHECK(got[static_cast<std::size_t>(i)] == Approx(b.value).epsilon(1e-8));
  }
}

TEST_CASE("a weighted fit summary is weighted least squares", "[accumulate][fit]") {
  const Rows d = simulate(3000, 52);
  std::vector<double> w(d.n);
  for (std::size_t i = 0; i < d.n; ++i) w[i] = (i % 11 == 0) ? 0.0 : 0.25 + static_cast<double>(i % 4);
  const Transform t = box_cox(0.0);
  const SummaryFit f = in_parts<FitSummary>(d, [&] { return FitSummary(t, d.p); }, &w).finish();
  // By hand: rows with w > 0 scaled by sqrt(w), the intercept included as a column.
  std::vector<double> Xs, zs;
  std::size_t m = 0;
  for (double v : w) m += v > 0;
  Xs.resize(m * 5);
  zs.resize(m);
  double slw = 0, jac = 0;
  std::size_t r = 0;
  for (std::size_t i = 0; i < d.n; ++i) {
    if (w[i] == 0) continue;
    const double sw = std::sqrt(w[i]);
    Xs[r] = sw;
    for (std::size_t j = 0; j < 4; ++j) Xs[(j + 1) * m + r] = sw * d.X[j * d.n + i];
    zs[r] = sw * std::log(d.y[i]);
    slw += std::log(w[i]);
    jac -= std::log(d.y[i]);
    ++r;
  }
  const LeastSquares ls(Xs.data(), m, 5, false);
  const Eigen::Map<Eigen::VectorXd> z(zs.data(), static_cast<Eigen::Index>(m));
  const Eigen::VectorXd b = ls.coefficients(z);
  const double rss = ls.rss(z), nn = static_cast<double>(m);
  CHECK(f.n == m);
  CHECK(f.rss == Approx(rss).epsilon(1e-10));
  for (Eigen::Index j = 0; j < 5; ++j)
    if (!std::isnan(b(j))) CHECK(f.coef(j) == Approx(b(j)).epsilon(1e-9));
  // logLik of a weighted lm: 0.5 sum log w - n/2 (log 2 pi + 1 + log(RSS_w / n)), plus the Jacobian.
  CHECK(f.loglik == Approx(0.5 * slw - 0.5 * nn * (std::log(2 * M_PI) + 1 + std::log(rss / nn)) + jac).epsilon(1e-10));
}

TEST_CASE("fit summaries: bad bytes, bad rows and mismatched passes are clear errors", "[accumulate][fit][bytes]") {
  const Rows d = simulate(500, 53);
  const Transform t = box_cox(0.5);
  FitSummary fs(t, d.p);
  fs.add(d.y.data(), d.X.data(), d.n, d.n, nullptr);
  FitCheckPass cp(fs);
  cp.add(d.y.data(), d.X.data(), 200, d.n, nullptr);
  CHECK_THROWS_WITH(cp.finish(), Catch::Contains("both passes must read the same rows"));
  cp.add(d.y.data() + 200, d.X.data() + 200, d.n - 200, d.n, nullptr);
  CHECK(cp.finish().n == d.n);
  for (const std::vector<unsigned char>& good : {fs.serialize(), cp.serialize()}) {
    const bool is_fit = good[8] == 3;  // the kind field (3: a fit summary)
    std::size_t bad = 0, tried = 0;
    for (std::size_t i = 0; i < good.size(); i += 1 + i / 50) {
      ++tried;
      std::vector<unsigned char> b = good;
      b[i] ^= 0x10;
      std::vector<unsigned char> cut(good.begin(), good.begin() + static_cast<std::ptrdiff_t>(i));
      for (const auto* v : {&b, &cut}) {
        try {
          if (is_fit) FitSummary::deserialize(v->data(), v->size());
          else FitCheckPass::deserialize(v->data(), v->size());
        } catch (const Error& e) {
          bad += e.code() == ErrorCode::Parse;
        }
      }
    }
    CHECK(bad == 2 * tried);
  }
  const double ybad[] = {1.0, -1.0, 2.0};
  const double X3[] = {1, 2, 3, 1, 2, 3, 1, 2, 3, 1, 2, 3};
  CHECK_THROWS_WITH(fs.add(ybad, X3, 3, 3, nullptr), Catch::Contains("y"));
  CHECK_THROWS_WITH(fs.merge(FitSummary(box_cox(0.4), d.p)), Catch::Contains("same response transform"));
  CHECK_THROWS_WITH(FitSummary(t, 2).finish(), Catch::Contains("no rows"));
}
