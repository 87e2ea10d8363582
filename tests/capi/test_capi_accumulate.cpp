// Summaries through the C ABI: chunks, bytes, merges and finishes against the one-pass calls.
#include <cstddef>
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

namespace {

struct Rows {
  std::size_t n, p;
  std::vector<double> y, X;
};

Rows simulate(std::size_t n, unsigned seed) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  Rows r{n, 2, std::vector<double>(n), std::vector<double>(2 * n)};
  for (auto& v : r.X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    const double s = 4.0 + 0.6 * r.X[i] - 0.3 * r.X[n + i] + 0.5 * nd(g);
    r.y[i] = s * s;
  }
  return r;
}

std::vector<unsigned char> bytes_of(const pwb_lambda_summary* s) {
  size_t need = 0;
  REQUIRE(pwb_lambda_summary_serialize(s, nullptr, 0, &need) == PWB_OK);
  std::vector<unsigned char> b(need);
  REQUIRE(pwb_lambda_summary_serialize(s, b.data(), b.size(), &need) == PWB_OK);
  return b;
}

}  // namespace

TEST_CASE("a lambda summary in three chunks finishes like the one-pass curve", "[capi][accumulate]") {
  const Rows d = simulate(12000, 61);
  pwb_lambda_result one, got;
  pwb_lambda_result_init(&one);
  pwb_lambda_result_init(&got);
  std::vector<double> g1(51), l1(51), g2(51), l2(51);
  REQUIRE(pwb_estimate_response_lambda_curve(d.y.data(), d.X.data(), d.n, d.p, PWB_BOX_COX, nullptr, &one, 51,
                                             g1.data(), l1.data()) == PWB_OK);
  pwb_lambda_summary *a = nullptr, *b = nullptr, *c = nullptr;
  REQUIRE(pwb_lambda_summary_new(PWB_BOX_COX, d.p, &a) == PWB_OK);
  REQUIRE(pwb_lambda_summary_new(PWB_BOX_COX, d.p, &b) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(a, d.y.data(), d.X.data(), 5000, d.n, nullptr) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(b, d.y.data() + 5000, d.X.data() + 5000, 4000, d.n, nullptr) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(b, d.y.data() + 9000, d.X.data() + 9000, 3000, d.n, nullptr) == PWB_OK);
  const std::vector<unsigned char> bytes = bytes_of(b);
  REQUIRE(pwb_lambda_summary_deserialize(bytes.data(), bytes.size(), &c) == PWB_OK);
  REQUIRE(pwb_lambda_summary_merge(a, c) == PWB_OK);
  size_t n = 0, bins = 0;
  REQUIRE(pwb_lambda_summary_count(a, &n, &bins) == PWB_OK);
  CHECK(n == d.n);
  CHECK(bins > 10);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  REQUIRE(pwb_lambda_summary_finish(a, nullptr, &got, 51, g2.data(), l2.data(), &info) == PWB_OK);
  CHECK(info.needs_pass == 0);
  // The accuracy contract of the header: 1e-7 in lambda-hat, 1e-9 at the interval's ends.
  CHECK(std::fabs(got.lambda - one.lambda) <= 1e-7);
  CHECK(std::fabs(got.conf_low - one.conf_low) <= 1e-9);
  CHECK(std::fabs(got.conf_high - one.conf_high) <= 1e-9);
  CHECK(got.n == d.n);
  CHECK(got.rank == 3);
  CHECK(got.convenient == one.convenient);
  // The same grid to 1e-7 (it is built from the interval), the same profile to 1e-10 relative.
  CHECK(std::fabs(g2[17] - g1[17]) <= 1e-7);
  CHECK(l2[25] == Approx(l1[25]).epsilon(1e-10));

  // Bytes cut short or with a flipped byte are PWB_ERR_PARSE with a message.
  pwb_lambda_summary* bad = nullptr;
  CHECK(pwb_lambda_summary_deserialize(bytes.data(), bytes.size() - 9, &bad) == PWB_ERR_PARSE);
  CHECK(bad == nullptr);
  CHECK(std::string(pwb_last_error()).find("cannot read a lambda summary") != std::string::npos);
  std::vector<unsigned char> flipped = bytes;
  flipped[flipped.size() / 2] ^= 0x01;
  CHECK(pwb_lambda_summary_deserialize(flipped.data(), flipped.size(), &bad) == PWB_ERR_PARSE);
  CHECK(std::string(pwb_last_error()).find("checksum") != std::string::npos);
  // A buffer too small is an argument error, not a partial write.
  size_t need = 0;
  std::vector<unsigned char> small(10);
  CHECK(pwb_lambda_summary_serialize(a, small.data(), small.size(), &need) == PWB_ERR_ARGUMENT);
  // Errors name the chunk's rows.
  const double ybad[] = {1.0, 0.0};
  const double Xbad[] = {1.0, 2.0, 3.0, 4.0};
  CHECK(pwb_lambda_summary_add(a, ybad, Xbad, 2, 2, nullptr) == PWB_ERR_DOMAIN);
  CHECK(std::string(pwb_last_error()).find("rows 1") != std::string::npos);
  pwb_lambda_summary_free(a);
  pwb_lambda_summary_free(b);
  pwb_lambda_summary_free(c);
  pwb_lambda_summary_free(nullptr);
}

TEST_CASE("a grid pass serves a range the bins cannot", "[capi][accumulate]") {
  const Rows d = simulate(8000, 62);
  pwb_lambda_options opt;
  pwb_lambda_options_init(&opt);
  opt.lower = -6.0;
  opt.upper = 6.0;
  pwb_lambda_result one, got;
  pwb_lambda_result_init(&one);
  pwb_lambda_result_init(&got);
  REQUIRE(pwb_estimate_response_lambda(d.y.data(), d.X.data(), d.n, d.p, PWB_BOX_COX, &opt, &one) == PWB_OK);
  pwb_lambda_summary* s = nullptr;
  REQUIRE(pwb_lambda_summary_new(PWB_BOX_COX, d.p, &s) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(s, d.y.data(), d.X.data(), d.n, d.n, nullptr) == PWB_OK);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  REQUIRE(pwb_lambda_summary_finish(s, &opt, &got, 0, nullptr, nullptr, &info) == PWB_OK);
  REQUIRE(info.needs_pass == 1);
  CHECK(std::isnan(got.lambda));
  for (int round = 0; round < 3 && info.needs_pass; ++round) {
    std::vector<double> grid(info.pass_points);
    for (std::size_t i = 0; i < grid.size(); ++i)
      grid[i] = info.pass_lower + (info.pass_upper - info.pass_lower) * double(i) / double(grid.size() - 1);
    pwb_lambda_pass* pass = nullptr;
    REQUIRE(pwb_lambda_pass_new(s, grid.data(), grid.size(), &pass) == PWB_OK);
    REQUIRE(pwb_lambda_pass_add(pass, d.y.data(), d.X.data(), d.n, d.n, nullptr) == PWB_OK);
    std::vector<double> go(grid.size()), lo(grid.size());
    REQUIRE(pwb_lambda_pass_finish(pass, s, &opt, &got, grid.size(), go.data(), lo.data(), &info) == PWB_OK);
    CHECK(info.from_grid == 1);
    pwb_lambda_pass_free(pass);
  }
  CHECK(info.needs_pass == 0);
  // The fallback's documented accuracy: about 1e-6.
  CHECK(std::fabs(got.lambda - one.lambda) <= 2e-6);
  CHECK(std::fabs(got.conf_low - one.conf_low) <= 2e-6);
  CHECK(std::fabs(got.conf_high - one.conf_high) <= 2e-6);
  pwb_lambda_summary_free(s);
}

TEST_CASE("a fit summary and its checks equal pwb_model_fit and its checks", "[capi][accumulate]") {
  const Rows d = simulate(3000, 63);
  pwb_transform_spec spec;
  pwb_transform_spec_init(&spec);
  spec.family = PWB_SQRT;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&spec, &t) == PWB_OK);
  pwb_model* m = nullptr;
  REQUIRE(pwb_model_fit(d.y.data(), d.X.data(), d.n, d.p, t, nullptr, &m) == PWB_OK);
  pwb_fit_summary *a = nullptr, *b = nullptr;
  REQUIRE(pwb_fit_summary_new(t, d.p, 0, &a) == PWB_OK);
  REQUIRE(pwb_fit_summary_new(t, d.p, 0, &b) == PWB_OK);
  REQUIRE(pwb_fit_summary_add(a, d.y.data(), d.X.data(), 1000, d.n, nullptr) == PWB_OK);
  REQUIRE(pwb_fit_summary_add(b, d.y.data() + 1000, d.X.data() + 1000, 2000, d.n, nullptr) == PWB_OK);
  REQUIRE(pwb_fit_summary_merge(a, b) == PWB_OK);
  pwb_model_info want, got;
  want.struct_size = got.struct_size = sizeof(pwb_model_info);
  REQUIRE(pwb_model_get_info(m, &want) == PWB_OK);
  double cw[3], cg[3], sw[3], sg[3], cov[9];
  REQUIRE(pwb_model_coefficients(m, cw, sw, nullptr, 3) == PWB_OK);
  REQUIRE(pwb_fit_summary_finish(a, &got, cg, sg, nullptr, cov, 3) == PWB_OK);
  // Householder QRs of the same rows in other blocks: 1e-10 relative.
  CHECK(got.loglik == Approx(want.loglik).epsilon(1e-10));
  CHECK(got.sigma == Approx(want.sigma).epsilon(1e-10));
  CHECK(got.df_residual == want.df_residual);
  for (int j = 0; j < 3; ++j) {
    CHECK(cg[j] == Approx(cw[j]).epsilon(1e-10));
    CHECK(sg[j] == Approx(sw[j]).epsilon(1e-10));
    CHECK(std::sqrt(cov[j * 3 + j]) == Approx(sw[j]).epsilon(1e-10));
  }
  pwb_fit_checks* c = nullptr;
  REQUIRE(pwb_fit_checks_new(a, &c) == PWB_OK);
  REQUIRE(pwb_fit_checks_add(c, d.y.data(), d.X.data(), d.n, d.n, nullptr) == PWB_OK);
  pwb_residual_checks rw, rg;
  pwb_residual_checks_init(&rw);
  pwb_residual_checks_init(&rg);
  REQUIRE(pwb_model_residual_checks(m, &rw) == PWB_OK);
  REQUIRE(pwb_fit_checks_finish(c, &rg) == PWB_OK);
  // Statistics from other QRs of the same auxiliary regressions: 1e-8 relative.
  CHECK(rg.bp_statistic == Approx(rw.bp_statistic).epsilon(1e-8));
  CHECK(rg.reset_f == Approx(rw.reset_f).epsilon(1e-8));
  CHECK(rg.skewness == Approx(rw.skewness).epsilon(1e-8));
  CHECK(rg.sw_computed == 0);
  double eta = 4.0, mean = 0.0;
  REQUIRE(pwb_fit_checks_smearing(c, &eta, 1, &mean) == PWB_OK);
  // sqrt's inverse is v^2: the smearing mean is exactly (eta + e)^2 averaged = eta^2 + 2 eta
  // mean(e) + mean(e^2), and mean(e) = 0 with an intercept; quadratic within each bin: exact
  // up to rounding (1e-10 relative).
  CHECK(mean == Approx(eta * eta + got.rss / double(d.n)).epsilon(1e-10));
  size_t need = 0;
  REQUIRE(pwb_fit_checks_serialize(c, nullptr, 0, &need) == PWB_OK);
  std::vector<unsigned char> bytes(need);
  REQUIRE(pwb_fit_checks_serialize(c, bytes.data(), need, &need) == PWB_OK);
  pwb_fit_checks* back = nullptr;
  CHECK(pwb_fit_checks_deserialize(bytes.data(), need - 1, &back) == PWB_ERR_PARSE);
  REQUIRE(pwb_fit_checks_deserialize(bytes.data(), need, &back) == PWB_OK);
  pwb_fit_checks_free(back);
  pwb_fit_checks_free(c);
  pwb_fit_summary_free(a);
  pwb_fit_summary_free(b);
  pwb_model_free(m);
  pwb_transform_free(t);
}

TEST_CASE("a lambda summary finishes with options from an older, shorter header",
          "[capi][accumulate]") {
  const Rows d = simulate(6000, 63);
  pwb_lambda_summary* s = nullptr;
  REQUIRE(pwb_lambda_summary_create(d.p, PWB_BOX_COX, &s) == PWB_OK);
  REQUIRE(pwb_lambda_summary_add(s, d.y.data(), d.X.data(), d.n, d.n, nullptr) == PWB_OK);
  pwb_lambda_options full, old;
  pwb_lambda_options_init(&full);
  full.lower = -2.0;
  old = full;
  // A caller compiled before the aliased-column fields (and before the weights) were appended.
  old.struct_size = offsetof(pwb_lambda_options, weights);
  pwb_lambda_result a, b;
  pwb_lambda_result_init(&a);
  pwb_lambda_result_init(&b);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  REQUIRE(pwb_lambda_summary_finish(s, &full, &a, 0, nullptr, nullptr, &info) == PWB_OK);
  REQUIRE(pwb_lambda_summary_finish(s, &old, &b, 0, nullptr, nullptr, &info) == PWB_OK);
  CHECK(b.lambda == a.lambda);  // same settings read, so the same search to the bit
  CHECK(b.conf_low == a.conf_low);
  old.struct_size = offsetof(pwb_lambda_options, level);  // too short to hold the settings
  CHECK(pwb_lambda_summary_finish(s, &old, &b, 0, nullptr, nullptr, &info) == PWB_ERR_ARGUMENT);
  pwb_lambda_summary_free(s);
}
