// Residual checks through the C ABI.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "powerback.h"

TEST_CASE("residual checks of a model handle", "[capi][diagnostics]") {
  // y = x^2 fitted by a straight line: a strong RESET signal.
  std::vector<double> x, y;
  for (int i = 0; i < 30; ++i) {
    x.push_back(i / 3.0);
    y.push_back(x.back() * x.back() + ((i * 7) % 5 - 2) * 0.1);
  }
  pwb_model* m = nullptr;
  REQUIRE(pwb_model_fit(y.data(), x.data(), 30, 1, nullptr, nullptr, &m) == PWB_OK);
  pwb_residual_checks c;
  pwb_residual_checks_init(&c);
  CHECK(std::isnan(c.reset_f));
  REQUIRE(pwb_model_residual_checks(m, &c) == PWB_OK);
  CHECK(c.n == 30);
  CHECK(c.bp_df == 1.0);
  CHECK(c.reset_df1 == 2.0);
  CHECK(c.reset_df2 == 26.0);
  CHECK(c.reset_p < 1e-6);
  CHECK(c.sw_computed == 1);
  CHECK(c.sw_statistic > 0.0);
  CHECK(c.sw_statistic <= 1.0);
  std::size_t need = 99;
  CHECK(pwb_model_residual_checks_note(m, nullptr, 0, &need) == PWB_OK);
  CHECK(need == 0);  // computed: nothing to say
  c.struct_size = 1;
  CHECK(pwb_model_residual_checks(m, &c) == PWB_ERR_ARGUMENT);
  CHECK(pwb_model_residual_checks(nullptr, &c) == PWB_ERR_ARGUMENT);
  pwb_model_free(m);
}
