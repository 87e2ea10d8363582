// The comparison tools through the C ABI: Box-Tidwell, lambda influence, folds and scores.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_box_tidwell fills the caller's buffers and history", "[capi_compare]") {
  std::mt19937 gen(21);
  std::uniform_real_distribution<double> u(0.5, 5);
  std::normal_distribution<double> nd;
  const size_t n = 200;
  std::vector<double> y(n), x(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = u(gen);
    y[i] = 3 + 2 * std::log(x[i]) + 0.2 * nd(gen);
  }
  pwb_box_tidwell_options opt;
  pwb_box_tidwell_options_init(&opt);
  CHECK(opt.max_iter == 50);
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  double alpha = NAN, se = NAN, t = NAN, p = NAN;
  std::vector<double> hist(static_cast<size_t>(opt.max_iter) + 1);
  REQUIRE(pwb_box_tidwell(y.data(), nullptr, n, 0, x.data(), 1, &opt, &alpha, &se, &t, &p,
                          hist.data(), &res) == PWB_OK);
  CHECK(res.converged == 1);
  CHECK(res.n == n);
  // simulated from log x, the limit of the power family at 0: 2 SE is a ~95% band
  CHECK(std::fabs(alpha) < 2 * se);
  CHECK(p < 1e-6);  // strong curvature in x: power 1 is rejected
  CHECK(hist[0] == 1.0);
  CHECK(hist[static_cast<size_t>(res.iterations)] == alpha);
  CHECK(std::isnan(hist.back()));
}

TEST_CASE("pwb_box_tidwell rejects bad input with a message", "[capi_compare]") {
  std::vector<double> y = {1, 2, 3, 4, 5, 6}, x = {1, -2, 3, 4, 5, 6};
  pwb_box_tidwell_result res;
  res.struct_size = sizeof res;
  double a, s;
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, x.data(), 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("must be > 0") && Contains("rows 1"));
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, nullptr, 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_ARGUMENT);
  res.struct_size = 1;
  x[1] = 2;
  CHECK(pwb_box_tidwell(y.data(), nullptr, 6, 0, x.data(), 1, nullptr, &a, &s, nullptr, nullptr,
                        nullptr, &res) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("struct_size"));
}

TEST_CASE("pwb_lambda_influence agrees with its full estimate and flags rows", "[capi_compare]") {
  std::mt19937 gen(8);
  std::normal_distribution<double> nd;
  const size_t n = 30;
  std::vector<double> y(n), x(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = static_cast<double>(i) / 3.0;
    y[i] = std::exp(1 + 0.2 * x[i] + 0.1 * nd(gen));
  }
  y[0] = 40;  // a gross outlier at the low end
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  pwb_influence_summary s;
  s.struct_size = sizeof s;
  std::vector<double> loo(n), h(n);
  std::vector<int> out(n), bound(n);
  REQUIRE(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &s, loo.data(), h.data(),
                               out.data(), bound.data()) == PWB_OK);
  CHECK(s.n == n);
  CHECK(s.conf_low < s.lambda);
  CHECK(s.lambda < s.conf_high);
  size_t flagged = 0;
  for (size_t i = 0; i < n; ++i) flagged += static_cast<size_t>(out[i]);
  CHECK(flagged == s.n_outside);
  // deleting the outlier moves lambda-hat out of the interval (it drives the fit alone)
  CHECK(out[0] == 1);
  opt.family = PWB_LOG;
  CHECK(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &s, nullptr, nullptr, nullptr,
                             nullptr) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("PWB_BOX_COX"));
}

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
