// The model record of a spec through the ABI: attach, write, read back bit for bit, errors.
#include <catch2/catch.hpp>

#include "test_support.hpp"

#include <cmath>
#include <cstring>
#include <string>
#include <vector>

#include "capi_test_support.hpp"
#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
using Spec = capitest::SpecHandle;
using pwbtest::same_bits;
using capitest::written;
}  // namespace

TEST_CASE("a model record round-trips through the ABI bit for bit", "[capi][spec][model]") {
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  int has = 7;
  REQUIRE(pwb_spec_has_model(s.s, &has) == PWB_OK);
  CHECK(has == 0);
  CHECK(pwb_spec_model_info(s.s, nullptr, nullptr, nullptr) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("no model record"));

  const char* names[3] = {"(Intercept)", "log(x)", "z \"q\""};
  const double coef[3] = {0.1, -2.0 / 7.0, NAN};
  const double sigma = 1.0 / 3.0;
  REQUIRE(pwb_spec_set_model(s.s, "y", names, coef, 3, sigma, 97) == PWB_OK);
  const std::string text = written(s.s);
  CHECK_THAT(text, Contains("coefficient name=\"z \\\"q\\\"\" value=NA\n"));

  Spec back;
  REQUIRE(pwb_spec_read(text.data(), text.size(), &back.s) == PWB_OK);
  REQUIRE(pwb_spec_has_model(back.s, &has) == PWB_OK);
  CHECK(has == 1);
  size_t n = 0, df = 0;
  double sg = 0.0;
  REQUIRE(pwb_spec_model_info(back.s, &n, &sg, &df) == PWB_OK);
  CHECK(n == 3);
  CHECK(df == 97);
  CHECK(same_bits(sg, sigma));
  double got[3];
  REQUIRE(pwb_spec_model_coefficients(back.s, got, 3) == PWB_OK);
  CHECK(same_bits(got[0], coef[0]));
  CHECK(same_bits(got[1], coef[1]));
  CHECK(std::isnan(got[2]));
  size_t need = 0;
  char buf[4];
  REQUIRE(pwb_spec_model_response(back.s, buf, sizeof buf, &need) == PWB_OK);
  CHECK(std::string(buf) == "y");
  CHECK(need == 1);
  for (size_t j = 0; j < 3; ++j) {
    char nm[32];
    REQUIRE(pwb_spec_model_coef_name(back.s, j, nm, sizeof nm, &need) == PWB_OK);
    CHECK(std::string(nm) == names[j]);
    CHECK(need == std::strlen(names[j]));
  }
  REQUIRE(pwb_spec_model_coef_name(back.s, 0, buf, sizeof buf, &need) == PWB_OK);
  CHECK(std::string(buf) == "(In");  // snprintf-like truncation
  CHECK(need == 11);
  CHECK(pwb_spec_model_coef_name(back.s, 3, nullptr, 0, &need) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("index 3 is out of range"));
  CHECK(pwb_spec_model_coefficients(back.s, got, 2) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("ncoef is 2 but the model has 3"));
  CHECK(written(back.s) == text);
}

TEST_CASE("pwb_spec_set_model checks its arguments", "[capi][spec][model]") {
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  const char* names[2] = {"a", "b"};
  const double coef[2] = {1.0, 2.0};
  CHECK(pwb_spec_set_model(nullptr, "y", names, coef, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_set_model(s.s, nullptr, names, coef, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_set_model(s.s, "y", nullptr, coef, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("names is NULL"));
  CHECK(pwb_spec_set_model(s.s, "y", names, nullptr, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  const char* holes[2] = {"a", nullptr};
  CHECK(pwb_spec_set_model(s.s, "y", holes, coef, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("names[1] is NULL"));
  const char* twice[2] = {"a", "a"};
  CHECK(pwb_spec_set_model(s.s, "y", twice, coef, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("\"a\" is used twice"));
  CHECK(pwb_spec_set_model(s.s, "y", names, coef, 2, -1.0, 3) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_set_model(s.s, "y", names, coef, 2, INFINITY, 3) == PWB_ERR_ARGUMENT);
  const double inf[2] = {1.0, -INFINITY};
  CHECK(pwb_spec_set_model(s.s, "y", names, inf, 2, 1.0, 3) == PWB_ERR_ARGUMENT);
  // A count beyond the limit is refused before any array is read.
  CHECK(pwb_spec_set_model(s.s, "y", names, coef, SIZE_MAX, 1.0, 3) == PWB_ERR_MEMORY);
  CHECK(pwb_spec_set_model(s.s, "y", names, coef, PWB_SPEC_MAX_COEFFICIENTS + 1u, 1.0, 3) ==
        PWB_ERR_MEMORY);
  int has = 1;
  REQUIRE(pwb_spec_has_model(s.s, &has) == PWB_OK);
  CHECK(has == 0);  // no failure attached anything
  CHECK(pwb_spec_has_model(s.s, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_has_model(nullptr, &has) == PWB_ERR_ARGUMENT);
  // No coefficients at all and sigma not available: allowed.
  REQUIRE(pwb_spec_set_model(s.s, "y", nullptr, nullptr, 0, NAN, 0) == PWB_OK);
  CHECK_THAT(written(s.s), Contains("model response=\"y\" coefficients=0 sigma=NA df=0\n"));
  CHECK(pwb_spec_model_coefficients(s.s, nullptr, 0) == PWB_OK);
  CHECK(pwb_spec_model_response(nullptr, nullptr, 0, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_model_coefficients(nullptr, nullptr, 0) == PWB_ERR_ARGUMENT);
}

TEST_CASE("the ABI limit on coefficients matches the reader's", "[capi][spec][model]") {
  // One past the limit in the count field is a parse error naming the limit.
  const std::string text = "powerback-spec 1\nmodel response=\"y\" coefficients=" +
                           std::to_string(PWB_SPEC_MAX_COEFFICIENTS + 1u) + " sigma=NA df=0\nend\n";
  pwb_spec* s = nullptr;
  CHECK(pwb_spec_read(text.data(), text.size(), &s) == PWB_ERR_PARSE);
  CHECK(s == nullptr);
  CHECK_THAT(pwb_last_error(), Contains("exceeds the limit of " + std::to_string(PWB_SPEC_MAX_COEFFICIENTS)));
}
