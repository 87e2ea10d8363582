// The model record of the text spec: round trips, layout, the strict reader and the docs example.
#include <catch2/catch.hpp>

#include "spec_test_support.hpp"

#include "test_support.hpp"

#include <cmath>
#include <cstring>
#include <fstream>
#include <sstream>
#include <string>

#include "powerback/errors.hpp"
#include "powerback/spec.hpp"

using namespace powerback;
using Catch::Matchers::Contains;

namespace {
const std::string kHead = "powerback-spec 1\n";
const std::string kModel = "model response=\"y\" coefficients=2 sigma=0x1p-1 df=8\n";
const std::string kC1 = "coefficient name=\"(Intercept)\" value=0x1p+0\n";
const std::string kC2 = "coefficient name=\"x\" value=NA\n";

using pwbtest::same_bits;

using pwbtest::parse_error;

SpecModel sample() {
  SpecModel m;
  m.response = "log \"y\"";
  m.names = {"(Intercept)", "x1", "x2:x3", "caf\xc3\xa9"};
  m.coefficients = {0.1, -1.0 / 3.0, std::nan(""), 5e-320};  // a subnormal, and an aliased one
  m.sigma = std::sqrt(2.0);
  m.df = 37;
  return m;
}
}  // namespace

TEST_CASE("a model record round-trips bit for bit", "[spec][model]") {
  Spec s;
  TransformSpec ts;
  ts.family = Family::Log;
  s.add("y", Transform(ts));
  const SpecModel m = sample();
  s.set_model(m);
  const std::string text = write_spec(s);
  const Spec back = parse_spec(text.data(), text.size());
  REQUIRE(back.has_model());
  const SpecModel& b = back.model();
  CHECK(b.response == m.response);
  CHECK(b.names == m.names);
  REQUIRE(b.coefficients.size() == m.coefficients.size());
  for (std::size_t j = 0; j < m.coefficients.size(); ++j)
    CHECK((same_bits(b.coefficients[j], m.coefficients[j]) ||
           (std::isnan(b.coefficients[j]) && std::isnan(m.coefficients[j]))));
  CHECK(same_bits(b.sigma, m.sigma));
  CHECK(b.df == 37);
  CHECK(back.size() == 1);
  CHECK(write_spec(back) == text);  // writing what was read gives the same text
}

TEST_CASE("the model record has the documented layout", "[spec][model]") {
  Spec s;
  SpecModel m;
  m.response = "y";
  m.names = {"(Intercept)", "x"};
  m.coefficients = {1.0, std::nan("")};
  m.sigma = 0.5;
  m.df = 8;
  s.set_model(m);
  CHECK(write_spec(s) == kHead + kModel + kC1 + kC2 + "end\n");
  CHECK_FALSE(Spec().has_model());
  CHECK_THROWS_AS(Spec().model(), Error);
}

TEST_CASE("set_model refuses bad names and values", "[spec][model]") {
  Spec s;
  SpecModel m = sample();
  m.names[2] = "x1";
  CHECK_THROWS_WITH(s.set_model(m), Contains("\"x1\" is used twice"));
  m = sample();
  m.response = "";
  CHECK_THROWS_WITH(s.set_model(m), Contains("response needs a non-empty name"));
  m = sample();
  m.coefficients.pop_back();
  CHECK_THROWS_WITH(s.set_model(m), Contains("4 coefficient names but 3 values"));
  m = sample();
  m.coefficients[1] = INFINITY;
  CHECK_THROWS_WITH(s.set_model(m), Contains("is infinite"));
  m = sample();
  m.sigma = -1.0;
  CHECK_THROWS_WITH(s.set_model(m), Contains("sigma must be finite and non-negative"));
  m = sample();
  m.names[0] = std::string("a\0b", 3);
  CHECK_THROWS_WITH(s.set_model(m), Contains("a NUL byte"));
  CHECK_FALSE(s.has_model());  // every failure left the spec unchanged
  m = sample();
  m.sigma = std::nan("");      // not available: allowed, written NA
  s.set_model(m);
  CHECK_THAT(write_spec(s), Contains("sigma=NA df=37"));
}

TEST_CASE("the reader checks model records strictly", "[spec][model]") {
  CHECK(parse_error(kHead + kModel + kC1 + kC2 + "end\n").empty());
  CHECK(parse_error(kHead + "model response=\"y\" coefficients=0 sigma=NA df=0\nend\n").empty());
  // missing field: reported at the end of the line
  CHECK_THAT(parse_error(kHead + "model response=\"y\" coefficients=2 df=8\n" + kC1 + kC2 + "end\n"),
             Contains("line 2, column 39: the model lacks the key sigma"));
  CHECK_THAT(parse_error(kHead + kModel + "coefficient name=\"a\"\n" + kC2 + "end\n"),
             Contains("line 3, column 21: the coefficient lacks the key value"));
  // duplicate key and duplicate coefficient name
  CHECK_THAT(parse_error(kHead + "model response=\"y\" df=1 coefficients=0 sigma=0x1p+0 df=2\nend\n"),
             Contains("line 2, column 53: the key df appears twice"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + "coefficient name=\"(Intercept)\" value=0x1p+1\nend\n"),
             Contains("line 4, column 18: the coefficient name \"(Intercept)\" is used twice"));
  // count mismatch, both ways
  CHECK_THAT(parse_error(kHead + kModel + kC1 + "end\n"),
             Contains("line 4, column 1: the model record on line 2 declares 2 coefficients but 1"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + kC2 + kC2 + "end\n"),
             Contains("line 5, column 1: more coefficient records than the 2 declared"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + "transform name=\"x\" family=log shift=0x0p+0 "
                         "reflect=false\n" + kC2 + "end\n"),
             Contains("line 4, column 1: the model record on line 2 declares 2"));
  // two model records; a coefficient without one
  CHECK_THAT(parse_error(kHead + kModel + kC1 + kC2 + kModel + kC1 + kC2 + "end\n"),
             Contains("line 5, column 1: a second model record; a spec holds at most one (the first "
                      "is on line 2)"));
  CHECK_THAT(parse_error(kHead + kC1 + "end\n"),
             Contains("line 2, column 1: a coefficient record before any model record"));
  // values: unknown key, NaN spelled otherwise, negative sigma, bad counts, bad names
  CHECK_THAT(parse_error(kHead + "model response=\"y\" coefficients=0 sigma=NA df=0 aic=3\nend\n"),
             Contains("line 2, column 49: unknown key aic; known keys: response, coefficients, sigma, df"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + "coefficient name=\"x\" value=nan\nend\n"),
             Contains("line 4, column 28: NaN and infinite values are not allowed"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + "coefficient name=\"x\" value=NAN\nend\n"),
             Contains("line 4, column 28: NaN and infinite values are not allowed"));
  CHECK_THAT(parse_error(kHead + "model response=\"y\" coefficients=0 sigma=-0x1p+0 df=0\nend\n"),
             Contains("line 2, column 41: sigma must not be negative"));
  CHECK_THAT(parse_error(kHead + "model response=\"y\" coefficients=02 sigma=NA df=0\nend\n"),
             Contains("line 2, column 33: expected a whole number like 12, got 02"));
  CHECK_THAT(parse_error(kHead + "model response=\"y\" coefficients=65537 sigma=NA df=0\nend\n"),
             Contains("line 2, column 33: the number 65537 exceeds the limit of 65536"));
  CHECK_THAT(parse_error(kHead + "model response=\"\" coefficients=0 sigma=NA df=0\nend\n"),
             Contains("line 2, column 1: invalid model: the model's response needs a non-empty name"));
  CHECK_THAT(parse_error(kHead + kModel + "coefficient name=\"\" value=0x1p+0\n" + kC2 + "end\n"),
             Contains("line 3, column 18: a coefficient needs a non-empty name"));
  CHECK_THAT(parse_error(kHead + kModel + kC1 + kC2 + "end\n" + kC2),
             Contains("line 6, column 1: text after the end line"));
}

TEST_CASE("the model example of docs/spec-format.md parses as described", "[spec][model]") {
  // The doc sits in docs/ beside tests/ in the source tree.
  std::ifstream in(std::string(PWB_FIXTURE_DIR) + "/../../docs/spec-format.md");
  REQUIRE(in);
  std::stringstream ss;
  ss << in.rdbuf();
  const std::string doc = ss.str();
  const std::size_t at = doc.find("```\npowerback-spec 1\n# sediment load");
  REQUIRE(at != std::string::npos);
  const std::size_t from = at + 4;
  const std::string text = doc.substr(from, doc.find("```", from) - from);
  const Spec s = parse_spec(text.data(), text.size());
  REQUIRE(s.has_model());
  const SpecModel& m = s.model();
  CHECK(m.response == "sediment_t_day");
  REQUIRE(m.names.size() == 3);
  CHECK(m.names[0] == "(Intercept)");
  // -0x1.8p+0 = -1.5 and 0x1.2p+0 = 1.125 exactly; 0x1.3333333333333p-2 is the double nearest 0.3.
  CHECK(m.coefficients[0] == -1.5);
  CHECK(m.coefficients[1] == 1.125);
  CHECK(std::isnan(m.coefficients[2]));
  CHECK(same_bits(m.sigma, 0.3));
  CHECK(m.df == 41);
  CHECK(s.size() == 3);
}
