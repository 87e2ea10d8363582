// pwb_model_options.borrow_design through the C ABI: the full design read in place gives the
// copying fit's results bit for bit (the reference is that fit), an older struct without the
// field copies, and a first column that is not all ones is refused.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
constexpr std::size_t kN = 12, kP = 2;
const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12,  // x1
                                0.3, -0.1, 0.8, 0.2, -0.5, 0.9, 0.0, 0.4, -0.2, 0.7, 0.1, -0.3};
const std::vector<double> kY = {2.3, 2.9, 4.4, 4.9, 5.2, 7.1, 7.0, 8.6, 8.9, 10.8, 11.0, 12.1};

std::vector<double> full_design() {
  std::vector<double> d(kN, 1.0);
  d.insert(d.end(), kX.begin(), kX.end());
  return d;
}

struct Fit {
  std::vector<double> coef, se, lev, fit, lwr, upr;
  double sigma = 0, loglik = 0;
};
Fit read(const pwb_model* m) {
  Fit f;
  f.coef.resize(kP + 1);
  f.se.resize(kP + 1);
  f.lev.resize(kN);
  f.fit.resize(kN);
  f.lwr.resize(kN);
  f.upr.resize(kN);
  REQUIRE(pwb_model_coefficients(m, f.coef.data(), f.se.data(), nullptr, kP + 1) == PWB_OK);
  REQUIRE(pwb_model_vector_get(m, PWB_MODEL_LEVERAGES, f.lev.data(), kN) == PWB_OK);
  pwb_predict_options po;
  pwb_predict_options_init(&po);
  po.interval = PWB_INTERVAL_PREDICTION;
  REQUIRE(pwb_model_predict_fitted(m, &po, f.fit.data(), f.lwr.data(), f.upr.data(), nullptr,
                                   kN) == PWB_OK);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(m, &info) == PWB_OK);
  f.sigma = info.sigma;
  f.loglik = info.loglik;
  return f;
}
}  // namespace

TEST_CASE("a borrowed design gives the copying fit bit for bit", "[capi][model][borrow]") {
  pwb_model_options o;
  pwb_model_options_init(&o);
  REQUIRE(o.borrow_design == 0);
  pwb_model* copied = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kN, kP, nullptr, &o, &copied) == PWB_OK);
  const std::vector<double> D = full_design();
  o.borrow_design = 1;
  pwb_model* borrowed = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), D.data(), kN, kP, nullptr, &o, &borrowed) == PWB_OK);
  const Fit a = read(copied), b = read(borrowed);
  CHECK(a.coef == b.coef);
  CHECK(a.se == b.se);
  CHECK(a.lev == b.lev);
  CHECK(a.fit == b.fit);
  CHECK(a.lwr == b.lwr);
  CHECK(a.upr == b.upr);
  CHECK(a.sigma == b.sigma);
  CHECK(a.loglik == b.loglik);
  // New rows take the predictors alone, as for a copying fit.
  const std::vector<double> xnew = {4.5, 0.25};
  double fa = 0, fb = 0;
  REQUIRE(pwb_model_predict(copied, xnew.data(), 1, kP, nullptr, &fa, nullptr, nullptr, nullptr) ==
          PWB_OK);
  REQUIRE(pwb_model_predict(borrowed, xnew.data(), 1, kP, nullptr, &fb, nullptr, nullptr,
                            nullptr) == PWB_OK);
  CHECK(fa == fb);
  pwb_model_free(copied);
  pwb_model_free(borrowed);
}

TEST_CASE("an options struct without borrow_design copies X", "[capi][model][borrow]") {
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.borrow_design = 1;  // beyond the struct the caller declares: ignored
  o.struct_size = offsetof(pwb_model_options, borrow_design);
  pwb_model* m = nullptr;
  // X without its intercept column is accepted and fitted as predictors.
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kN, kP, nullptr, &o, &m) == PWB_OK);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(m, &info) == PWB_OK);
  CHECK(info.columns == kP + 1);
  pwb_model_free(m);
}

TEST_CASE("a borrowed design must start with its intercept column", "[capi][model][borrow]") {
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.borrow_design = 1;
  pwb_model* m = nullptr;
  std::vector<double> D = full_design();
  D[1] = 2.0;  // the intercept column, row 1
  CHECK(pwb_model_fit(kY.data(), D.data(), kN, kP, nullptr, &o, &m) == PWB_ERR_ARGUMENT);
  CHECK(m == nullptr);
  CHECK_THAT(std::string(pwb_last_error()), Contains("all ones") && Contains("row 1"));
}
