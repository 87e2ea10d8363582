// The text spec in the core: exact round trips, the written layout, names with escapes.
#include <catch2/catch.hpp>

#include "test_support.hpp"

#include <cmath>
#include <cstring>
#include <limits>
#include <string>

#include "powerback/errors.hpp"
#include "powerback/spec.hpp"

using namespace powerback;

namespace {
using pwbtest::make;
using pwbtest::same_bits;
}  // namespace

TEST_CASE("hexadecimal numbers are the C99 form and exact", "[spec]") {
  // Values checked by hand against the C99 %a conversion (ISO C 7.19.6.1).
  CHECK(format_hex_double(3.0) == "0x1.8p+1");
  CHECK(format_hex_double(-0.125) == "-0x1p-3");
  CHECK(format_hex_double(0.0) == "0x0p+0");
  CHECK(format_hex_double(-0.0) == "-0x0p+0");
  CHECK_THROWS_AS(format_hex_double(std::numeric_limits<double>::infinity()), Error);
}

TEST_CASE("written text has the documented layout", "[spec]") {
  Spec s;
  s.add("income", make(Family::BoxCox, 0.5, 1.0));
  s.add("score", make(Family::Log, math::kNaN, 0.0, true, 101.0));
  const std::string want =
      "powerback-spec 1\n"
      "transform name=\"income\" family=box-cox lambda=0x1p-1 shift=0x1p+0 reflect=false\n"
      "transform name=\"score\" family=log shift=0x0p+0 reflect=true pivot=0x1.94p+6\n"
      "end\n";
  CHECK(write_spec(s) == want);
}

TEST_CASE("every constant round-trips bit for bit", "[spec]") {
  const double awkward[] = {0.1,
                            1.0 / 3.0,
                            -2.718281828459045,
                            std::numeric_limits<double>::denorm_min(),
                            -std::numeric_limits<double>::max(),
                            std::numeric_limits<double>::min(),
                            std::nextafter(1.0, 2.0),
                            -0.0};
  Spec s;
  int k = 0;
  for (double a : awkward) {
    s.add("yj" + std::to_string(k++), make(Family::YeoJohnson, a == 0.0 ? 1e-300 : a / 7, a));
    s.add("p" + std::to_string(k++), make(Family::Sqrt, math::kNaN, 0.0, true, a));
  }
  const std::string text = write_spec(s);
  const Spec back = parse_spec(text.data(), text.size());
  REQUIRE(back.size() == s.size());
  for (std::size_t i = 0; i < s.size(); ++i) {
    const TransformSpec& a = s.at(i).transform.spec();
    const TransformSpec& b = back.at(i).transform.spec();
    CHECK(back.at(i).name == s.at(i).name);
    CHECK(a.family == b.family);
    CHECK(a.reflect == b.reflect);
    CHECK((std::isnan(a.lambda) ? std::isnan(b.lambda) : same_bits(a.lambda, b.lambda)));
    CHECK(same_bits(a.shift, b.shift));
    CHECK((std::isnan(a.pivot) ? std::isnan(b.pivot) : same_bits(a.pivot, b.pivot)));
  }
  CHECK(write_spec(back) == text);
}

TEST_CASE("decimal numbers are read correctly rounded", "[spec]") {
  const std::string text =
      "powerback-spec 1\n"
      "# written by hand\n"
      "\n"
      "transform name=\"x\" family=power lambda=-0.1 shift=1e-3 reflect=false\n"
      "end\n";
  const Spec s = parse_spec(text.data(), text.size());
  REQUIRE(s.size() == 1);
  // The double nearest to the decimal text is what the C++ compiler makes of the same literal.
  CHECK(same_bits(s.at(0).transform.spec().lambda, -0.1));
  CHECK(same_bits(s.at(0).transform.spec().shift, 1e-3));
}

TEST_CASE("names with quotes and control characters are escaped and come back", "[spec]") {
  Spec s;
  const std::string odd = "a \"b\"\\c\nd\te\x01 caf\xc3\xa9";
  s.add(odd, make(Family::Asinh, math::kNaN));
  s.add("log(x + 1)", make(Family::Identity, math::kNaN));
  const std::string text = write_spec(s);
  CHECK(text.find("name=\"a \\\"b\\\"\\\\c\\nd\\te\\x01 caf\xc3\xa9\"") != std::string::npos);
  const Spec back = parse_spec(text.data(), text.size());
  CHECK(back.at(0).name == odd);
  CHECK(back.find("log(x + 1)") == 1);
  CHECK(back.find("nope") == back.size());
}

TEST_CASE("the container refuses bad names", "[spec]") {
  Spec s;
  const Transform t = make(Family::Log, math::kNaN);
  CHECK_THROWS_AS(s.add("", t), Error);
  s.add("x", t);
  CHECK_THROWS_WITH(s.add("x", t), Catch::Matchers::Contains("used twice"));
  CHECK_THROWS_WITH(s.add(std::string("a\0b", 3), t), Catch::Matchers::Contains("NUL"));
  CHECK_THROWS_WITH(s.add("bad\xff", t), Catch::Matchers::Contains("UTF-8"));
  CHECK_THROWS_AS(s.add(std::string(kSpecMaxNameLength + 1, 'n'), t), Error);
  s.add(std::string(kSpecMaxNameLength, 'n'), t);
  CHECK(s.size() == 2);
  CHECK_THROWS_AS(s.at(2), Error);
}

TEST_CASE("UTF-8 validation follows the standard's well-formed table", "[spec]") {
  // Table 3-7 of the Unicode Standard (well-formed byte sequences).
  std::size_t bad = 99;
  CHECK(valid_utf8_text("\xe2\x82\xac", 3, &bad));           // U+20AC
  CHECK(valid_utf8_text("\xf4\x8f\xbf\xbf", 4, &bad));       // U+10FFFF
  CHECK_FALSE(valid_utf8_text("\xc0\xaf", 2, &bad));         // overlong '/'
  CHECK(bad == 0);
  CHECK_FALSE(valid_utf8_text("a\xed\xa0\x80", 4, &bad));    // a surrogate
  CHECK(bad == 1);
  CHECK_FALSE(valid_utf8_text("\xf4\x90\x80\x80", 4, &bad)); // above U+10FFFF
  CHECK_FALSE(valid_utf8_text("ab\xe2\x82", 4, &bad));       // truncated sequence
  CHECK(bad == 2);
  CHECK_FALSE(valid_utf8_text("a\0b", 3, &bad));
  CHECK(bad == 1);
}
