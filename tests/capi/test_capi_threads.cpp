// Handles used from 8 threads at once give exactly the serial results. Run it under
// ThreadSanitizer with -DPWB_SANITIZE=thread to check for data races as well.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstring>
#include <string>
#include <thread>
#include <vector>

#include "powerback.h"

namespace {

constexpr int kThreads = 8;
constexpr size_t kRows = 400;

// Everything one worker computes: transforms, a spec round trip, a lambda estimate, a model fit
// and prediction.
struct Outcome {
  std::vector<double> z, back, fit, lwr, upr;
  std::string spec_text, bad_message;
  double lambda = 0.0, conf_low = 0.0, conf_high = 0.0;
  pwb_status bad_status = PWB_OK;
  bool ok = false;
};

pwb_transform* make_transform(int k) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = (k % 2) ? PWB_BOX_COX : PWB_YEO_JOHNSON;
  s.lambda = 0.1 * k - 0.3;
  s.shift = 0.5;
  pwb_transform* t = nullptr;
  return pwb_transform_new(&s, &t) == PWB_OK ? t : nullptr;
}

// Worker k: its own handles only. Deterministic inputs that differ between workers.
Outcome work(int k) {
  Outcome o;
  std::vector<double> x(kRows), y(kRows);
  for (size_t i = 0; i < kRows; ++i) {
    x[i] = 0.5 + static_cast<double>((i * 37 + k * 11) % 101) / 10.0;
    y[i] = std::exp(0.3 + 0.2 * x[i] + 0.1 * std::sin(static_cast<double>(i + k)));
  }
  pwb_transform* t = make_transform(k);
  pwb_spec* s = nullptr;
  pwb_model* m = nullptr;
  o.z.resize(kRows);
  o.back.resize(kRows);
  o.fit.resize(kRows);
  o.lwr.resize(kRows);
  o.upr.resize(kRows);
  pwb_predict_options po;
  pwb_predict_options_init(&po);
  po.interval = PWB_INTERVAL_PREDICTION;
  size_t need = 0;
  o.ok = t && pwb_transform_apply(t, x.data(), kRows, o.z.data()) == PWB_OK &&
         pwb_transform_invert(t, o.z.data(), kRows, o.back.data()) == PWB_OK &&
         pwb_spec_new(&s) == PWB_OK && pwb_spec_add_transform(s, "x", t) == PWB_OK &&
         pwb_spec_write(s, nullptr, 0, &need) == PWB_OK &&
         pwb_model_fit(y.data(), x.data(), kRows, 1, t, nullptr, &m) == PWB_OK &&
         pwb_model_predict(m, x.data(), kRows, 1, &po, o.fit.data(), o.lwr.data(), o.upr.data(),
                           nullptr) == PWB_OK;
  pwb_lambda_result lr;
  pwb_lambda_result_init(&lr);
  o.ok = o.ok && pwb_estimate_response_lambda(y.data(), x.data(), kRows, 1, PWB_BOX_COX, nullptr,
                                              &lr) == PWB_OK;
  o.lambda = lr.lambda;
  o.conf_low = lr.conf_low;
  o.conf_high = lr.conf_high;
  if (o.ok) {
    std::vector<char> buf(need + 1);
    o.ok = pwb_spec_write(s, buf.data(), buf.size(), nullptr) == PWB_OK;
    o.spec_text = buf.data();
  }
  // A failing call leaves this thread's own message, untouched by the other threads' calls.
  // Each worker's bad element sits at its own index, so the messages differ between threads.
  pwb_transform_spec ls;
  pwb_transform_spec_init(&ls);
  ls.family = PWB_LOG;
  pwb_transform* lg = nullptr;
  std::vector<double> bad(static_cast<size_t>(k) + 2, 1.0), out(bad.size());
  bad.back() = -1.0;
  if (pwb_transform_new(&ls, &lg) == PWB_OK) {
    o.bad_status = pwb_transform_apply(lg, bad.data(), bad.size(), out.data());
    o.bad_message = pwb_last_error();
  }
  pwb_transform_free(lg);
  pwb_model_free(m);
  pwb_spec_free(s);
  pwb_transform_free(t);
  return o;
}

bool same(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() && std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0;
}

}  // namespace

TEST_CASE("separate handles on 8 threads give the serial results bit for bit", "[capi][threads]") {
  std::vector<Outcome> serial, parallel(kThreads);
  for (int k = 0; k < kThreads; ++k) serial.push_back(work(k));
  std::vector<std::thread> pool;
  for (int round = 0; round < 3; ++round) {
    pool.clear();
    for (int k = 0; k < kThreads; ++k) pool.emplace_back([&parallel, k] { parallel[k] = work(k); });
    for (auto& th : pool) th.join();
    for (int k = 0; k < kThreads; ++k) {
      INFO("round " << round << ", thread " << k);
      REQUIRE(serial[k].ok);
      REQUIRE(parallel[k].ok);
      CHECK(same(serial[k].z, parallel[k].z));
      CHECK(same(serial[k].back, parallel[k].back));
      CHECK(same(serial[k].fit, parallel[k].fit));
      CHECK(same(serial[k].lwr, parallel[k].lwr));
      CHECK(same(serial[k].upr, parallel[k].upr));
      CHECK(serial[k].spec_text == parallel[k].spec_text);
      CHECK(std::memcmp(&serial[k].lambda, &parallel[k].lambda, sizeof(double)) == 0);
      CHECK(std::memcmp(&serial[k].conf_low, &parallel[k].conf_low, sizeof(double)) == 0);
      CHECK(std::memcmp(&serial[k].conf_high, &parallel[k].conf_high, sizeof(double)) == 0);
      CHECK(parallel[k].bad_status == PWB_ERR_DOMAIN);
      CHECK(serial[k].bad_message == parallel[k].bad_message);
      CHECK_THAT(parallel[k].bad_message, Catch::Matchers::Contains(std::to_string(k + 1)));
    }
  }
  // The workers really differ, so equal results are not equal by accident.
  CHECK_FALSE(same(serial[0].fit, serial[1].fit));
}

TEST_CASE("one transform handle read from 8 threads at once", "[capi][threads]") {
  pwb_transform* t = make_transform(3);
  REQUIRE(t);
  std::vector<double> x(kRows), want(kRows);
  for (size_t i = 0; i < kRows; ++i) x[i] = 0.01 * static_cast<double>(i);
  REQUIRE(pwb_transform_apply(t, x.data(), kRows, want.data()) == PWB_OK);
  std::vector<std::vector<double>> got(kThreads, std::vector<double>(kRows));
  std::vector<int> status(kThreads, -1);
  std::vector<std::thread> pool;
  for (int k = 0; k < kThreads; ++k)
    pool.emplace_back([&, k] {
      for (int rep = 0; rep < 50; ++rep)
        status[k] = pwb_transform_apply(t, x.data(), kRows, got[k].data());
    });
  for (auto& th : pool) th.join();
  for (int k = 0; k < kThreads; ++k) {
    CHECK(status[k] == PWB_OK);
    CHECK(same(got[k], want));
  }
  pwb_transform_free(t);
}
