// The spec handle through the C ABI: build, write, read back, files, buffers, NULL everywhere.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <string>
#include <vector>

#include "capi_test_support.hpp"
#include "powerback.h"

using Catch::Matchers::Contains;

namespace {
using Spec = capitest::SpecHandle;
struct Tr {
  pwb_transform* t = nullptr;
  ~Tr() { pwb_transform_free(t); }
};
pwb_transform* make(pwb_family f, double lambda, double shift, int reflect = 0, double pivot = NAN) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = f;
  s.lambda = lambda;
  s.shift = shift;
  s.reflect = reflect;
  s.pivot = pivot;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&s, &t) == PWB_OK);
  return t;
}
using capitest::written;
}  // namespace

TEST_CASE("a spec is built written read and applied through the ABI", "[capi][spec]") {
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  Tr a, b;
  a.t = make(PWB_BOX_COX, 0.25, 0.5);
  b.t = make(PWB_LOG, NAN, 0.0, 1, 101.0);
  REQUIRE(pwb_spec_add_transform(s.s, "income", a.t) == PWB_OK);
  REQUIRE(pwb_spec_add_transform(s.s, "score \"raw\"", b.t) == PWB_OK);
  CHECK(pwb_spec_add_transform(s.s, "income", b.t) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("used twice"));

  const std::string text = written(s.s);
  CHECK_THAT(text, Contains("name=\"score \\\"raw\\\"\" family=log"));
  Spec back;
  REQUIRE(pwb_spec_read(text.data(), text.size(), &back.s) == PWB_OK);
  size_t count = 0;
  REQUIRE(pwb_spec_count(back.s, &count) == PWB_OK);
  REQUIRE(count == 2);
  size_t need = 0;
  char name[8];
  REQUIRE(pwb_spec_name(back.s, 1, name, sizeof name, &need) == PWB_OK);
  CHECK(need == 11);
  CHECK(std::string(name) == "score \"");  // snprintf-like truncation of a name
  size_t idx = 9;
  REQUIRE(pwb_spec_find(back.s, "income", &idx) == PWB_OK);
  CHECK(idx == 0);
  CHECK(pwb_spec_find(back.s, "Income", &idx) == PWB_ERR_ARGUMENT);

  // The transform read back maps values exactly as the original: same constants, same code.
  Tr got;
  REQUIRE(pwb_spec_transform(back.s, 0, &got.t) == PWB_OK);
  const double x[4] = {0.0, 1.5, 7.0, 1e6};
  double z1[4], z2[4];
  REQUIRE(pwb_transform_apply(a.t, x, 4, z1) == PWB_OK);
  REQUIRE(pwb_transform_apply(got.t, x, 4, z2) == PWB_OK);
  CHECK(std::memcmp(z1, z2, sizeof z1) == 0);
  pwb_transform_spec ts;
  ts.struct_size = sizeof ts;
  Tr refl;
  REQUIRE(pwb_spec_transform(back.s, 1, &refl.t) == PWB_OK);
  REQUIRE(pwb_transform_get_spec(refl.t, &ts) == PWB_OK);
  CHECK(ts.family == PWB_LOG);
  CHECK(ts.reflect == 1);
  CHECK(ts.pivot == 101.0);
  pwb_transform_free(refl.t);  // the failing call below sets refl.t to NULL
  CHECK(pwb_spec_transform(back.s, 2, &refl.t) == PWB_ERR_ARGUMENT);
  CHECK(refl.t == nullptr);
}

TEST_CASE("pwb_spec_write copies like snprintf; a cut text never reads as a spec",
          "[capi][spec]") {
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  Tr a;
  a.t = make(PWB_SQRT, NAN, 1.0);
  REQUIRE(pwb_spec_add_transform(s.s, "x", a.t) == PWB_OK);
  size_t need = 0;
  REQUIRE(pwb_spec_write(s.s, nullptr, 0, &need) == PWB_OK);
  std::vector<char> full(need + 1, 'z');
  REQUIRE(pwb_spec_write(s.s, full.data(), full.size(), nullptr) == PWB_OK);
  CHECK(std::strlen(full.data()) == need);
  // One byte short: the text is cut before its last byte (the final newline), NUL-terminated,
  // and the full length is still reported.
  std::vector<char> buf(need, 'z');
  size_t again = 0;
  REQUIRE(pwb_spec_write(s.s, buf.data(), buf.size(), &again) == PWB_OK);
  CHECK(again == need);
  CHECK(buf[need - 1] == '\0');
  CHECK(std::string(buf.data()) == std::string(full.data(), need - 1));
  pwb_spec* back = nullptr;
  CHECK(pwb_spec_read(buf.data(), need - 1, &back) == PWB_ERR_PARSE);
  CHECK(back == nullptr);
  // A NULL buffer may only ask the length.
  CHECK(pwb_spec_write(s.s, nullptr, 5, &need) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("cap = 0"));
}

TEST_CASE("specs go to files and come back", "[capi][spec]") {
  const std::string path = std::string(PWB_TEST_TMPDIR) + "/capi_spec_roundtrip.pwbspec";
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  Tr a;
  a.t = make(PWB_YEO_JOHNSON, -0.7, 0.0);
  REQUIRE(pwb_spec_add_transform(s.s, "caf\xc3\xa9", a.t) == PWB_OK);
  REQUIRE(pwb_spec_write_file(s.s, path.c_str()) == PWB_OK);
  Spec back;
  REQUIRE(pwb_spec_read_file(path.c_str(), &back.s) == PWB_OK);
  CHECK(written(back.s) == written(s.s));
  std::remove(path.c_str());
  pwb_spec_free(back.s);  // a failing call sets the out-pointer to NULL: release what it held
  CHECK(pwb_spec_read_file(path.c_str(), &back.s) == PWB_ERR_ARGUMENT);
  CHECK(back.s == nullptr);
  CHECK_THAT(pwb_last_error(), Contains("capi_spec_roundtrip.pwbspec"));
  CHECK(pwb_spec_write_file(s.s, "/nonexistent-dir/x.pwbspec") == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("cannot open"));
}

TEST_CASE("hostile spec files are parse errors", "[capi][spec]") {
  const std::string path = std::string(PWB_TEST_TMPDIR) + "/capi_spec_hostile.pwbspec";
  Spec back;
  {  // a file one byte past the limit: rejected by size, after bounded reading
    std::ofstream f(path, std::ios::binary);
    f << "powerback-spec 1\n" << std::string(PWB_SPEC_MAX_BYTES, '#');
  }
  CHECK(pwb_spec_read_file(path.c_str(), &back.s) == PWB_ERR_PARSE);
  CHECK_THAT(pwb_last_error(), Contains("larger than the limit"));
  {  // random binary bytes
    std::ofstream f(path, std::ios::binary);
    for (int i = 0; i < 4096; ++i) f.put(static_cast<char>((i * 7919) & 0xFF));
  }
  CHECK(pwb_spec_read_file(path.c_str(), &back.s) == PWB_ERR_PARSE);
  CHECK_THAT(pwb_last_error(), Contains("spec line 1"));
  std::remove(path.c_str());
  const char future[] = "powerback-spec 2\nend\n";
  CHECK(pwb_spec_read(future, sizeof future - 1, &back.s) == PWB_ERR_PARSE);
  CHECK_THAT(pwb_last_error(), Contains("format version 2, newer"));
  const char nan_text[] = "powerback-spec 1\ntransform name=\"x\" family=identity shift=NaN reflect=false\nend\n";
  CHECK(pwb_spec_read(nan_text, sizeof nan_text - 1, &back.s) == PWB_ERR_PARSE);
  CHECK_THAT(pwb_last_error(), Contains("line 2, column 42: NaN"));
}

TEST_CASE("NULL arguments are argument errors and free accepts NULL", "[capi][spec]") {
  Spec s;
  REQUIRE(pwb_spec_new(&s.s) == PWB_OK);
  Tr a;
  a.t = make(PWB_LOG, NAN, 0.0);
  size_t n = 0;
  CHECK(pwb_spec_new(nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_add_transform(nullptr, "x", a.t) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_add_transform(s.s, nullptr, a.t) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_add_transform(s.s, "x", nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_add_transform(s.s, "", a.t) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_add_transform(s.s, "bad\xff", a.t) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_count(nullptr, &n) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_count(s.s, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_name(nullptr, 0, nullptr, 0, &n) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_name(s.s, 0, nullptr, 0, &n) == PWB_ERR_ARGUMENT);  // empty spec: no index 0
  CHECK(pwb_spec_find(s.s, nullptr, &n) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_find(s.s, "x", nullptr) == PWB_ERR_ARGUMENT);
  // Outputs are cleared on failure: a non-NULL sentinel (never freed) comes back NULL, and the
  // transform made above stays owned by `a`.
  pwb_transform* cleared = reinterpret_cast<pwb_transform*>(&n);
  CHECK(pwb_spec_transform(nullptr, 0, &cleared) == PWB_ERR_ARGUMENT);
  CHECK(cleared == nullptr);
  CHECK(pwb_spec_write(nullptr, nullptr, 0, &n) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_write_file(s.s, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_write_file(nullptr, "x") == PWB_ERR_ARGUMENT);
  pwb_spec_free(s.s);  // the failing reads below set s.s to NULL
  CHECK(pwb_spec_read(nullptr, 3, &s.s) == PWB_ERR_ARGUMENT);
  CHECK(s.s == nullptr);
  CHECK(pwb_spec_read("x", 1, nullptr) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_read(nullptr, 0, &s.s) == PWB_ERR_PARSE);  // empty input is not a spec
  CHECK(pwb_spec_read_file(nullptr, &s.s) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_read_file("x", nullptr) == PWB_ERR_ARGUMENT);
  pwb_spec_free(nullptr);
}
