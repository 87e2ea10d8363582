// Weighted models, the coefficient covariance, standard errors of new fits and the checks with
// their note through the C ABI, against weighted least squares solved by hand.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8};
const std::vector<double> kY = {2.1, 3.9, 6.2, 7.8, 10.1, 12.3, 13.8, 16.4};
const std::vector<double> kW = {1, 2, 1, 0.5, 3, 1, 2, 0};

// Weighted least squares of y on [1 x] by the normal equations (2 x 2, solved by hand), over the
// rows of positive weight: coefficients, RSS = sum w e^2, (X'WX)^{-1}.
struct Wls {
  double b0, b1, rss, inv00, inv01, inv11;
  std::size_t n_used;
};
Wls wls(const std::vector<double>& x, const std::vector<double>& y, const std::vector<double>& w) {
  double s0 = 0, s1 = 0, s2 = 0, t0 = 0, t1 = 0;
  std::size_t used = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    s0 += w[i];
    s1 += w[i] * x[i];
    s2 += w[i] * x[i] * x[i];
    t0 += w[i] * y[i];
    t1 += w[i] * x[i] * y[i];
    if (w[i] > 0) ++used;
  }
  const double det = s0 * s2 - s1 * s1;
  Wls r;
  r.inv00 = s2 / det;
  r.inv01 = -s1 / det;
  r.inv11 = s0 / det;
  r.b0 = r.inv00 * t0 + r.inv01 * t1;
  r.b1 = r.inv01 * t0 + r.inv11 * t1;
  r.rss = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double e = y[i] - r.b0 - r.b1 * x[i];
    r.rss += w[i] * e * e;
  }
  r.n_used = used;
  return r;
}
}  // namespace

TEST_CASE("a weighted model equals weighted least squares by hand", "[capi][model][weights]") {
  pwb_model_options o;
  pwb_model_options_init(&o);
  REQUIRE(o.weights == nullptr);
  o.weights = kW.data();
  pwb_model* m = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, &o, &m) == PWB_OK);
  const Wls ref = wls(kX, kY, kW);
  pwb_model_info info;
  info.struct_size = sizeof info;
  REQUIRE(pwb_model_get_info(m, &info) == PWB_OK);
  CHECK(info.n == kX.size());
  CHECK(info.nobs == ref.n_used);  // the zero-weight row is out of the fit
  CHECK(info.weighted == 1);
  CHECK(info.df_residual == ref.n_used - 2);
  // 1e-12 relative: a 2 x 2 normal-equation solve of well-scaled data loses a few digits at most.
  CHECK(info.rss == Approx(ref.rss).epsilon(1e-12));
  const double s2 = ref.rss / static_cast<double>(ref.n_used - 2);
  CHECK(info.sigma == Approx(std::sqrt(s2)).epsilon(1e-12));
  // Weighted log-likelihood as R's logLik.lm: 1/2 sum log w - N/2 (log 2 pi + 1 - log N + log RSS)
  double slw = 0;
  for (double w : kW)
    if (w > 0) slw += std::log(w);
  const double N = static_cast<double>(ref.n_used);
  const double ll = 0.5 * slw - N / 2 * (std::log(2 * M_PI) + 1 - std::log(N) + std::log(ref.rss));
  CHECK(info.loglik == Approx(ll).epsilon(1e-12));
  double coef[2];
  REQUIRE(pwb_model_coefficients(m, coef, nullptr, nullptr, 2) == PWB_OK);
  CHECK(coef[0] == Approx(ref.b0).epsilon(1e-12));
  CHECK(coef[1] == Approx(ref.b1).epsilon(1e-12));
  double cov[4];
  REQUIRE(pwb_model_covariance(m, cov, 2) == PWB_OK);
  CHECK(cov[0] == Approx(s2 * ref.inv00).epsilon(1e-10));
  CHECK(cov[1] == Approx(s2 * ref.inv01).epsilon(1e-10));
  CHECK(cov[2] == Approx(s2 * ref.inv01).epsilon(1e-10));
  CHECK(cov[3] == Approx(s2 * ref.inv11).epsilon(1e-10));
  // Residuals of every row, the zero-weight one included; its leverage is 0.
  std::vector<double> res(kX.size()), lev(kX.size());
  REQUIRE(pwb_model_vector_get(m, PWB_MODEL_RESIDUALS, res.data(), res.size()) == PWB_OK);
  REQUIRE(pwb_model_vector_get(m, PWB_MODEL_LEVERAGES, lev.data(), lev.size()) == PWB_OK);
  CHECK(res[7] == Approx(kY[7] - ref.b0 - ref.b1 * kX[7]).epsilon(1e-12));
  CHECK(lev[7] == 0.0);
  // Leverage of row 0 of the weighted design: w0 x0' (X'WX)^{-1} x0.
  const double h0 = kW[0] * (ref.inv00 + 2 * ref.inv01 * kX[0] + ref.inv11 * kX[0] * kX[0]);
  CHECK(lev[0] == Approx(h0).epsilon(1e-10));
  // Standard errors of new fits: sigma sqrt(x0'(X'WX)^{-1} x0); a NaN row gives NaN.
  const double xn[2] = {2.5, NAN};
  double se[2];
  REQUIRE(pwb_model_predict_se(m, xn, 2, 1, se) == PWB_OK);
  const double v = ref.inv00 + 2 * ref.inv01 * 2.5 + ref.inv11 * 2.5 * 2.5;
  CHECK(se[0] == Approx(std::sqrt(s2 * v)).epsilon(1e-10));
  CHECK(std::isnan(se[1]));
  pwb_model_free(m);
}

TEST_CASE("weights of one: the weighted fit equals the unweighted one", "[capi][model][weights]") {
  const std::vector<double> ones(kX.size(), 1.0);
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.weights = ones.data();
  pwb_model *mw = nullptr, *mu = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, &o, &mw) == PWB_OK);
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, nullptr, &mu) == PWB_OK);
  pwb_residual_checks cw, cu;
  pwb_residual_checks_init(&cw);
  pwb_residual_checks_init(&cu);
  std::size_t needed = 0;
  REQUIRE(pwb_model_residual_checks_with_note(mw, &cw, nullptr, 0, &needed) == PWB_OK);
  REQUIRE(pwb_model_residual_checks(mu, &cu) == PWB_OK);
  // Same rows, same design: the checks agree to rounding (1e-9 relative).
  CHECK(cw.bp_statistic == Approx(cu.bp_statistic).epsilon(1e-9));
  CHECK(cw.reset_f == Approx(cu.reset_f).epsilon(1e-9));
  CHECK(cw.sw_statistic == Approx(cu.sw_statistic).epsilon(1e-9));
  pwb_model_info iw, iu;
  iw.struct_size = iu.struct_size = sizeof iw;
  REQUIRE(pwb_model_get_info(mw, &iw) == PWB_OK);
  REQUIRE(pwb_model_get_info(mu, &iu) == PWB_OK);
  CHECK(iw.loglik == Approx(iu.loglik).epsilon(1e-12));
  CHECK(iu.weighted == 0);
  pwb_model_free(mw);
  pwb_model_free(mu);
}

TEST_CASE("bad weights and old struct sizes", "[capi][model][weights]") {
  std::vector<double> w(kX.size(), 1.0);
  w[2] = -1;
  w[5] = NAN;
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.weights = w.data();
  pwb_model* m = nullptr;
  CHECK(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, &o, &m) == PWB_ERR_DOMAIN);
  CHECK(m == nullptr);
  CHECK_THAT(std::string(pwb_last_error()), Contains("rows 2, 5"));
  const std::vector<double> zero(kX.size(), 0.0);
  o.weights = zero.data();
  CHECK(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, &o, &m) == PWB_ERR_SINGULAR);
  // A caller of the first struct version (no weights field) fits unweighted.
  o.weights = zero.data();
  o.struct_size = offsetof(pwb_model_options, weights);
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, &o, &m) == PWB_OK);
  pwb_model_info info;
  info.struct_size = offsetof(pwb_model_info, nobs);
  info.nobs = 12345;
  REQUIRE(pwb_model_get_info(m, &info) == PWB_OK);
  CHECK(info.nobs == 12345);  // beyond the caller's struct: not written
  double cov[1];
  CHECK(pwb_model_covariance(m, cov, 1) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_predict_se(m, kX.data(), 1, 2, cov) == PWB_ERR_ARGUMENT);
  pwb_model_free(m);
}

TEST_CASE("predictions at the model's own rows equal predictions of its design", "[capi][model]") {
  pwb_model* m = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), kX.size(), 1, nullptr, nullptr, &m) == PWB_OK);
  pwb_predict_options po;
  pwb_predict_options_init(&po);
  po.interval = PWB_INTERVAL_PREDICTION;
  const std::size_t n = kX.size();
  std::vector<double> f1(n), l1(n), f2(n), l2(n);
  REQUIRE(pwb_model_predict_fitted(m, &po, f1.data(), l1.data(), nullptr, nullptr, n) == PWB_OK);
  REQUIRE(pwb_model_predict(m, kX.data(), n, 1, &po, f2.data(), l2.data(), nullptr, nullptr) ==
          PWB_OK);
  for (std::size_t i = 0; i < n; ++i) {
    CHECK(f1[i] == f2[i]);  // the same rows, the same arithmetic
    CHECK(l1[i] == l2[i]);
  }
  CHECK(pwb_model_predict_fitted(m, &po, f1.data(), nullptr, nullptr, nullptr, n - 1) ==
        PWB_ERR_ARGUMENT);
  pwb_model_free(m);
}
