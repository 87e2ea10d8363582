// The ladder rule's thresholds through the C ABI: the core's constants, unchanged.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <vector>

#include "powerback.h"

TEST_CASE("pwb_ladder_rule_get reports the core's thresholds", "[capi][ladder]") {
  pwb_ladder_rule r;
  r.struct_size = sizeof(r);
  REQUIRE(pwb_ladder_rule_get(&r) == PWB_OK);
  // The values pwb_ladder_recommend's documentation states (copied constants: exact).
  CHECK(r.large_n == 300);
  CHECK(r.z_cut == 3.29);
  CHECK(r.size_cut == 0.5);
  CHECK(r.log10_cut == 1.0);
  CHECK(r.reciprocal_cut == 2.0);
}

TEST_CASE("the reported large_n is where the ladder switches to judging by size",
          "[capi][ladder]") {
  pwb_ladder_rule r;
  r.struct_size = sizeof(r);
  REQUIRE(pwb_ladder_rule_get(&r) == PWB_OK);
  for (std::size_t n : {r.large_n - 1, r.large_n}) {
    std::vector<double> x(n);
    for (std::size_t i = 0; i < n; ++i) x[i] = std::exp(0.01 * static_cast<double>(i % 97));
    pwb_transform_spec spec;
    pwb_transform_spec_init(&spec);
    pwb_ladder_info info;
    pwb_ladder_info_init(&info);
    REQUIRE(pwb_ladder_recommend(x.data(), n, &spec, &info) == PWB_OK);
    CHECK(info.by_size == (n >= r.large_n ? 1 : 0));
  }
}

TEST_CASE("pwb_ladder_rule_get refuses NULL and a short struct", "[capi][ladder]") {
  CHECK(pwb_ladder_rule_get(nullptr) == PWB_ERR_ARGUMENT);
  pwb_ladder_rule r;
  r.struct_size = offsetof(pwb_ladder_rule, reciprocal_cut);
  r.reciprocal_cut = -1.0;
  CHECK(pwb_ladder_rule_get(&r) == PWB_ERR_ARGUMENT);
  CHECK(r.reciprocal_cut == -1.0);
}
