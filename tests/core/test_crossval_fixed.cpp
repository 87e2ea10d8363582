// Fold fits of fixed transforms from one factor per fold, against a Model fitted on each
// training part and its predictions.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <vector>

#include "../test_support.hpp"
#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"
#include "powerback/model.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {

struct Data {
  std::size_t n = 0, p = 0;
  std::vector<double> y, X, w;
};

// Lognormal responses on two skewed predictors and a 0/1 column (invented, seeded).
Data make_data(std::size_t n, unsigned seed) {
  std::mt19937_64 gen(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::uniform_real_distribution<double> ud(0.2, 3.0);
  Data d;
  d.n = n;
  d.p = 3;
  d.y.resize(n);
  d.X.resize(3 * n);
  d.w.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    const double a = std::exp(nd(gen)), b = ud(gen), g = (i % 3 == 0) ? 1.0 : 0.0;
    d.X[i] = a;
    d.X[n + i] = b;
    d.X[2 * n + i] = g;
    d.y[i] = std::exp(0.3 + 0.4 * std::log(a) - 0.2 * b + 0.5 * g + 0.3 * nd(gen));
    d.w[i] = ud(gen);
  }
  return d;
}

// Relative agreement: both sums of squares are formed from the same rows in another order, so
// results agree to a few hundred ulps on these well-conditioned designs (1e-10 leaves room).
bool close(double a, double b) {
  if (std::isnan(a) || std::isnan(b)) return std::isnan(a) && std::isnan(b);
  if (std::isinf(a) || std::isinf(b)) return a == b;
  return std::fabs(a - b) <= 1e-10 * std::max(1.0, std::fabs(b));
}

// The fit of each fold's training part by Model, and its predictions of the held-out rows,
// compared with crossval_fixed's.
void check_against_models(const Data& d, const Transform& t, const std::vector<int>& fold, int k,
                          bool weighted, double level) {
  FixedFoldOptions opt;
  opt.level = level;
  if (weighted) opt.weights = d.w.data();
  const FixedFoldResult r =
      crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, &t, fold.data(), k, opt);
  REQUIRE(r.columns == d.p + 1);
  for (int j = 1; j <= k; ++j) {
    std::vector<double> ytr, Xtr, wtr, Xte;
    std::vector<std::size_t> te;
    for (std::size_t i = 0; i < d.n; ++i)
      if (fold[i] != j) ytr.push_back(d.y[i]), wtr.push_back(d.w[i]);
      else te.push_back(i);
    const std::size_t ntr = ytr.size(), nte = te.size();
    for (std::size_t c = 0; c < d.p; ++c) {
      for (std::size_t i = 0; i < d.n; ++i)
        if (fold[i] != j) Xtr.push_back(d.X[c * d.n + i]);
      for (std::size_t i : te) Xte.push_back(d.X[c * d.n + i]);
    }
    const Model m(ytr.data(), Xtr.data(), ntr, d.p, true, &t, 0, weighted ? wtr.data() : nullptr);
    REQUIRE(r.status[j - 1] == static_cast<int>(FoldFit::Ok));
    CHECK(r.df_residual[j - 1] == m.df_residual());
    CHECK(close(r.sigma[j - 1], m.sigma()));
    for (std::size_t c = 0; c <= d.p; ++c)
      CHECK(close(r.coefficients[(j - 1) * (d.p + 1) + c], m.coefficients()(static_cast<long>(c))));
    PredictOptions med;
    med.level = level;
    med.interval = IntervalKind::Prediction;
    PredictOptions mean;
    mean.center = Center::Mean;
    const Prediction pm = m.predict(Xte.data(), nte, d.p, med);
    const Prediction pa = m.predict(Xte.data(), nte, d.p, mean);
    for (std::size_t q = 0; q < nte; ++q) {
      const std::size_t i = te[q];
      CHECK(close(r.median[i], pm.fit[q]));
      CHECK(close(r.lower[i], pm.lower[q]));
      CHECK(close(r.upper[i], pm.upper[q]));
      CHECK(close(r.mean[i], pa.fit[q]));
      CHECK(r.flags[i] == pm.flags[q]);
    }
  }
}

}  // namespace

TEST_CASE("fold fits of a fixed transform equal a fit on each training part", "[crossval][fixed]") {
  const Data d = make_data(157, 11);
  const std::vector<int> fold = make_folds(d.n, 5, 1, 7);
  SECTION("log response, unweighted") {
    check_against_models(d, pwbtest::make(Family::Log), fold, 5, false, 0.95);
  }
  SECTION("Box-Cox 0.5 response, weighted, 90% intervals") {
    check_against_models(d, pwbtest::make(Family::BoxCox, 0.5), fold, 5, true, 0.90);
  }
  SECTION("identity response, zero weights in some rows, 3 folds") {
    Data z = d;
    for (std::size_t i = 0; i < z.n; i += 7) z.w[i] = 0.0;
    check_against_models(z, Transform(), make_folds(z.n, 3, 1, 3), 3, true, 0.95);
  }
  SECTION("a held-out row with a non-finite predictor is missing; training rows are not") {
    Data z = d;
    z.X[5] = std::nan("");  // row 5, first column
    const Transform t = pwbtest::make(Family::Log);
    const FixedFoldResult r = crossval_fixed(z.y.data(), z.X.data(), z.n, z.p, &t, fold.data(), 5);
    const int own = fold[5];
    for (int j = 1; j <= 5; ++j)
      CHECK(r.status[j - 1] == static_cast<int>(j == own ? FoldFit::Ok : FoldFit::InvalidTraining));
    CHECK(r.flags[5] == kPredMissing);
    CHECK(std::isnan(r.median[5]));
    CHECK(std::isnan(r.mean[5]));
    for (std::size_t i = 0; i < z.n; ++i)
      if (fold[i] != own) CHECK(std::isnan(r.median[i]));
  }
  SECTION("a response outside the transform's domain keeps its own fold only") {
    Data z = d;
    z.y[9] = -1.0;  // log cannot take it
    const Transform t = pwbtest::make(Family::Log);
    const FixedFoldResult r = crossval_fixed(z.y.data(), z.X.data(), z.n, z.p, &t, fold.data(), 5);
    for (int j = 1; j <= 5; ++j)
      CHECK(r.status[j - 1] ==
            static_cast<int>(j == fold[9] ? FoldFit::Ok : FoldFit::InvalidTraining));
    CHECK(std::isfinite(r.median[9]));  // its own prediction needs no y
  }
}

TEST_CASE("a training part missing a column's support is rank-deficient", "[crossval][fixed]") {
  Data d = make_data(60, 5);
  std::vector<int> fold(d.n);
  for (std::size_t i = 0; i < d.n; ++i) fold[i] = static_cast<int>(i % 4) + 1;
  // the 0/1 column is 1 only in fold 2's rows: without them it is zero (aliased, as lm says)
  for (std::size_t i = 0; i < d.n; ++i) d.X[2 * d.n + i] = (fold[i] == 2 && i % 8 == 1) ? 1.0 : 0.0;
  const FixedFoldResult r =
      crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 4);
  CHECK(r.status[1] == static_cast<int>(FoldFit::RankDeficient));
  CHECK(r.rank[1] == 3);
  for (int j : {0, 2, 3}) CHECK(r.status[j] == static_cast<int>(FoldFit::Ok));
  for (std::size_t i = 0; i < d.n; ++i) CHECK(std::isnan(r.median[i]) == (fold[i] == 2));
  // Model on fold 2's training part agrees that the column is aliased
  std::vector<double> ytr, Xtr;
  for (std::size_t i = 0; i < d.n; ++i) if (fold[i] != 2) ytr.push_back(d.y[i]);
  for (std::size_t c = 0; c < d.p; ++c)
    for (std::size_t i = 0; i < d.n; ++i) if (fold[i] != 2) Xtr.push_back(d.X[c * d.n + i]);
  const Model m(ytr.data(), Xtr.data(), ytr.size(), d.p, true, nullptr);
  CHECK(m.aliased()[3]);
}

TEST_CASE("no residual degrees of freedom and zero weights are reported per fold",
          "[crossval][fixed]") {
  Data d = make_data(8, 2);
  const std::vector<int> fold = {1, 2, 1, 2, 1, 2, 1, 2};
  // 4 training rows for 4 columns: no residual df, as Model's Singular error
  const FixedFoldResult r =
      crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 2);
  CHECK(r.status[0] == static_cast<int>(FoldFit::NoResidualDf));
  CHECK(r.status[1] == static_cast<int>(FoldFit::NoResidualDf));
  FixedFoldOptions opt;
  std::vector<double> w(8, 1.0);
  for (std::size_t i = 0; i < 8; i += 2) w[i] = 0.0;  // fold 1 weighs nothing
  opt.weights = w.data();
  const FixedFoldResult z =
      crossval_fixed(d.y.data(), d.X.data(), d.n, 1, nullptr, fold.data(), 2, opt);
  CHECK(z.status[1] == static_cast<int>(FoldFit::InvalidTraining));  // trains on fold 1 alone
  CHECK(z.status[0] == static_cast<int>(FoldFit::Ok));
}

TEST_CASE("fold fit arguments are checked", "[crossval][fixed]") {
  const Data d = make_data(10, 1);
  std::vector<int> fold = make_folds(d.n, 2, 1, 1);
  CHECK_THROWS_WITH(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 1),
                    Contains("at least 2 folds"));
  fold[3] = 3;
  CHECK_THROWS_WITH(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 2),
                    Contains("row 3"));
  fold[3] = 1;
  for (auto& f : fold) f = 1;
  CHECK_THROWS_WITH(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 2),
                    Contains("fold 2 has no rows"));
  // More folds than rows fails before anything is allocated per fold (a fold count near
  // INT_MAX once asked for gigabytes).
  fold = make_folds(d.n, 2, 1, 1);
  CHECK_THROWS_WITH(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(),
                                   2021161080),
                    Contains("at most 10 folds"));
  fold = make_folds(d.n, 2, 1, 1);
  std::vector<double> w(d.n, 1.0);
  w[4] = -1;
  FixedFoldOptions opt;
  opt.weights = w.data();
  CHECK_THROWS_AS(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 2, opt),
                  IndexedError);
  opt.weights = nullptr;
  opt.level = 1.0;
  CHECK_THROWS_WITH(crossval_fixed(d.y.data(), d.X.data(), d.n, d.p, nullptr, fold.data(), 2, opt),
                    Contains("level"));
}
