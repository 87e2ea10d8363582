// The strict spec reader: every malformed input is an Error(Parse) naming line and column.
#include <catch2/catch.hpp>

#include "spec_test_support.hpp"

#include <string>

#include "powerback/errors.hpp"
#include "powerback/spec.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {
const std::string kHead = "powerback-spec 1\n";
const std::string kGood = "transform name=\"x\" family=box-cox lambda=0x1p-1 shift=0x0p+0 reflect=false\n";

using pwbtest::parse_error;
}  // namespace

TEST_CASE("a well-formed spec parses", "[spec]") {
  CHECK(parse_error(kHead + kGood + "end\n").empty());
  CHECK(parse_error(kHead + "end\n").empty());                       // no transforms is fine
  CHECK(parse_error("powerback-spec 1\r\n" + kGood + "end\r\n").empty());  // CRLF line ends
}

TEST_CASE("the first line names the format and version", "[spec]") {
  CHECK_THAT(parse_error(""), Contains("empty input"));
  CHECK_THAT(parse_error("hello\n" + kGood + "end\n"),
             Contains("line 1, column 1: not a powerback spec"));
  CHECK_THAT(parse_error("powerback-spec 7\n" + kGood + "end\n"),
             Contains("format version 7, newer than the version 1"));
  CHECK_THAT(parse_error("powerback-spec 0\nend\n"), Contains("unsupported format version 0"));
  CHECK_THAT(parse_error("powerback-spec 1.0\nend\n"), Contains("unsupported format version"));
  CHECK_THAT(parse_error("\xef\xbb\xbfpowerback-spec 1\nend\n"), Contains("not a powerback spec"));
}

TEST_CASE("truncated input and trailing junk", "[spec]") {
  CHECK_THAT(parse_error(kHead + kGood), Contains("line 3, column 1: the end line is missing"));
  const std::string cut = kHead + kGood.substr(0, 40);
  CHECK_THAT(parse_error(cut), Contains("line 2, column 41: the last line has no newline"));
  CHECK_THAT(parse_error(kHead + kGood + "end"), Contains("no newline"));
  CHECK_THAT(parse_error(kHead + kGood + "end\n\n"), Contains("line 4, column 1: text after the end line"));
  CHECK_THAT(parse_error(kHead + kGood + "end\n" + kGood), Contains("text after the end line"));
  CHECK_THAT(parse_error(kHead + "end x\n"), Contains("line 2, column 4: text after end"));
}

TEST_CASE("unknown, repeated and missing keys", "[spec]") {
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log shift=0 reflect=false lamda=1\nend\n"),
             Contains("line 2, column 53: unknown key lamda; known keys: name"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" name=\"y\" family=log shift=0 reflect=false\nend\n"),
             Contains("column 20: the key name appears twice"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log reflect=false\nend\n"),
             Contains("lacks the key shift"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=box-cox shift=0 reflect=false\nend\n"),
             Contains("box-cox needs the key lambda"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log lambda=1 shift=0 reflect=false\nend\n"),
             Contains("log has no lambda"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log shift=0 reflect=true\nend\n"),
             Contains("needs the key pivot"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log shift=0 reflect=false pivot=3\nend\n"),
             Contains("pivot is used only with reflect=true"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log shift=0 reflect=false extra\nend\n"),
             Contains("expected key=value"));
  CHECK_THAT(parse_error(kHead + "interval name=\"m\"\nend\n"),
             Contains("line 2, column 1: unknown record interval; expected transform, model, "
                      "coefficient or end"));
  CHECK_THAT(parse_error(kHead + " " + kGood + "end\n"), Contains("without leading spaces"));
}

TEST_CASE("values: numbers, booleans, families, duplicates", "[spec]") {
  const std::string pre = kHead + "transform name=\"x\" family=box-cox lambda=";
  const std::string post = " shift=0 reflect=false\nend\n";
  CHECK_THAT(parse_error(pre + "nan" + post), Contains("column 42: NaN and infinite values are not allowed"));
  CHECK_THAT(parse_error(pre + "-Inf" + post), Contains("NaN and infinite"));
  CHECK_THAT(parse_error(pre + "0x1p+99999" + post), Contains("out of the range of a double"));
  CHECK_THAT(parse_error(pre + "1e999" + post), Contains("out of the range"));
  CHECK_THAT(parse_error(pre + "0x" + post), Contains("malformed number"));
  CHECK_THAT(parse_error(pre + "+1" + post), Contains("malformed number"));
  CHECK_THAT(parse_error(pre + "1.5x" + post), Contains("malformed number"));
  CHECK_THAT(parse_error(pre + "0x-1p+0" + post), Contains("malformed number"));
  CHECK_THAT(parse_error(pre + "--1" + post), Contains("malformed number"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=log shift=0 reflect=yes\nend\n"),
             Contains("expected true or false"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=Log shift=0 reflect=false\nend\n"),
             Contains("unknown family Log; known families: identity"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\" family=power lambda=0 shift=0 reflect=false\nend\n"),
             Contains("invalid transform \"x\": power needs lambda != 0"));
  CHECK_THAT(parse_error(kHead + kGood + kGood + "end\n"),
             Contains("line 3, column 16: the name \"x\" is used twice"));
  CHECK_THAT(parse_error(kHead + "transform name=x family=log shift=0 reflect=false\nend\n"),
             Contains("expected a quoted string"));
  CHECK_THAT(parse_error(kHead + "transform name=\"\" family=log shift=0 reflect=false\nend\n"),
             Contains("non-empty name"));
  CHECK_THAT(parse_error(kHead + "transform name=\"x\"family=log shift=0 reflect=false\nend\n"),
             Contains("unexpected text after the value of name"));
}

TEST_CASE("strings: escapes, control characters, UTF-8", "[spec]") {
  const std::string post = " family=log shift=0 reflect=false\nend\n";
  CHECK_THAT(parse_error(kHead + "transform name=\"a\\qb\"" + post), Contains("unknown escape \\q"));
  CHECK_THAT(parse_error(kHead + "transform name=\"a\\x0\"" + post), Contains("two hexadecimal digits"));
  CHECK_THAT(parse_error(kHead + "transform name=\"a\\x00\"" + post), Contains("\\x00 is not allowed"));
  CHECK_THAT(parse_error(kHead + "transform name=\"a\\xff\"" + post), Contains("not valid UTF-8"));
  CHECK_THAT(parse_error(kHead + "transform name=\"a\tb\"" + post), Contains("control character"));
  CHECK_THAT(parse_error(kHead + "transform name=\"abc" + "\nend\n"),
             Contains("column 16: unterminated string"));
  CHECK_THAT(parse_error(kHead + "transform name=\"ab\xc3(\"" + post),
             Contains("line 2, column 19: invalid UTF-8"));
}

TEST_CASE("binary and oversized input is rejected with bounded work", "[spec]") {
  const std::string nul = kHead + "transform name=\"a" + std::string(1, '\0') + "\"" +
                          " family=log shift=0 reflect=false\nend\n";
  CHECK_THAT(parse_error(nul), Contains("line 2, column 18: binary data: a NUL byte"));
  const std::string elf("\x7f" "ELF\x02\x01\x01\0\0\0", 10);
  CHECK_THAT(parse_error(elf), Contains("line 1, column 8: binary data"));
  const std::string long_line = kHead + "# " + std::string(kSpecMaxLineLength, 'c') + "\nend\n";
  CHECK_THAT(parse_error(long_line), Contains("line 2, column 4097: line longer than 4096 bytes"));
  const std::string long_name =
      kHead + "transform name=\"" + std::string(kSpecMaxNameLength + 1, 'n') + "\"" +
      " family=log shift=0 reflect=false\nend\n";
  CHECK_THAT(parse_error(long_name), Contains("name longer than 256 bytes"));
  std::string many = kHead;
  for (std::size_t i = 0; i <= kSpecMaxRecords; ++i)
    many += "transform name=\"v" + std::to_string(i) + "\" family=log shift=0 reflect=false\n";
  many += "end\n";
  CHECK_THAT(parse_error(many), Contains("line 65538, column 1: more than 65536 transforms"));
  // Past the byte limit nothing is scanned at all.
  const std::string huge(kSpecMaxBytes + 1, '#');
  CHECK_THAT(parse_error(huge), Contains("more than the limit of 16777216"));
}

TEST_CASE("every proper prefix of a spec is refused as truncated", "[spec]") {
  const std::string full = kHead + kGood +
                           "transform name=\"y\" family=log shift=0x1p+0 reflect=true pivot=0x1.94p+6\nend\n";
  REQUIRE(parse_error(full).empty());
  for (std::size_t len = 0; len < full.size(); ++len) {
    INFO("prefix of " << len << " bytes");
    CHECK_FALSE(parse_error(full.substr(0, len)).empty());
  }
}

TEST_CASE("single-byte corruptions parse or fail cleanly with Error(Parse)", "[spec]") {
  const std::string full = kHead + kGood + "end\n";
  const unsigned char bytes[] = {0x00, 0x22, 0x5c, 0x3d, 0x20, 0x0a, 0x80, 0xff, 'x', '9'};
  std::size_t refused = 0, total = 0;
  for (std::size_t i = 0; i < full.size(); ++i) {
    for (unsigned char b : bytes) {
      std::string t = full;
      t[i] = static_cast<char>(b);
      try {
        parse_spec(t.data(), t.size());
      } catch (const Error& e) {
        INFO("byte " << i << " set to " << int(b) << ": " << e.what());
        CHECK(e.code() == ErrorCode::Parse);
        CHECK_THAT(e.what(), Contains("spec line"));
        ++refused;
      }
      ++total;
    }
  }
  // Most corruptions break the syntax; a few (a digit in a number or a name) stay valid.
  CHECK(refused > total / 2);
}
