// Many responses through the C ABI: each response's result and curve equal
// pwb_estimate_response_lambda_curve on that column (the library's single-response entry point,
// itself checked against scipy and by-hand refits in test_capi_lambda.cpp and the core tests);
// per-response statuses, the first failure's message and rows, shared failures, struct sizes.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstddef>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include "powerback.h"

using Catch::Matchers::Contains;

namespace {

struct Many {
  std::size_t n, p, q;
  std::vector<double> X, Y;
};

Many simulate(std::size_t n, std::size_t p, std::size_t q, unsigned seed) {
  std::mt19937_64 g(seed);
  std::normal_distribution<double> nd(0.0, 1.0);
  Many d{n, p, q, std::vector<double>(n * p), std::vector<double>(n * q)};
  for (auto& v : d.X) v = nd(g);
  for (std::size_t j = 0; j < q; ++j)
    for (std::size_t i = 0; i < n; ++i) {
      const double eta = 0.3 * d.X[i] - 0.2 * d.X[(p - 1) * n + i] + 0.3 * nd(g);
      d.Y[j * n + i] = j % 2 ? std::exp(1.0 + eta) : (2.0 + eta) * (2.0 + eta);  // log / square-root truths
    }
  return d;
}

std::vector<pwb_lambda_result> results(std::size_t q) {
  std::vector<pwb_lambda_result> r(q);
  for (auto& e : r) pwb_lambda_result_init(&e);
  return r;
}

}  // namespace

TEST_CASE("many responses through the ABI equal single-response calls", "[capi][lambda][many]") {
  for (std::size_t n : {200u, 6000u}) {  // direct and binned evaluation
    const Many d = simulate(n, 3, 4, 81 + static_cast<unsigned>(n));
    std::vector<double> w(n);
    for (std::size_t i = 0; i < n; ++i) w[i] = i % 5 == 0 ? 0.0 : 0.5 + 0.1 * static_cast<double>(i % 7);
    for (bool weighted : {false, true}) {
      pwb_lambda_options o;
      pwb_lambda_options_init(&o);
      if (weighted) o.weights = w.data();
      const std::size_t m = 21;
      auto out = results(d.q);
      std::vector<pwb_status> st(d.q, PWB_ERR_INTERNAL);
      std::vector<double> grid(d.q * m), ll(d.q * m);
      REQUIRE(pwb_estimate_response_lambdas(d.Y.data(), n, d.q, d.X.data(), d.p, PWB_BOX_COX, &o,
                                            out.data(), st.data(), m, grid.data(), ll.data()) == PWB_OK);
      for (std::size_t j = 0; j < d.q; ++j) {
        INFO("n " << n << " weighted " << weighted << " response " << j);
        CHECK(st[j] == PWB_OK);
        pwb_lambda_result one;
        pwb_lambda_result_init(&one);
        std::vector<double> g1(m), l1(m);
        REQUIRE(pwb_estimate_response_lambda_curve(d.Y.data() + j * n, d.X.data(), n, d.p, PWB_BOX_COX,
                                                   &o, &one, m, g1.data(), l1.data()) == PWB_OK);
        // 1e-10: the same operations on the same blocks; only rounding could differ
        CHECK(std::fabs(out[j].lambda - one.lambda) <= 1e-10);
        CHECK(std::fabs(out[j].conf_low - one.conf_low) <= 1e-10);
        CHECK(std::fabs(out[j].conf_high - one.conf_high) <= 1e-10);
        CHECK(std::fabs(out[j].loglik - one.loglik) <= 1e-10 * std::fabs(one.loglik));
        CHECK(out[j].convenient == one.convenient);
        CHECK(out[j].converged == one.converged);
        CHECK(out[j].at_bound == one.at_bound);
        CHECK(out[j].n == one.n);
        CHECK(out[j].rank == one.rank);
        for (std::size_t k = 0; k < m; ++k) {
          CHECK(std::fabs(grid[j * m + k] - g1[k]) <= 1e-10);
          CHECK(std::fabs(ll[j * m + k] - l1[k]) <= 1e-10 * std::fabs(l1[k]));
        }
      }
    }
  }
}

TEST_CASE("a failing response: its status, the first failure's message and rows", "[capi][lambda][many]") {
  Many d = simulate(150, 2, 4, 91);
  d.Y[1 * d.n + 9] = -2.0;   // response 1: one value <= 0
  d.Y[3 * d.n + 0] = 0.0;    // response 3 too
  auto out = results(d.q);
  std::vector<pwb_status> st(d.q);
  std::vector<double> grid(d.q * 5), ll(d.q * 5);
  CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                      out.data(), st.data(), 5, grid.data(), ll.data()) == PWB_ERR_DOMAIN);
  CHECK(st[0] == PWB_OK);
  CHECK(st[1] == PWB_ERR_DOMAIN);
  CHECK(st[2] == PWB_OK);
  CHECK(st[3] == PWB_ERR_DOMAIN);
  CHECK_THAT(std::string(pwb_last_error()), Contains("Y column 1 (0-based)") && Contains("index 9"));
  std::size_t rows[8];
  int input = -5;
  CHECK(pwb_lambda_error_rows(rows, 8, &input) == 1);
  CHECK(rows[0] == 9);
  CHECK(input == PWB_LAMBDA_INPUT_RESPONSE);
  CHECK(std::isfinite(out[0].lambda));
  CHECK(std::isnan(out[1].lambda));  // not written
  CHECK(std::isfinite(out[2].lambda));
  CHECK(std::isnan(grid[1 * 5]));
  CHECK(std::isfinite(ll[2 * 5 + 4]));
  // Yeo-Johnson accepts the same data.
  CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_YEO_JOHNSON, nullptr,
                                      out.data(), nullptr, 0, nullptr, nullptr) == PWB_OK);
}

TEST_CASE("shared failures stop the call and mark every response", "[capi][lambda][many]") {
  Many d = simulate(100, 2, 3, 92);
  auto out = results(d.q);
  std::vector<pwb_status> st(d.q, PWB_OK);
  d.X[d.n + 4] = NAN;
  CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                      out.data(), st.data(), 0, nullptr, nullptr) == PWB_ERR_NONFINITE);
  for (pwb_status s : st) CHECK(s == PWB_ERR_NONFINITE);
  int input = -5;
  std::size_t row = 99;
  CHECK(pwb_lambda_error_rows(&row, 1, &input) == 1);
  CHECK(row == 4);
  CHECK(input == PWB_LAMBDA_INPUT_PREDICTORS);
  CHECK(std::isnan(out[0].lambda));
  d.X[d.n + 4] = 0.5;
  SECTION("struct sizes") {
    out[2].struct_size = sizeof(pwb_lambda_result) + 8;
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), st.data(), 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK_THAT(std::string(pwb_last_error()), Contains("out[2].struct_size"));
    out[0].struct_size = 8;
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), st.data(), 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
  }
  SECTION("arguments") {
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, 0, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), nullptr, 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK(pwb_estimate_response_lambdas(nullptr, d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), nullptr, 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        nullptr, nullptr, 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), nullptr, 1, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                        out.data(), nullptr, 5, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_POWER, nullptr,
                                        out.data(), nullptr, 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    pwb_lambda_options o;
    pwb_lambda_options_init(&o);
    o.lower = 4.0;
    CHECK(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, &o,
                                        out.data(), st.data(), 0, nullptr, nullptr) == PWB_ERR_ARGUMENT);
    for (pwb_status s : st) CHECK(s == PWB_ERR_ARGUMENT);
  }
  SECTION("a larger struct from a newer caller: the stride follows struct_size") {
    struct Bigger {
      pwb_lambda_result r;
      double extra;
    };
    std::vector<Bigger> big(d.q);
    for (auto& b : big) {
      pwb_lambda_result_init(&b.r);
      b.r.struct_size = sizeof(Bigger);
      b.extra = 7.0;
    }
    REQUIRE(pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, nullptr,
                                          &big[0].r, nullptr, 0, nullptr, nullptr) == PWB_OK);
    pwb_lambda_result one;
    pwb_lambda_result_init(&one);
    REQUIRE(pwb_estimate_response_lambda(d.Y.data() + 2 * d.n, d.X.data(), d.n, d.p, PWB_BOX_COX,
                                         nullptr, &one) == PWB_OK);
    CHECK(std::fabs(big[2].r.lambda - one.lambda) <= 1e-10);  // as above
    CHECK(big[2].extra == 7.0);
  }
}

namespace {

// Everything one many-response call gives back, for exact comparison between thread counts.
struct Call {
  pwb_status s = PWB_OK;
  std::string message;
  std::vector<pwb_lambda_result> out;
  std::vector<pwb_status> st;
  std::vector<double> grid, ll;
};

Call run_many(const Many& d, const pwb_lambda_options& o, std::size_t m) {
  Call c;
  c.out = results(d.q);
  c.st.assign(d.q, PWB_ERR_INTERNAL);
  c.grid.assign(d.q * m, 0.0);
  c.ll.assign(d.q * m, 0.0);
  c.s = pwb_estimate_response_lambdas(d.Y.data(), d.n, d.q, d.X.data(), d.p, PWB_BOX_COX, &o,
                                      c.out.data(), c.st.data(), m, c.grid.data(), c.ll.data());
  c.message = pwb_last_error();
  return c;
}

// Bit-identical, NaN (a failed response's slots) equal to NaN.
bool same_bits(double a, double b) { return a == b || (std::isnan(a) && std::isnan(b)); }

void check_identical(const Call& a, const Call& b) {
  CHECK(a.s == b.s);
  CHECK(a.message == b.message);
  CHECK(a.st == b.st);
  for (std::size_t j = 0; j < a.out.size(); ++j) {
    INFO("response " << j);
    CHECK(same_bits(a.out[j].lambda, b.out[j].lambda));
    CHECK(same_bits(a.out[j].conf_low, b.out[j].conf_low));
    CHECK(same_bits(a.out[j].conf_high, b.out[j].conf_high));
    CHECK(same_bits(a.out[j].loglik, b.out[j].loglik));
    CHECK(same_bits(a.out[j].convenient, b.out[j].convenient));
    CHECK(a.out[j].converged == b.out[j].converged);
    CHECK(a.out[j].n == b.out[j].n);
  }
  for (std::size_t k = 0; k < a.grid.size(); ++k) {
    CHECK(same_bits(a.grid[k], b.grid[k]));
    CHECK(same_bits(a.ll[k], b.ll[k]));
  }
}

// Counts its polls and the polls made on a thread other than the one that installed it.
struct ThreadCheck {
  std::thread::id owner = std::this_thread::get_id();
  long polls = 0, elsewhere = 0, stop_after = -1;
};
int thread_check(void* user) {
  auto* c = static_cast<ThreadCheck*>(user);
  if (std::this_thread::get_id() != c->owner) {
    ++c->elsewhere;  // a race here would itself be reported by the sanitizer build
    return 0;
  }
  ++c->polls;
  return c->stop_after >= 0 && c->polls > c->stop_after ? 1 : 0;
}

}  // namespace

TEST_CASE("many responses on several threads: identical results, statuses and cancellation",
          "[capi][lambda][many][threads]") {
  // 9 responses, 6000 rows (the binned sums over two design blocks); responses 2 and 6 fail.
  Many d = simulate(6000, 3, 9, 93);
  d.Y[2 * d.n + 11] = -1.0;
  d.Y[6 * d.n + 40] = NAN;
  std::vector<double> w(d.n);
  for (std::size_t i = 0; i < d.n; ++i) w[i] = i % 7 == 3 ? 0.0 : 0.5 + 0.25 * static_cast<double>(i % 4);
  for (bool weighted : {false, true}) {
    pwb_lambda_options o;
    pwb_lambda_options_init(&o);
    CHECK(o.threads == 1);
    if (weighted) o.weights = w.data();
    const Call serial = run_many(d, o, 11);
    CHECK(serial.s == PWB_ERR_DOMAIN);  // the first failing response's status
    CHECK_THAT(serial.message, Contains("Y column 2 (0-based)"));
    for (std::size_t j = 0; j < d.q; ++j)
      CHECK(serial.st[j] == (j == 2 ? PWB_ERR_DOMAIN : j == 6 ? PWB_ERR_NONFINITE : PWB_OK));
    for (std::size_t threads : {0u, 2u, 3u, 64u}) {
      INFO("weighted " << weighted << " threads " << threads);
      o.threads = threads;
      check_identical(run_many(d, o, 11), serial);
    }
    // A struct from a header before `threads`: one thread, the same results.
    pwb_lambda_options old = o;
    old.threads = 3;
    old.struct_size = offsetof(pwb_lambda_options, threads);
    check_identical(run_many(d, old, 11), serial);
  }

  // The interrupt check: asked on the calling thread only, and a stop ends the call.
  d.Y[2 * d.n + 11] = 1.0;
  d.Y[6 * d.n + 40] = 1.0;
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.threads = 3;
  ThreadCheck c;
  pwb_set_interrupt_check(thread_check, &c);
  const Call full = run_many(d, o, 11);
  CHECK(full.s == PWB_OK);
  CHECK(c.polls >= 2);
  // How many polls fall on the calling thread depends on the scheduling; the design's
  // factorisation (two blocks of rows, polled once each) always runs there, so the first two are
  // certain.
  for (long k : {0L, 1L}) {
    INFO("stop at poll " << k + 1);
    c.polls = 0;
    c.stop_after = k;
    const Call stopped = run_many(d, o, 11);
    CHECK(stopped.s == PWB_ERR_CANCELLED);
    CHECK_THAT(stopped.message, Contains("cancelled"));
    for (pwb_status s : stopped.st) CHECK(s == PWB_ERR_CANCELLED);
    c.stop_after = -1;
  }
  pwb_set_interrupt_check(nullptr, nullptr);
  CHECK(c.elsewhere == 0);
  o.threads = 1;
  check_identical(run_many(d, o, 11), full);
}
