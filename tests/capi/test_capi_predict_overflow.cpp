// Predictions whose linear predictor overflows: every predictor is finite, but a coefficient of
// order 1e134 times a predictor of order 1e265 is beyond the double range, and two such terms of
// opposite sign give NaN. Such a row must be flagged, never a bare NaN or Inf with PWB_OK.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "powerback.h"

namespace {
// An input the model fuzzer produced (37 rows, 3 predictors, identity response): y holds one
// value of 3.4e135 and X one of 1.6e267, so the fitted coefficients are of order 1e131..1e134.
const std::vector<double> kY = {
    5.4140625, 11.7265625, -8.05859375, 3.3914965695292855e+135, -4.80078125, 1.19140625,
    4.6328125, 3.08203125, -0.1171875, -8.0390625, -2.54296875, 0.18359375, 1.82421875, 2.19140625,
    -6.03515625, 2.12890625, 1.89453125, 2.88671875, 0.5625, 2.28515625, -2.42578125, -0.421875,
    1.50390625, 2.40625, -6.1640625, 0.6640625, 2.56640625, -10.4453125, -1.24609375, -10.77734375,
    2.0859375, -2.37890625, 10.47265625, 5.9609375, 8.01171875, -10.13671875, -1.99609375};
const std::vector<double> kX = {
    1.34765625, 2.95703125, -0.2109375, 6.43359375, -3.73046875, 1.5521183079235958e+267,
    -2.33203125, -7.3515625, -4.93359375, -6.3203125, 4.859375, -2.56640625, -10.515625,
    10.87109375, 6.5859375, -0.9296875, 8.828125, -9.2890625, 1.234375, -4.80078125, 1.19140625,
    4.6328125, 3.08203125, -0.1171875, 12.1953125, 10.66796875, -0.23046875, 0.828125, 8.39453125,
    6.76953125, -2.40625, 4.26953125, 6.1875, -8.77734375, -6.40234375, 12.52734375, 9.171875,
    11.21484375, -6.6171875, -2.625, -4.9765625, -0.63671875, -6.01953125, -9.3203125, -6.2421875,
    -9.11328125, -9.19921875, -1.99609375, 12.11328125, 7.46484375, -8.87109375, 3.2578125,
    10.9609375, 10.9609375, 10.9609375, 11.43359375, 0.37890625, -7.37109375, -10.77734375,
    2.08203125, -2.37890625, 10.47265625, -1.3359375, -3.78125, 0.82421875, 98.765625, 7.27734375,
    -1.71484375, 3.94140625, -6.13671875, 84.5625, -7.734375, 12.38671875, -3.515625, -10.40234375,
    -4.1640625, 8.01171875, 0.9921875, -9.8359375, -0.30859375, 8.60546875, 9.8203125, -5.671875,
    12.328125, 10.6328125, 2.703125, 12.73046875, -3.74609375, -1.85546875, -3.7890625, -8.78125,
    -1.7265625, -6.01953125, -9.3203125, -6.2421875, -9.11328125, -9.19921875, 98.765625,
    7.27734375, -1.71484375, 3.94140625, -6.13671875, 84.5625, -7.734375, 12.38671875, -3.515625,
    -10.40234375, -3.84765625, 5.4140625, 11.7265625, -8.05859375};
}  // namespace

TEST_CASE("an overflowing linear predictor is flagged PWB_PRED_OVERFLOW", "[capi][model][overflow]") {
  pwb_model* m = nullptr;
  REQUIRE(pwb_model_fit(kY.data(), kX.data(), 37, 3, nullptr, nullptr, &m) == PWB_OK);
  double coef[4], se[4];
  int al[4];
  REQUIRE(pwb_model_coefficients(m, coef, se, al, 4) == PWB_OK);
  // The coefficients are huge (order 1e132 here), so x of order 1e265 overflows x'b.
  CHECK(std::fabs(coef[2]) > 1e130);

  // Column-major, one line per predictor: rows 1-3 as the fuzzer gave them (x'b is NaN, NaN
  // and +Inf), row 4 ordinary (x = 1, 2, 3: its x'b is finite).
  const std::vector<double> xnew = {
      12.51171875, -1.73046875, -6.7109375, 1.0,
      -1.1570099379335498e+265, -1.1570099379335498e+265, -1.1570099379335498e+265, 2.0,
      -1.1570099379335498e+265, -1.1570094807388649e+265, 12.72265625, 3.0};
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  o.level = 0.62307692307692308;
  o.interval = PWB_INTERVAL_PREDICTION;
  o.center = PWB_CENTER_MEAN;
  o.mean_method = PWB_MEAN_NORMAL;
  double fit[4], lwr[4], upr[4];
  unsigned flags[4];
  for (int transformed = 0; transformed <= 1; ++transformed) {
    o.transformed_scale = transformed;
    REQUIRE(pwb_model_predict(m, xnew.data(), 4, 3, &o, fit, lwr, upr, flags) == PWB_OK);
    for (int i = 0; i < 3; ++i) {
      INFO("row " << i << ", transformed scale " << transformed);
      CHECK(flags[i] == PWB_PRED_OVERFLOW);
      CHECK(std::isnan(fit[i]));
      CHECK(std::isnan(lwr[i]));
      CHECK(std::isnan(upr[i]));
    }
    // The ordinary row: x'b by hand (identity response, so the fit is x'b on both scales;
    // relative 1e-12: four terms of order 1e134 summed in a different order).
    const double mu = coef[0] + coef[1] * 1.0 + coef[2] * 2.0 + coef[3] * 3.0;
    CHECK(flags[3] == 0u);
    CHECK(fit[3] == Approx(mu).epsilon(1e-12));
    CHECK(lwr[3] < fit[3]);
    CHECK(upr[3] > fit[3]);
  }
  pwb_model_free(m);
}
