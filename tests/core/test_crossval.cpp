// Folds and held-out scores of the cross-validation.
#include <catch2/catch.hpp>

#include <cmath>
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
  const HoldoutScores t = holdout_scores(y.data(), fit.data(), nullptr, nullptr, 4);
  CHECK(std::isnan(t.coverage));
  std::vector<double> inf_fit = fit;
  inf_fit[2] = INFINITY;
  const HoldoutScores u = holdout_scores(y.data(), inf_fit.data(), nullptr, nullptr, 4);
  CHECK(u.n_nonfinite == 1);
  CHECK(std::isinf(u.rmse));
  const std::vector<double> bad = {1, NAN, 3, 4};
  CHECK_THROWS_AS(holdout_scores(bad.data(), fit.data(), nullptr, nullptr, 4), IndexedError);
  CHECK_THROWS_AS(holdout_scores(y.data(), fit.data(), lwr.data(), nullptr, 4), Error);
}
