// The transform handle through the C ABI: arguments, statuses, messages, NULL and empty input.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstring>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
struct Handle {
  pwb_transform* t = nullptr;
  ~Handle() { pwb_transform_free(t); }
};
pwb_transform_spec spec_of(pwb_family f, double lambda = NAN) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = f;
  s.lambda = lambda;
  return s;
}
}  // namespace

TEST_CASE("version macros agree with the runtime version", "[capi]") {
  CHECK(pwb_version_number() == PWB_VERSION_NUMBER);
  const std::string want = std::to_string(PWB_VERSION_MAJOR) + "." + std::to_string(PWB_VERSION_MINOR) +
                           "." + std::to_string(PWB_VERSION_PATCH);
  CHECK(want == pwb_version_string());
}

TEST_CASE("status and family names", "[capi]") {
  CHECK(std::string(pwb_status_name(PWB_OK)) == "PWB_OK");
  CHECK(std::string(pwb_status_name(PWB_ERR_DOMAIN)) == "PWB_ERR_DOMAIN");
  CHECK(std::string(pwb_status_name(static_cast<pwb_status>(99))) == "PWB_UNKNOWN_STATUS");
  CHECK(std::string(pwb_family_name(PWB_YEO_JOHNSON)) == "yeo-johnson");
  CHECK(std::string(pwb_family_name(static_cast<pwb_family>(-1))) == "unknown");
  pwb_family f = PWB_IDENTITY;
  CHECK(pwb_family_from_name("reciprocal", &f) == PWB_OK);
  CHECK(f == PWB_RECIPROCAL);
  CHECK(pwb_family_from_name("Box-Cox", &f) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("box-cox"));
  CHECK(pwb_family_from_name(nullptr, &f) == PWB_ERR_ARGUMENT);
}

TEST_CASE("apply and invert through the ABI", "[capi]") {
  pwb_transform_spec s = spec_of(PWB_BOX_COX, 0.5);
  s.shift = 1.0;
  Handle h;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  CHECK(std::string(pwb_last_error()).empty());
  const double x[3] = {0.0, 3.0, 8.0};
  double z[3], back[3];
  REQUIRE(pwb_transform_apply(h.t, x, 3, z) == PWB_OK);
  CHECK(z[1] == Approx(2.0).epsilon(1e-15));  // (sqrt(4) - 1) / 0.5
  REQUIRE(pwb_transform_invert(h.t, z, 3, back) == PWB_OK);
  for (int i = 0; i < 3; ++i) CHECK(back[i] == Approx(x[i]).margin(1e-14));
  double ld[3];
  REQUIRE(pwb_transform_log_derivative(h.t, x, 3, ld) == PWB_OK);
  CHECK(ld[1] == Approx(-0.5 * std::log(4.0)).epsilon(1e-14));
  // in place
  double y[2] = {3.0, 8.0};
  REQUIRE(pwb_transform_apply(h.t, y, 2, y) == PWB_OK);
  CHECK(y[0] == Approx(2.0).epsilon(1e-15));

  pwb_transform_spec got;
  got.struct_size = sizeof got;
  REQUIRE(pwb_transform_get_spec(h.t, &got) == PWB_OK);
  CHECK(got.family == PWB_BOX_COX);
  CHECK(got.lambda == 0.5);
  CHECK(got.shift == 1.0);
  CHECK(got.reflect == 0);
  CHECK(std::isnan(got.pivot));
}

TEST_CASE("domain errors fill NaN, return PWB_ERR_DOMAIN and describe the rows", "[capi]") {
  pwb_transform_spec s = spec_of(PWB_LOG);
  Handle h;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  const double x[5] = {1.0, -1.0, 2.0, 0.0, 3.0};
  double z[5];
  CHECK(pwb_transform_apply(h.t, x, 5, z) == PWB_ERR_DOMAIN);
  CHECK(std::isnan(z[1]));
  CHECK(std::isnan(z[3]));
  CHECK(z[2] == Approx(std::log(2.0)));
  CHECK_THAT(pwb_last_error(), Contains("2 of 5") && Contains("index 1, 3") && Contains("yeo-johnson"));
  const double bad[2] = {NAN, 1.0};
  CHECK(pwb_transform_apply(h.t, bad, 2, z) == PWB_ERR_NONFINITE);

  char buf[16];
  size_t needed = 0;
  REQUIRE(pwb_transform_describe(h.t, 0, buf, sizeof buf, &needed) == PWB_OK);
  CHECK(needed == std::strlen("log needs v > 0"));
  CHECK(std::string(buf) == "log needs v > 0");
  REQUIRE(pwb_transform_describe(h.t, 2, buf, 8, &needed) == PWB_OK);
  CHECK(std::strlen(buf) == 7);  // truncated like snprintf
  CHECK(pwb_transform_describe(h.t, 5, buf, 8, &needed) == PWB_ERR_ARGUMENT);
  CHECK(pwb_transform_describe(h.t, -1, buf, 8, &needed) == PWB_ERR_ARGUMENT);
  char remedy[256];
  REQUIRE(pwb_transform_describe(h.t, 4, remedy, sizeof remedy, nullptr) == PWB_OK);
  CHECK(std::string(remedy) == "the value lies beyond the transform's range");
  char line[64];
  REQUIRE(pwb_transform_describe(h.t, 3, line, sizeof line, nullptr) == PWB_OK);
  CHECK(std::string(line) == "log of x");
}

TEST_CASE("NULL pointers, empty arrays and bad structs", "[capi]") {
  pwb_transform* t = reinterpret_cast<pwb_transform*>(0x1);
  CHECK(pwb_transform_new(nullptr, &t) == PWB_ERR_ARGUMENT);
  CHECK(t == nullptr);
  CHECK_THAT(pwb_last_error(), Contains("spec is NULL"));
  pwb_transform_spec s = spec_of(PWB_SQRT);
  CHECK(pwb_transform_new(&s, nullptr) == PWB_ERR_ARGUMENT);
  s.struct_size = sizeof(s) - 1;
  CHECK(pwb_transform_new(&s, &t) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("struct_size"));
  // A C caller may store any int in the enum field; written through its bytes here, since a C++
  // cast to an enumerator-less value would itself be undefined.
  for (int bad : {77, -1, 10}) {
    s = spec_of(PWB_IDENTITY);
    std::memcpy(&s.family, &bad, sizeof bad);
    CHECK(pwb_transform_new(&s, &t) == PWB_ERR_ARGUMENT);
    CHECK(t == nullptr);
    CHECK_THAT(pwb_last_error(), Contains("unknown family code " + std::to_string(bad)));
    pwb_family f;
    std::memcpy(&f, &bad, sizeof bad);
    CHECK(std::string(pwb_family_name(f)) == "unknown");
  }
  s = spec_of(PWB_BOX_COX, NAN);
  CHECK(pwb_transform_new(&s, &t) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("lambda"));

  s = spec_of(PWB_SQRT);
  Handle h;
  REQUIRE(pwb_transform_new(&s, &h.t) == PWB_OK);
  double z[1];
  CHECK(pwb_transform_apply(h.t, nullptr, 0, nullptr) == PWB_OK);
  CHECK(pwb_transform_apply(h.t, nullptr, 1, z) == PWB_ERR_ARGUMENT);
  const double x[1] = {4.0};
  CHECK(pwb_transform_apply(h.t, x, 1, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_transform_apply(nullptr, x, 1, z) == PWB_ERR_ARGUMENT);
  CHECK(pwb_transform_invert(nullptr, x, 1, z) == PWB_ERR_ARGUMENT);
  pwb_transform_spec got;
  got.struct_size = 8;
  CHECK(pwb_transform_get_spec(h.t, &got) == PWB_ERR_ARGUMENT);
  CHECK(pwb_transform_get_spec(h.t, nullptr) == PWB_ERR_ARGUMENT);
  pwb_transform_spec_init(nullptr);
  pwb_transform_free(nullptr);
}

TEST_CASE("a larger struct_size from a newer header is accepted", "[capi]") {
  struct Bigger {
    pwb_transform_spec s;
    double future_field;
  } b;
  pwb_transform_spec_init(&b.s);
  b.s.struct_size = sizeof b;
  b.s.family = PWB_ASINH;
  Handle h;
  CHECK(pwb_transform_new(&b.s, &h.t) == PWB_OK);
}

TEST_CASE("overflow is PWB_ERR_DOMAIN and the power family's zero is a -Inf boundary", "[capi][extremes]") {
  pwb_transform_spec s = spec_of(PWB_BOX_COX, 2.0);
  Handle bc;
  REQUIRE(pwb_transform_new(&s, &bc.t) == PWB_OK);
  const double x[2] = {3.0, 1e300};
  double out[2] = {0, 0};
  CHECK(pwb_transform_apply(bc.t, x, 2, out) == PWB_ERR_DOMAIN);
  CHECK(out[0] == Approx(4.0));  // (9 - 1) / 2
  CHECK(std::isnan(out[1]));
  CHECK_THAT(pwb_last_error(), Contains("largest double") && Contains("index 1"));

  s = spec_of(PWB_IDENTITY);
  s.shift = 1e308;
  Handle id;
  REQUIRE(pwb_transform_new(&s, &id.t) == PWB_OK);
  const double big[1] = {1e308};
  CHECK(pwb_transform_apply(id.t, big, 1, out) == PWB_ERR_DOMAIN);
  CHECK(std::isnan(out[0]));

  s = spec_of(PWB_POWER, 0.5);
  Handle pw;
  REQUIRE(pwb_transform_new(&s, &pw.t) == PWB_OK);
  const double v[3] = {4.0, 0.0, -4.0};
  double d[3] = {0, 0, 0};
  CHECK(pwb_transform_log_derivative(pw.t, v, 3, d) == PWB_OK);
  CHECK(d[1] == -INFINITY);
  CHECK(d[0] == Approx(std::log(0.5) - 0.5 * std::log(4.0)));  // |f'| = 0.5 |v|^-0.5
  CHECK(d[2] == Approx(d[0]));

  // Box-Cox lambda = -2 at 1e9: z rounds onto the limit 0.5, and the inverse says why.
  s = spec_of(PWB_BOX_COX, -2.0);
  Handle neg;
  REQUIRE(pwb_transform_new(&s, &neg.t) == PWB_OK);
  const double far[1] = {1e9};
  double zf[1], xf[1];
  REQUIRE(pwb_transform_apply(neg.t, far, 1, zf) == PWB_OK);
  CHECK(pwb_transform_invert(neg.t, zf, 1, xf) == PWB_ERR_DOMAIN);
  CHECK_THAT(pwb_last_error(), Contains("precision"));
  char remedy[256];
  REQUIRE(pwb_transform_describe(neg.t, 4, remedy, sizeof remedy, nullptr) == PWB_OK);
  CHECK_THAT(std::string(remedy), Contains("precision") && Contains("rescale"));
}
