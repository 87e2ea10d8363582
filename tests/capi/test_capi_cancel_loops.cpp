// The long computations poll the caller's interrupt check between steps (lambda evaluations,
// iterations, blocks of rows), so a check that says stop after k polls ends each of them with
// PWB_ERR_CANCELLED wherever it falls: before the first step, midway or at the last poll. Run
// under the sanitizer build, the cancelled calls also show that unwinding leaks nothing.
#include <catch2/catch.hpp>

#include <cmath>
#include <functional>
#include <random>
#include <string>
#include <vector>

#include "powerback.h"

namespace {

// Says stop at poll number stop_after + 1 (never when stop_after < 0), counting every poll.
struct Counter {
  long polls = 0;
  long stop_after = -1;
};
int count_and_maybe_stop(void* user) {
  Counter* c = static_cast<Counter*>(user);
  ++c->polls;
  return c->stop_after >= 0 && c->polls > c->stop_after ? 1 : 0;
}

// Installs the counting check for the scope and removes it after.
struct Installed {
  Counter c;
  Installed() { pwb_set_interrupt_check(count_and_maybe_stop, &c); }
  ~Installed() { pwb_set_interrupt_check(nullptr, nullptr); }
};

// Runs call once to count its polls (it must succeed and poll at least min_polls times), then
// with the check stopping at the first, a middle and the last of those polls: each run returns
// PWB_ERR_CANCELLED with the cancellation message and polls no more after saying stop.
void cancels_at_every_step(const char* what, const std::function<pwb_status()>& call,
                           long min_polls) {
  INFO(what);
  Installed g;
  REQUIRE(call() == PWB_OK);
  const long total = g.c.polls;
  CHECK(total >= min_polls);
  for (long k : {0L, total / 2, total - 1}) {
    INFO("stop at poll " << k + 1 << " of " << total);
    g.c.polls = 0;
    g.c.stop_after = k;
    CHECK(call() == PWB_ERR_CANCELLED);
    CHECK(g.c.polls == k + 1);
    CHECK(std::string(pwb_last_error()).find("cancelled") != std::string::npos);
    g.c.stop_after = -1;
  }
}

struct Data {
  std::size_t n, p;
  std::vector<double> y, X;
};

// Positive y with a power relation to two positive predictors (seeded, so the counts are fixed).
Data simulate(std::size_t n) {
  std::mt19937_64 gen(20261203);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::uniform_real_distribution<double> ud(1.0, 10.0);
  Data d{n, 2, std::vector<double>(n), std::vector<double>(2 * n)};
  for (auto& v : d.X) v = ud(gen);
  for (std::size_t i = 0; i < n; ++i) {
    const double s = 2.0 + 0.4 * std::sqrt(d.X[i]) + 0.2 * d.X[n + i] + 0.3 * nd(gen);
    d.y[i] = s * s;
  }
  return d;
}

}  // namespace

TEST_CASE("every long entry point stops at any poll of the interrupt check", "[capi][cancel]") {
  // 9000 rows: several blocks of rows for the block-wise passes (2048 to 4096 rows each) and
  // 36 blocks of 256 rows for the leave-one-out loop.
  const Data d = simulate(9000);
  const std::size_t n = d.n, p = d.p;
  pwb_lambda_options lo;
  pwb_lambda_options_init(&lo);
  pwb_lambda_result lr;
  pwb_lambda_result_init(&lr);

  cancels_at_every_step("pwb_estimate_lambda", [&] {
    return pwb_estimate_lambda(d.y.data(), n, PWB_BOX_COX, &lo, &lr);
  }, 3);
  // The response search with predictors: one poll per batch of lambdas and per block of rows
  // in the direct profile passes.
  cancels_at_every_step("pwb_estimate_response_lambda", [&] {
    return pwb_estimate_response_lambda(d.y.data(), d.X.data(), n, p, PWB_YEO_JOHNSON, &lo, &lr);
  }, 3);
  const std::vector<double> grid = {-1.0, -0.5, 0.0, 0.5, 1.0};
  std::vector<double> ll(grid.size()), g101(101), l101(101);
  cancels_at_every_step("pwb_response_lambda_profile", [&] {
    return pwb_response_lambda_profile(d.y.data(), d.X.data(), n, p, PWB_BOX_COX, grid.data(),
                                       grid.size(), ll.data());
  }, 1);
  cancels_at_every_step("pwb_estimate_response_lambda_curve", [&] {
    return pwb_estimate_response_lambda_curve(d.y.data(), d.X.data(), n, p, PWB_BOX_COX, &lo, &lr,
                                              101, g101.data(), l101.data());
  }, 3);

  pwb_influence_options io;
  pwb_influence_options_init(&io);
  pwb_influence_summary is;
  is.struct_size = sizeof is;
  std::vector<double> loo(n), lev(n);
  std::vector<int> outside(n), at_bound(n);
  cancels_at_every_step("pwb_lambda_influence", [&] {
    return pwb_lambda_influence(d.y.data(), d.X.data(), n, p, &io, &is, loo.data(), lev.data(),
                                outside.data(), at_bound.data());
  }, 36);

  pwb_box_tidwell_options bo;
  pwb_box_tidwell_options_init(&bo);
  pwb_box_tidwell_result br;
  br.struct_size = sizeof br;
  cancels_at_every_step("pwb_box_tidwell", [&] {
    double alpha[2], se[2], st[2], sp[2];
    return pwb_box_tidwell(d.y.data(), nullptr, n, 0, d.X.data(), 2, &bo, alpha, se, st, sp,
                           nullptr, &br);
  }, 2);

  std::vector<int> fold(3 * n);
  cancels_at_every_step("pwb_cv_folds", [&] { return pwb_cv_folds(n, 5, 3, 7u, fold.data()); }, 3);
  pwb_holdout_scores hs;
  hs.struct_size = sizeof hs;
  cancels_at_every_step("pwb_holdout_score", [&] {
    return pwb_holdout_score(d.y.data(), d.y.data(), nullptr, nullptr, n, &hs);
  }, 1);
}

TEST_CASE("the summaries' passes stop at any poll of the interrupt check", "[capi][cancel][accumulate]") {
  const Data d = simulate(9000);
  const std::size_t n = d.n, p = d.p;
  pwb_lambda_summary* s = nullptr;
  REQUIRE(pwb_lambda_summary_new(PWB_BOX_COX, p, &s) == PWB_OK);
  cancels_at_every_step("pwb_lambda_summary_add", [&] {
    return pwb_lambda_summary_add(s, d.y.data(), d.X.data(), n, n, nullptr);
  }, 3);  // 9000 rows in blocks of 4096
  // The cancelled adds left s unchanged: it holds the one successful add's rows.
  std::size_t rows = 0;
  REQUIRE(pwb_lambda_summary_count(s, &rows, nullptr) == PWB_OK);
  CHECK(rows == n);
  pwb_lambda_result lr;
  pwb_lambda_result_init(&lr);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  cancels_at_every_step("pwb_lambda_summary_finish", [&] {
    return pwb_lambda_summary_finish(s, nullptr, &lr, 0, nullptr, nullptr, &info);
  }, 3);

  const std::vector<double> grid = {-0.5, 0.0, 0.5, 1.0};
  pwb_lambda_pass* pass = nullptr;
  REQUIRE(pwb_lambda_pass_new(s, grid.data(), grid.size(), &pass) == PWB_OK);
  cancels_at_every_step("pwb_lambda_pass_add", [&] {
    return pwb_lambda_pass_add(pass, d.y.data(), d.X.data(), n, n, nullptr);
  }, 9);  // blocks of 1024 rows
  pwb_lambda_pass_free(pass);
  pwb_lambda_summary_free(s);

  pwb_transform_spec ts;
  pwb_transform_spec_init(&ts);
  ts.family = PWB_LOG;
  pwb_transform* t = nullptr;
  REQUIRE(pwb_transform_new(&ts, &t) == PWB_OK);
  pwb_fit_summary* f = nullptr;
  REQUIRE(pwb_fit_summary_new(t, p, 0, &f) == PWB_OK);
  pwb_transform_free(t);
  cancels_at_every_step("pwb_fit_summary_add", [&] {
    return pwb_fit_summary_add(f, d.y.data(), d.X.data(), n, n, nullptr);
  }, 3);
  pwb_fit_checks* c = nullptr;
  REQUIRE(pwb_fit_checks_new(f, &c) == PWB_OK);
  cancels_at_every_step("pwb_fit_checks_add", [&] {
    return pwb_fit_checks_add(c, d.y.data(), d.X.data(), n, n, nullptr);
  }, 5);  // blocks of 2048 rows
  pwb_fit_checks_free(c);
  pwb_fit_summary_free(f);
}
