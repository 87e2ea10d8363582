// The header's conventions: text copied like snprintf, the family after the data, and the
// entry points that follow them agreeing with the deprecated forms they replace.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstring>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

TEST_CASE("pwb_screen_variable_with_note gives the note whole and cuts it like snprintf",
          "[capi][conventions]") {
  const double flat[] = {2.0, 2.0, 2.0, 2.0};
  pwb_screen_result r;
  pwb_screen_result_init(&r);
  size_t need = 0;
  REQUIRE(pwb_screen_variable_with_note(flat, 4, nullptr, &r, nullptr, 0, &need) == PWB_OK);
  CHECK(r.usable == 0);
  const std::string field = r.note;
  CHECK_THAT(field, Contains("identical"));
  CHECK(need == field.size());
  std::vector<char> buf(need + 1, 'z');
  REQUIRE(pwb_screen_variable_with_note(flat, 4, nullptr, &r, buf.data(), buf.size(), nullptr) ==
          PWB_OK);
  CHECK(std::string(buf.data()) == field);
  char small[6];
  REQUIRE(pwb_screen_variable_with_note(flat, 4, nullptr, &r, small, sizeof small, &need) == PWB_OK);
  CHECK(std::string(small) == field.substr(0, 5));
  CHECK(need == field.size());
  CHECK(pwb_screen_variable_with_note(flat, 4, nullptr, &r, nullptr, 3, &need) ==
        PWB_ERR_ARGUMENT);
  // A usable variable has an empty note: length 0, buf holds "".
  std::vector<double> x;
  for (int i = 1; i <= 30; ++i) x.push_back(std::exp(0.1 * i));
  REQUIRE(pwb_screen_variable_with_note(x.data(), x.size(), nullptr, &r, small, sizeof small,
                                        &need) == PWB_OK);
  CHECK(r.usable == 1);
  CHECK(need == 0);
  CHECK(small[0] == '\0');
}

TEST_CASE("every text getter refuses a NULL buffer with room and answers a length query",
          "[capi][conventions]") {
  pwb_transform_spec spec;
  pwb_transform_spec_init(&spec);
  spec.family = PWB_LOG;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&spec, &t) == PWB_OK);
  size_t need = 0;
  CHECK(pwb_transform_describe(t, 3, nullptr, 0, &need) == PWB_OK);
  CHECK(need == std::strlen("log of x"));
  CHECK(pwb_transform_describe(t, 3, nullptr, 4, &need) == PWB_ERR_ARGUMENT);
  pwb_spec* s = nullptr;
  REQUIRE(pwb_spec_new(&s) == PWB_OK);
  REQUIRE(pwb_spec_add_transform(s, "volume", t) == PWB_OK);
  CHECK(pwb_spec_name(s, 0, nullptr, 0, &need) == PWB_OK);
  CHECK(need == 6);
  CHECK(pwb_spec_name(s, 0, nullptr, 1, &need) == PWB_ERR_ARGUMENT);
  CHECK(pwb_spec_write(s, nullptr, 2, &need) == PWB_ERR_ARGUMENT);
  pwb_spec_free(s);
  pwb_transform_free(t);
}

TEST_CASE("the family as a parameter: leave-one-out lambda agrees with the options form",
          "[capi][conventions]") {
  std::mt19937 gen(21);
  std::normal_distribution<double> nd;
  const size_t n = 40;
  std::vector<double> y(n), x(n);
  for (size_t i = 0; i < n; ++i) {
    x[i] = static_cast<double>(i) / 4.0;
    y[i] = std::exp(0.5 + 0.15 * x[i] + 0.1 * nd(gen)) - 2.0;  // the first rows below 0
  }
  pwb_influence_options opt;
  pwb_influence_options_init(&opt);
  opt.family = PWB_YEO_JOHNSON;
  pwb_influence_summary a, b;
  a.struct_size = b.struct_size = sizeof a;
  std::vector<double> la(n), lb(n);
  REQUIRE(pwb_lambda_influence(y.data(), x.data(), n, 1, &opt, &a, la.data(), nullptr, nullptr,
                               nullptr) == PWB_OK);
  // The parameter decides; the options' family is not read.
  opt.family = PWB_LOG;
  REQUIRE(pwb_estimate_response_lambda_loo(y.data(), x.data(), n, 1, PWB_YEO_JOHNSON, &opt, &b,
                                           lb.data(), nullptr, nullptr, nullptr) == PWB_OK);
  CHECK(a.lambda == b.lambda);
  CHECK(a.n_outside == b.n_outside);
  CHECK(la == lb);
  // The full-data estimate is pwb_estimate_response_lambda's.
  pwb_lambda_result full;
  pwb_lambda_result_init(&full);
  REQUIRE(pwb_estimate_response_lambda(y.data(), x.data(), n, 1, PWB_YEO_JOHNSON, nullptr, &full) ==
          PWB_OK);
  CHECK(b.lambda == Approx(full.lambda).margin(1e-7));  // both maximisers stop within ~1e-8
  CHECK(pwb_estimate_response_lambda_loo(y.data(), x.data(), n, 1, PWB_BOX_COX, nullptr, &b,
                                         nullptr, nullptr, nullptr, nullptr) == PWB_ERR_DOMAIN);
  CHECK(pwb_estimate_response_lambda_loo(y.data(), x.data(), n, 1, PWB_SQRT, nullptr, &b, nullptr,
                                         nullptr, nullptr, nullptr) == PWB_ERR_ARGUMENT);
  CHECK_THAT(pwb_last_error(), Contains("PWB_YEO_JOHNSON"));
}

TEST_CASE("pwb_lambda_summary_create is pwb_lambda_summary_new with the size first",
          "[capi][conventions]") {
  const double y[] = {1.5, 2.0, 3.5, 4.0, 7.5, 9.0};
  const double X[] = {1, 2, 3, 4, 5, 6};
  pwb_lambda_summary *a = nullptr, *b = nullptr;
  REQUIRE(pwb_lambda_summary_create(1, PWB_BOX_COX, &a) == PWB_OK);
  REQUIRE(pwb_lambda_summary_new(PWB_BOX_COX, 1, &b) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(a, y, X, 6, 6, nullptr) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(b, y, X, 6, 6, nullptr) == PWB_OK);
  size_t na = 0, nb = 0;
  REQUIRE(pwb_lambda_summary_serialize(a, nullptr, 0, &na) == PWB_OK);
  REQUIRE(pwb_lambda_summary_serialize(b, nullptr, 0, &nb) == PWB_OK);
  REQUIRE(na == nb);
  std::vector<unsigned char> ba(na), bb(nb);
  REQUIRE(pwb_lambda_summary_serialize(a, ba.data(), na, &na) == PWB_OK);
  REQUIRE(pwb_lambda_summary_serialize(b, bb.data(), nb, &nb) == PWB_OK);
  CHECK(ba == bb);
  pwb_lambda_summary_free(a);
  pwb_lambda_summary_free(b);
  pwb_lambda_summary* c = nullptr;
  CHECK(pwb_lambda_summary_create(1, PWB_LOG, &c) == PWB_ERR_ARGUMENT);
  CHECK(c == nullptr);
}
