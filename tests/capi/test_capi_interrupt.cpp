// pwb_set_interrupt_check: a caller's check stops a computation with PWB_ERR_CANCELLED, on the
// thread that installed it only.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <thread>
#include <vector>

#include "powerback.h"

namespace {

int always_stop(void* user) {
  ++*static_cast<int*>(user);
  return 1;
}

pwb_status response_lambda(pwb_lambda_result* r) {
  const std::size_t n = 40;
  std::vector<double> y(n), X(2 * n);
  for (std::size_t i = 0; i < n; ++i) {
    X[i] = static_cast<double>(i % 7);
    X[n + i] = std::sin(static_cast<double>(i));
    y[i] = std::exp(0.1 * X[i] + 0.2 * X[n + i]) + 0.01 * static_cast<double>(i % 3);
  }
  pwb_lambda_options opt;
  pwb_lambda_options_init(&opt);
  pwb_lambda_result_init(r);
  return pwb_estimate_response_lambda(y.data(), X.data(), n, 2, PWB_BOX_COX, &opt, r);
}

}  // namespace

TEST_CASE("an interrupt check cancels on its own thread only", "[capi][cancel]") {
  pwb_lambda_result r;
  REQUIRE(response_lambda(&r) == PWB_OK);
  const double lambda = r.lambda;

  int calls = 0;
  pwb_set_interrupt_check(always_stop, &calls);
  CHECK(response_lambda(&r) == PWB_ERR_CANCELLED);
  CHECK(calls >= 1);
  CHECK(std::string(pwb_last_error()).find("cancelled") != std::string::npos);
  CHECK(std::string(pwb_status_name(PWB_ERR_CANCELLED)) == "PWB_ERR_CANCELLED");

  // Another thread has no check installed and computes the same estimate.
  pwb_status other = PWB_ERR_INTERNAL;
  double other_lambda = NAN;
  std::thread t([&] {
    pwb_lambda_result r2;
    other = response_lambda(&r2);
    other_lambda = r2.lambda;
  });
  t.join();
  CHECK(other == PWB_OK);
  CHECK(other_lambda == lambda);

  pwb_set_interrupt_check(nullptr, nullptr);
  const int before = calls;
  REQUIRE(response_lambda(&r) == PWB_OK);
  CHECK(r.lambda == lambda);
  CHECK(calls == before);
}
