// Folds and held-out scores of the cross-validation.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <vector>

#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

TEST_CASE("folds are balanced and reproducible from the seed", "[crossval]") {
  const std::size_t n = 23;
  const std::vector<int> a = make_folds(n, 5, 3, 42), b = make_folds(n, 5, 3, 42),
                         c = make_folds(n, 5, 3, 43);
  CHECK(a == b);
  CHECK(a != c);
  for (int r = 0; r < 3; ++r) {
    std::vector<int> size(6, 0);
    for (std::size_t i = 0; i < n; ++i) ++size[a[r * n + i]];
    // 23 rows into 5 folds: three of 5 and two of 4
    CHECK(size[0] == 0);
    for (int f = 1; f <= 5; ++f) CHECK((size[f] == 4 || size[f] == 5));
  }
  // repeats are shuffled independently
  CHECK(std::vector<int>(a.begin(), a.begin() + n) != std::vector<int>(a.begin() + n, a.begin() + 2 * n));
  // repeat 0 does not depend on how many repeats were asked for
  const std::vector<int> one = make_folds(n, 5, 1, 42);
  CHECK(one == std::vector<int>(a.begin(), a.begin() + n));
}

TEST_CASE("fold arguments are checked", "[crossval]") {
  CHECK_THROWS_WITH(make_folds(4, 5, 1, 1), Contains("fewer rows (4) than folds (5)"));
  CHECK_THROWS_AS(make_folds(10, 1, 1, 1), Error);
  CHECK_THROWS_AS(make_folds(10, 2, 0, 1), Error);
}

TEST_CASE("held-out scores by hand", "[crossval]") {
  const std::vector<double> y = {1, 2, 4, 9}, fit = {2, 2, 3, 6}, lwr = {0, 1, 3.5, 2},
                            upr = {3, 1.5, 5, 8};
  const HoldoutScores s = holdout_scores(y.data(), fit.data(), lwr.data(), upr.data(), 4);
  // errors -1, 0, 1, 3: SSE 11, SAE 5; mean y 4, SST 9 + 4 + 0 + 25 = 38 (hand arithmetic)
  CHECK(s.rmse == Approx(std::sqrt(11.0 / 4)).epsilon(1e-15));
  CHECK(s.mae == Approx(5.0 / 4).epsilon(1e-15));
  CHECK(s.r2 == Approx(1 - 11.0 / 38).epsilon(1e-15));
  CHECK(s.coverage == 0.5);  // rows 1 and 3 covered; 2 above, 9 above
  CHECK(s.mean_width == Approx((3 + 0.5 + 1.5 + 6) / 4.0).epsilon(1e-15));
  CHECK(s.n_nonfinite == 0);
  CHECK(s.n_point == 4);
  CHECK(s.n_interval == 4);
  CHECK(s.median_width == Approx((1.5 + 3) / 2).epsilon(1e-15));  // widths 0.5, 1.5, 3, 6
  CHECK(s.share_unbounded == 0);
  const HoldoutScores t = holdout_scores(y.data(), fit.data(), nullptr, nullptr, 4);
  CHECK(std::isnan(t.coverage));
  std::vector<double> inf_fit = fit;
  inf_fit[2] = INFINITY;
  const HoldoutScores u = holdout_scores(y.data(), inf_fit.data(), nullptr, nullptr, 4);
  CHECK(u.n_nonfinite == 1);
  CHECK(u.n_point == 3);
  // the point scores use the three rows with a finite fit: errors -1, 0, 3; mean y 4,
  // SST 9 + 4 + 25 = 38 (hand arithmetic)
  CHECK(u.rmse == Approx(std::sqrt(10.0 / 3)).epsilon(1e-15));
  CHECK(u.r2 == Approx(1 - 10.0 / 38).epsilon(1e-15));
  const std::vector<double> bad = {1, NAN, 3, 4};
  CHECK_THROWS_AS(holdout_scores(bad.data(), fit.data(), nullptr, nullptr, 4), IndexedError);
  CHECK_THROWS_AS(holdout_scores(y.data(), fit.data(), lwr.data(), nullptr, 4), Error);
}

TEST_CASE("an infinite interval end still covers and leaves the point scores finite",
          "[crossval]") {
  // as for a reciprocal response whose back-transformed upper end is unbounded
  const std::vector<double> y = {0.8, 1.1, 0.7, 0.9}, fit = {0.88, 0.88, 0.85, 0.9},
                            lwr = {0.37, 0.37, 0.42, 0.5}, upr = {INFINITY, INFINITY, 1.2, 0.85};
  const HoldoutScores s = holdout_scores(y.data(), fit.data(), lwr.data(), upr.data(), 4);
  CHECK(s.n_nonfinite == 0);
  CHECK(s.n_point == 4);
  CHECK(std::isfinite(s.rmse));
  CHECK(s.coverage == 0.75);  // rows 1-3 covered (two by an unbounded interval); 0.9 > 0.85
  CHECK(std::isinf(s.mean_width));
  CHECK(std::isinf(s.median_width));  // widths 0.35, 0.78, Inf, Inf: the middle two hold an Inf
  CHECK(s.share_unbounded == 0.5);
  const std::vector<double> upr2 = {INFINITY, 1.5, 1.2, 0.85};
  const HoldoutScores t = holdout_scores(y.data(), fit.data(), lwr.data(), upr2.data(), 4);
  CHECK(t.median_width == Approx((0.78 + 1.13) / 2).epsilon(1e-12));  // widths 0.35, 0.78, 1.13, Inf
  CHECK(t.share_unbounded == 0.25);
  // a NaN end (a row the transform cannot take) leaves that row out of the interval scores only
  std::vector<double> lwr3 = lwr;
  lwr3[3] = NAN;
  const HoldoutScores u = holdout_scores(y.data(), fit.data(), lwr3.data(), upr.data(), 4);
  CHECK(u.n_interval == 3);
  CHECK(u.coverage == 1.0);
  CHECK(u.n_point == 4);
  // no finite fit at all: the point scores are undefined, not zero
  const std::vector<double> none = {NAN, NAN, INFINITY, NAN};
  const HoldoutScores v = holdout_scores(y.data(), none.data(), nullptr, nullptr, 4);
  CHECK(v.n_point == 0);
  CHECK(v.n_nonfinite == 4);
  CHECK(std::isnan(v.rmse));
}

TEST_CASE("stratified folds keep every stratum of two or more rows in every training part",
          "[crossval]") {
  // 32 rows in strata of sizes 1, 2, 2, 3, 4, 10, 10 (as a rare factor level would give)
  std::vector<int> strata;
  const int sizes[] = {1, 2, 2, 3, 4, 10, 10};
  for (int s = 0; s < 7; ++s)
    for (int j = 0; j < sizes[s]; ++j) strata.push_back(s);
  const std::size_t n = strata.size();
  const int k = 5;
  for (std::uint64_t seed = 1; seed <= 20; ++seed) {
    const std::vector<int> f = make_folds_by(n, k, 2, seed, strata.data(), nullptr);
    for (int r = 0; r < 2; ++r) {
      std::vector<int> size(k + 1, 0);
      for (std::size_t i = 0; i < n; ++i) ++size[f[r * n + i]];
      for (int g = 1; g <= k; ++g) CHECK((size[g] == 6 || size[g] == 7));  // 32 = 2*7 + 3*6
      for (int s = 0; s < 7; ++s) {
        std::vector<int> seen(k + 1, 0);
        for (std::size_t i = 0; i < n; ++i)
          if (strata[i] == s) ++seen[f[r * n + i]];
        int folds_hit = 0;
        for (int g = 1; g <= k; ++g) folds_hit += seen[g] > 0;
        CHECK(folds_hit == std::min(sizes[s], k));  // a stratum of m rows spans min(m, k) folds
      }
    }
  }
  CHECK(make_folds_by(n, k, 1, 9, strata.data(), nullptr) ==
        make_folds_by(n, k, 1, 9, strata.data(), nullptr));
  // without strata or groups: the plain folds
  CHECK(make_folds_by(n, k, 2, 9, nullptr, nullptr) == make_folds(n, k, 2, 9));
}

TEST_CASE("grouped folds keep each group whole", "[crossval]") {
  // 7 groups of uneven size (sites or patients)
  std::vector<int> groups;
  const int sizes[] = {5, 1, 3, 3, 8, 2, 4};
  for (int g = 0; g < 7; ++g)
    for (int j = 0; j < sizes[g]; ++j) groups.push_back(10 * g + 3);  // any codes >= 0
  const std::size_t n = groups.size();
  const std::vector<int> f = make_folds_by(n, 3, 2, 4, nullptr, groups.data());
  for (int r = 0; r < 2; ++r) {
    std::vector<int> size(4, 0);
    for (std::size_t i = 0; i < n; ++i) {
      ++size[f[r * n + i]];
      for (std::size_t j = 0; j < n; ++j)
        if (groups[i] == groups[j]) CHECK(f[r * n + i] == f[r * n + j]);
    }
    for (int g = 1; g <= 3; ++g) CHECK(size[g] > 0);
  }
  CHECK_THROWS_WITH(make_folds_by(n, 8, 1, 4, nullptr, groups.data()),
                    Contains("fewer groups (7) than folds (8)"));
  const std::vector<int> neg(n, -1);
  CHECK_THROWS_WITH(make_folds_by(n, 3, 1, 4, neg.data(), nullptr), Contains(">= 0"));
  CHECK_THROWS_AS(make_folds_by(n, 3, 1, 4, groups.data(), groups.data()), Error);
}

TEST_CASE("weighted held-out scores are weighted means; unit weights change nothing",
          "[crossval]") {
  const std::vector<double> y = {1, 2, 4, 8}, fit = {1.5, 2, 3, 9}, lwr = {0.5, 1.5, 3.5, 9.5},
                            upr = {2.5, 2.5, 4.5, 10.5}, w = {2, 1, 1, 0};
  // by hand: rows with weights 2, 1, 1 (row 4 weighs 0). Weighted mean of y = (2 + 2 + 4) / 4 = 2;
  // errors -0.5, 0, 1: SSE_w = 2 * 0.25 + 0 + 1 = 1.5, SAE_w = 1 + 0 + 1 = 2,
  // SST_w = 2 * 1 + 0 + 4 = 6; covered rows 1-3 (row 4 not, but weighs 0); widths 2, 1, 1 with
  // weights 2, 1, 1: cumulative 1 (width 1), 2 (width 1) meets half of 4 exactly -> midpoint of
  // the second 1 and the 2 -> 1.5
  const HoldoutScores s = holdout_scores(y.data(), fit.data(), lwr.data(), upr.data(), 4, w.data());
  CHECK(s.rmse == Approx(std::sqrt(1.5 / 4)).epsilon(1e-15));
  CHECK(s.mae == Approx(0.5).epsilon(1e-15));
  CHECK(s.r2 == Approx(1 - 1.5 / 6).epsilon(1e-15));
  CHECK(s.coverage == 1.0);
  CHECK(s.mean_width == Approx((2 * 2 + 1 + 1) / 4.0).epsilon(1e-15));
  CHECK(s.median_width == Approx(1.5).epsilon(1e-15));
  CHECK(s.n_point == 4);  // the zero-weight row is counted, not scored
  const std::vector<double> ones(4, 1.0);
  const HoldoutScores a = holdout_scores(y.data(), fit.data(), lwr.data(), upr.data(), 4, ones.data());
  const HoldoutScores b = holdout_scores(y.data(), fit.data(), lwr.data(), upr.data(), 4);
  CHECK(a.rmse == b.rmse);
  CHECK(a.mae == b.mae);
  CHECK(a.r2 == b.r2);
  CHECK(a.coverage == b.coverage);
  CHECK(a.mean_width == b.mean_width);
  CHECK(a.median_width == b.median_width);
  // integer weights equal repeating the rows (row 1 twice, row 4 dropped)
  const std::vector<double> yr = {1, 1, 2, 4}, fr = {1.5, 1.5, 2, 3};
  const HoldoutScores r = holdout_scores(yr.data(), fr.data(), nullptr, nullptr, 4);
  CHECK(s.rmse == Approx(r.rmse).epsilon(1e-15));
  CHECK(s.r2 == Approx(r.r2).epsilon(1e-15));
  // bad weights are named by row
  const std::vector<double> neg = {1, -1, 1, -2}, nan = {1, 1, NAN, 1}, zero(4, 0.0);
  CHECK_THROWS_WITH(holdout_scores(y.data(), fit.data(), nullptr, nullptr, 4, neg.data()),
                    Contains("2 negative values at rows 1, 3"));
  CHECK_THROWS_AS(holdout_scores(y.data(), fit.data(), nullptr, nullptr, 4, nan.data()),
                  IndexedError);
  const HoldoutScores z = holdout_scores(y.data(), fit.data(), nullptr, nullptr, 4, zero.data());
  CHECK(std::isnan(z.rmse));  // no weight at all: nothing to score
}
