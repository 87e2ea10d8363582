// pwb_cv_fixed_predict: fold fits of fixed transforms through the C ABI, against pwb_model_fit
// on each training part and pwb_model_predict of the held-out rows.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {

// Both paths form the same least-squares sums in another order: agreement to a few hundred
// ulps on this well-conditioned design, so 1e-10 relative leaves room.
bool close(double a, double b) {
  if (std::isnan(a) || std::isnan(b)) return std::isnan(a) && std::isnan(b);
  return std::fabs(a - b) <= 1e-10 * std::max(1.0, std::fabs(b));
}

}  // namespace

TEST_CASE("pwb_cv_fixed_predict equals a model fitted on each training part", "[capi_crossval]") {
  const std::size_t n = 90, p = 2;
  std::mt19937_64 gen(3);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::vector<double> y(n), X(n * p), w(n);
  for (std::size_t i = 0; i < n; ++i) {
    X[i] = std::exp(nd(gen));
    X[n + i] = nd(gen);
    y[i] = std::exp(0.5 + 0.3 * std::log(X[i]) + 0.2 * X[n + i] + 0.4 * nd(gen));
    w[i] = 0.5 + (i % 4);
  }
  std::vector<int> fold(n);
  REQUIRE(pwb_cv_folds(n, 4, 1, 11ull, fold.data()) == PWB_OK);
  pwb_transform_spec spec;
  pwb_transform_spec_init(&spec);
  spec.family = PWB_BOX_COX;
  spec.lambda = 0.25;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&spec, &t) == PWB_OK);

  pwb_cv_fixed_options opt;
  pwb_cv_fixed_options_init(&opt);
  opt.level = 0.9;
  opt.weights = w.data();
  std::vector<double> med(n), mean(n), lo(n), hi(n), sigma(4), coef(4 * (p + 1));
  std::vector<unsigned> flags(n);
  std::vector<int> status(4);
  std::vector<size_t> df(4);
  pwb_cv_fixed_result res = {sizeof(pwb_cv_fixed_result), med.data(), mean.data(), lo.data(),
                             hi.data(), flags.data(), status.data(), sigma.data(), df.data(),
                             coef.data()};
  REQUIRE(pwb_cv_fixed_predict(y.data(), X.data(), n, p, t, fold.data(), 4, &opt, &res) == PWB_OK);

  for (int j = 1; j <= 4; ++j) {
    std::vector<double> ytr, Xtr, wtr, Xte;
    std::vector<std::size_t> te;
    for (std::size_t i = 0; i < n; ++i)
      if (fold[i] != j) ytr.push_back(y[i]), wtr.push_back(w[i]);
      else te.push_back(i);
    for (std::size_t c = 0; c < p; ++c) {
      for (std::size_t i = 0; i < n; ++i) if (fold[i] != j) Xtr.push_back(X[c * n + i]);
      for (std::size_t i : te) Xte.push_back(X[c * n + i]);
    }
    pwb_model_options mo;
    pwb_model_options_init(&mo);
    mo.weights = wtr.data();
    pwb_model* m = nullptr;
    REQUIRE(pwb_model_fit(ytr.data(), Xtr.data(), ytr.size(), p, t, &mo, &m) == PWB_OK);
    pwb_model_info info;
    info.struct_size = sizeof info;
    REQUIRE(pwb_model_get_info(m, &info) == PWB_OK);
    CHECK(status[j - 1] == PWB_CV_FOLD_OK);
    CHECK(df[j - 1] == info.df_residual);
    CHECK(close(sigma[j - 1], info.sigma));
    pwb_predict_options po;
    pwb_predict_options_init(&po);
    po.level = 0.9;
    po.interval = PWB_INTERVAL_PREDICTION;
    std::vector<double> f(te.size()), l(te.size()), u(te.size()), fm(te.size());
    std::vector<unsigned> fl(te.size());
    REQUIRE(pwb_model_predict(m, Xte.data(), te.size(), p, &po, f.data(), l.data(), u.data(),
                              fl.data()) == PWB_OK);
    po.interval = PWB_INTERVAL_NONE;
    po.center = PWB_CENTER_MEAN;
    REQUIRE(pwb_model_predict(m, Xte.data(), te.size(), p, &po, fm.data(), nullptr, nullptr,
                              nullptr) == PWB_OK);
    for (std::size_t q = 0; q < te.size(); ++q) {
      CHECK(close(med[te[q]], f[q]));
      CHECK(close(lo[te[q]], l[q]));
      CHECK(close(hi[te[q]], u[q]));
      CHECK(close(mean[te[q]], fm[q]));
      CHECK(flags[te[q]] == fl[q]);
    }
    pwb_model_free(m);
  }

  // outputs not wanted may be NULL
  pwb_cv_fixed_result some = {sizeof(pwb_cv_fixed_result), med.data(), nullptr, nullptr, nullptr,
                              nullptr, status.data(), nullptr, nullptr, nullptr};
  CHECK(pwb_cv_fixed_predict(y.data(), X.data(), n, p, t, fold.data(), 4, nullptr, &some) ==
        PWB_OK);

  // a training row the transform cannot take: every fold but its own is reported, not fitted
  std::vector<double> y2 = y;
  y2[7] = -2.0;
  REQUIRE(pwb_cv_fixed_predict(y2.data(), X.data(), n, p, t, fold.data(), 4, nullptr, &res) ==
          PWB_OK);
  for (int j = 1; j <= 4; ++j)
    CHECK(status[j - 1] == (j == fold[7] ? PWB_CV_FOLD_OK : PWB_CV_FOLD_INVALID_TRAINING));

  // errors: status codes with per-thread text
  pwb_cv_fixed_result small = res;
  small.struct_size = sizeof(size_t);
  CHECK(pwb_cv_fixed_predict(y.data(), X.data(), n, p, t, fold.data(), 4, nullptr, &small) ==
        PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("pwb_cv_fixed_result"));
  fold[2] = 9;
  CHECK(pwb_cv_fixed_predict(y.data(), X.data(), n, p, t, fold.data(), 4, nullptr, &res) ==
        PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("row 2"));
  fold[2] = 1;
  w[5] = -1;
  CHECK(pwb_cv_fixed_predict(y.data(), X.data(), n, p, t, fold.data(), 4, &opt, &res) ==
        PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("weights"));
  CHECK(pwb_cv_fixed_predict(nullptr, X.data(), n, p, t, fold.data(), 4, nullptr, &res) ==
        PWB_ERR_ARGUMENT);
  pwb_cv_fixed_options_init(nullptr);
  pwb_transform_free(t);
}
