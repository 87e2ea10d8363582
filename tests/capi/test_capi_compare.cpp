// The comparison tools through the C ABI: folds and scores.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_cv_folds and pwb_holdout_score", "[capi_compare]") {
  std::vector<int> f(20);
  REQUIRE(pwb_cv_folds(10, 3, 2, 7ull, f.data()) == PWB_OK);
  for (int v : f) CHECK((v >= 1 && v <= 3));
  CHECK(pwb_cv_folds(2, 3, 1, 7ull, f.data()) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("fewer rows"));
  const double y[] = {1, 2, 3}, fit[] = {1, 2, 5};
  pwb_holdout_scores s;
  s.struct_size = sizeof s;
  REQUIRE(pwb_holdout_score(y, fit, nullptr, nullptr, 3, &s) == PWB_OK);
  // errors 0, 0, -2: RMSE sqrt(4/3), SST 2, R^2 = 1 - 4/2 = -1 (hand arithmetic)
  CHECK(s.rmse == Approx(std::sqrt(4.0 / 3)).epsilon(1e-15));
  CHECK(s.r2 == Approx(-1.0).epsilon(1e-15));
  CHECK(std::isnan(s.coverage));
}

TEST_CASE("pwb_holdout_score: an unbounded interval covers; older struct sizes still work",
          "[capi_compare]") {
  const double y[] = {0.8, 1.1, 0.7}, fit[] = {0.9, 0.9, 0.8}, lwr[] = {0.4, 0.4, 0.5},
               upr[] = {INFINITY, INFINITY, 1.0};
  pwb_holdout_scores s;
  s.struct_size = sizeof s;
  REQUIRE(pwb_holdout_score(y, fit, lwr, upr, 3, &s) == PWB_OK);
  CHECK(s.n_nonfinite == 0);
  CHECK(s.n_point == 3);
  CHECK(s.n_interval == 3);
  CHECK(std::isfinite(s.rmse));
  CHECK(s.coverage == 1.0);
  CHECK(std::isinf(s.median_width));  // widths 0.5, Inf, Inf
  CHECK(s.share_unbounded == Approx(2.0 / 3).epsilon(1e-15));
  // a caller compiled before the new fields: they are left untouched
  pwb_holdout_scores old;
  old.struct_size = offsetof(pwb_holdout_scores, n_point);
  old.n_point = 12345;
  REQUIRE(pwb_holdout_score(y, fit, lwr, upr, 3, &old) == PWB_OK);
  CHECK(old.n_point == 12345);
  CHECK(old.coverage == 1.0);
  old.struct_size = offsetof(pwb_holdout_scores, n_point) - 1;
  CHECK(pwb_holdout_score(y, fit, lwr, upr, 3, &old) == PWB_ERR_ARGUMENT);
}

TEST_CASE("pwb_cv_folds_by: stratified, grouped and plain folds", "[capi_compare]") {
  const size_t n = 12;
  const int strata[n] = {0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 2, 1};
  pwb_cv_fold_options opt;
  pwb_cv_fold_options_init(&opt);
  CHECK(opt.folds == 5);
  CHECK(opt.repeats == 1);
  opt.folds = 4;
  opt.seed = 11;
  std::vector<int> plain(n), by(n);
  REQUIRE(pwb_cv_folds_by(n, &opt, plain.data()) == PWB_OK);
  std::vector<int> old(n);
  REQUIRE(pwb_cv_folds(n, 4, 1, 11ull, old.data()) == PWB_OK);
  CHECK(plain == old);
  opt.strata = strata;
  REQUIRE(pwb_cv_folds_by(n, &opt, by.data()) == PWB_OK);
  CHECK(by[0] != by[1]);  // the two rows of stratum 0 are in different folds
  const int groups[n] = {1, 1, 1, 2, 2, 3, 3, 3, 4, 5, 5, 6};
  opt.strata = nullptr;
  opt.groups = groups;
  REQUIRE(pwb_cv_folds_by(n, &opt, by.data()) == PWB_OK);
  CHECK(by[0] == by[1]);
  CHECK(by[1] == by[2]);
  CHECK(by[9] == by[10]);
  opt.folds = 7;
  CHECK(pwb_cv_folds_by(n, &opt, by.data()) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("fewer groups (6) than folds (7)"));
  opt.struct_size = 4;
  CHECK(pwb_cv_folds_by(n, &opt, by.data()) == PWB_ERR_ARGUMENT);
  CHECK(pwb_cv_folds_by(n, nullptr, by.data()) == PWB_ERR_ARGUMENT);
}

TEST_CASE("pwb_holdout_score_opts: weights, defaults and bad weights", "[capi_compare]") {
  const double y[] = {1, 2, 3}, fit[] = {1, 2, 5}, w[] = {1, 1, 2};
  pwb_holdout_options opt;
  pwb_holdout_options_init(&opt);
  CHECK(opt.weights == nullptr);
  pwb_holdout_scores a, b;
  a.struct_size = b.struct_size = sizeof a;
  REQUIRE(pwb_holdout_score_opts(y, fit, nullptr, nullptr, 3, &opt, &a) == PWB_OK);
  REQUIRE(pwb_holdout_score(y, fit, nullptr, nullptr, 3, &b) == PWB_OK);
  CHECK(a.rmse == b.rmse);
  REQUIRE(pwb_holdout_score_opts(y, fit, nullptr, nullptr, 3, nullptr, &a) == PWB_OK);
  CHECK(a.r2 == b.r2);
  opt.weights = w;
  REQUIRE(pwb_holdout_score_opts(y, fit, nullptr, nullptr, 3, &opt, &a) == PWB_OK);
  // errors 0, 0, -2 with weights 1, 1, 2: RMSE sqrt(8/4); weighted mean of y 9/4,
  // SST_w = 25/16 + 1/16 + 2 * 9/16 = 44/16, R^2 = 1 - 8 / (44/16) (hand arithmetic)
  CHECK(a.rmse == Approx(std::sqrt(2.0)).epsilon(1e-15));
  CHECK(a.r2 == Approx(1 - 8.0 * 16 / 44).epsilon(1e-14));
  const double neg[] = {1, -3, 1};
  opt.weights = neg;
  CHECK(pwb_holdout_score_opts(y, fit, nullptr, nullptr, 3, &opt, &a) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("negative values at rows 1"));
  opt.struct_size = 4;
  CHECK(pwb_holdout_score_opts(y, fit, nullptr, nullptr, 3, &opt, &a) == PWB_ERR_ARGUMENT);
}
