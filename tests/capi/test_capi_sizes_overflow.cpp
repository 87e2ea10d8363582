// Sizes that overflow n x p are refused with PWB_ERR_MEMORY before any array is touched.
#include <catch2/catch.hpp>

#include <cstddef>
#include <cstdint>

#include "powerback.h"

namespace {
// n * p wraps around size_t (2^63 + 2 rows of 2 columns); the arrays passed are tiny and must
// never be read past their end.
const std::size_t kHugeN = (static_cast<std::size_t>(1) << 63) + 2;
double tiny[4] = {1.0, 2.0, 3.0, 4.0};
}  // namespace

TEST_CASE("response lambda refuses an n x p that overflows", "[capi][sizes]") {
  pwb_lambda_result res;
  pwb_lambda_result_init(&res);
  CHECK(pwb_estimate_response_lambda(tiny, tiny, kHugeN, 2, PWB_BOX_COX, nullptr, &res) ==
        PWB_ERR_MEMORY);
  double grid[1] = {0.0}, ll[1];
  CHECK(pwb_response_lambda_profile(tiny, tiny, kHugeN, 2, PWB_BOX_COX, grid, 1, ll) ==
        PWB_ERR_MEMORY);
}

TEST_CASE("lambda influence and Box-Tidwell refuse an n x p that overflows", "[capi][sizes]") {
  pwb_influence_summary s;
  s.struct_size = sizeof s;
  CHECK(pwb_lambda_influence(tiny, tiny, kHugeN, 2, nullptr, &s, nullptr, nullptr, nullptr,
                             nullptr) == PWB_ERR_MEMORY);
  double alpha[1], se[1];
  pwb_box_tidwell_result r;
  r.struct_size = sizeof r;
  CHECK(pwb_box_tidwell(tiny, tiny, kHugeN, 2, tiny, 1, nullptr, alpha, se, nullptr, nullptr,
                        nullptr, &r) == PWB_ERR_MEMORY);
}

TEST_CASE("model fit and predict refuse sizes that overflow", "[capi][sizes]") {
  pwb_model* m = nullptr;
  CHECK(pwb_model_fit(tiny, tiny, kHugeN, 2, nullptr, nullptr, &m) == PWB_ERR_MEMORY);
  CHECK(m == nullptr);
  // a real model, then a prediction request whose rows x p overflows
  const double y[4] = {1.0, 2.5, 2.9, 4.2};
  const double x[4] = {1.0, 2.0, 3.0, 4.0};
  REQUIRE(pwb_model_fit(y, x, 4, 1, nullptr, nullptr, &m) == PWB_OK);
  // 2^62 rows of 1 column: the count fits in size_t but its bytes (x 8) do not
  double fit[1];
  const std::size_t rows = static_cast<std::size_t>(1) << 62;
  CHECK(pwb_model_predict(m, tiny, rows, 1, nullptr, fit, nullptr, nullptr, nullptr) ==
        PWB_ERR_MEMORY);
  pwb_model_free(m);
}
