// Chunked lambda summaries at scale: rows generated chunk by chunk (never all in memory), each
// worker (a thread with its own summary) takes every k-th chunk, the summaries are merged and
// finished. Reports the time of a pass that only generates the data, of the summary pass with 1
// and with 2 workers, and the peak resident memory.
//   chunked_summary_bench [rows = 1e8] [chunk rows = 1e6] [predictors = 10] [fit]
// With "fit" it times, instead, the fit summary and its check pass (one worker each, at the
// square-root transform), against the same generate-only pass.
#include <sys/resource.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include "powerback/accumulate.hpp"

using namespace powerback;

namespace {

struct Config {
  std::size_t rows = 100000000, chunk = 1000000, p = 10;
  std::size_t chunks() const { return (rows + chunk - 1) / chunk; }
};

// Chunk k's rows, the same whoever generates them: y = (3 + x'b + 0.5 e)^2 (true lambda 1/2).
void generate(const Config& c, std::size_t k, std::vector<double>& y, std::vector<double>& X, std::size_t* rows) {
  const std::size_t r0 = k * c.chunk, n = std::min(c.chunk, c.rows - r0);
  *rows = n;
  std::mt19937_64 g(1000003u * (k + 1));
  std::normal_distribution<double> nd(0.0, 1.0);
  y.resize(c.chunk);
  X.resize(c.chunk * c.p);
  for (std::size_t j = 0; j < c.p; ++j)
    for (std::size_t i = 0; i < n; ++i) X[j * c.chunk + i] = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    double eta = 3.0;
    for (std::size_t j = 0; j < c.p; ++j) eta += 0.05 * X[j * c.chunk + i];
    const double s = eta + 0.5 * nd(g);
    y[i] = s * s;
  }
}

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

// CPU seconds of the process so far (every thread): on a shared machine the wall clock also
// counts other programs' time, the CPU time does not.
double cpu_seconds() {
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  return ru.ru_utime.tv_sec + ru.ru_stime.tv_sec + 1e-6 * (ru.ru_utime.tv_usec + ru.ru_stime.tv_usec);
}

// workers == 0: generate only (one worker), touching the data so nothing is optimised away.
double run(const Config& c, unsigned workers, SummaryLambdaResult* out) {
  const auto t0 = std::chrono::steady_clock::now();
  const double cpu0 = cpu_seconds();
  const unsigned w = workers == 0 ? 1 : workers;
  std::vector<LambdaSummary> parts(w, LambdaSummary(Family::BoxCox, c.p));
  std::vector<double> touched(w, 0.0);
  std::vector<std::thread> threads;
  for (unsigned t = 0; t < w; ++t)
    threads.emplace_back([&, t] {
      std::vector<double> y, X;
      for (std::size_t k = t; k < c.chunks(); k += w) {
        std::size_t n = 0;
        generate(c, k, y, X, &n);
        if (workers == 0) touched[t] += y[n / 2] + X[n / 3];
        else parts[t].add(y.data(), X.data(), n, c.chunk, nullptr);
      }
    });
  for (auto& th : threads) th.join();
  if (workers == 0) {
    std::printf("  (checksum %g) CPU %.2f s\n", touched[0], cpu_seconds() - cpu0);
    return seconds_since(t0);
  }
  for (unsigned t = 1; t < w; ++t) parts[0].merge(parts[t]);
  *out = parts[0].finish(LambdaOptions());
  std::printf("  state: %zu bins, %zu bytes serialised; CPU %.2f s\n", parts[0].bins(),
              parts[0].serialize().size(), cpu_seconds() - cpu0);
  return seconds_since(t0);
}

// The fit summary pass, then the check pass over the same chunks (one worker).
void run_fit(const Config& c, double gen) {
  TransformSpec sp;
  sp.family = Family::Sqrt;
  const Transform t(sp);
  std::vector<double> y, X;
  std::size_t n = 0;
  auto t0 = std::chrono::steady_clock::now();
  double cpu0 = cpu_seconds();
  FitSummary fs(t, c.p);
  for (std::size_t k = 0; k < c.chunks(); ++k) {
    generate(c, k, y, X, &n);
    fs.add(y.data(), X.data(), n, c.chunk, nullptr);
  }
  const SummaryFit f = fs.finish();
  const double fit_wall = seconds_since(t0), fit_cpu = cpu_seconds() - cpu0;
  t0 = std::chrono::steady_clock::now();
  cpu0 = cpu_seconds();
  FitCheckPass cp(fs);
  for (std::size_t k = 0; k < c.chunks(); ++k) {
    generate(c, k, y, X, &n);
    cp.add(y.data(), X.data(), n, c.chunk, nullptr);
  }
  const SummaryChecks ck = cp.finish();
  const double chk_wall = seconds_since(t0), chk_cpu = cpu_seconds() - cpu0;
  std::printf("fit summary: %.2f s wall, CPU %.2f s (ratio to generating %.2f); sigma %.6f\n", fit_wall, fit_cpu,
              fit_wall / gen, f.sigma);
  std::printf("check pass: %.2f s wall, CPU %.2f s (ratio to generating %.2f); BP p %.3f, %zu bytes\n", chk_wall,
              chk_cpu, chk_wall / gen, ck.bp_p, cp.serialize().size());
}

}  // namespace

int main(int argc, char** argv) {
  Config c;
  if (argc > 1) c.rows = static_cast<std::size_t>(std::atof(argv[1]));
  if (argc > 2) c.chunk = static_cast<std::size_t>(std::atof(argv[2]));
  if (argc > 3) c.p = static_cast<std::size_t>(std::atof(argv[3]));
  std::printf("rows %zu, chunk %zu rows, %zu predictors, %zu chunks\n", c.rows, c.chunk, c.p, c.chunks());
  SummaryLambdaResult r1, r2;
  const double gen = run(c, 0, nullptr);
  std::printf("generate only, 1 worker: %.2f s (%.1f ns/row)\n", gen, 1e9 * gen / c.rows);
  if (argc > 4 && std::string(argv[4]) == "fit") {
    run_fit(c, gen);
    return 0;
  }
  const double one = run(c, 1, &r1);
  std::printf("summary, 1 worker: %.2f s (%.1f ns/row), ratio to generating: %.2f\n", one, 1e9 * one / c.rows,
              one / gen);
  const double two = run(c, 2, &r2);
  std::printf("summary, 2 workers: %.2f s, speed-up over 1 worker: %.2f\n", two, one / two);
  std::printf("lambda-hat %.10f [%.10f, %.10f] (1 worker); 2 workers differ by %.2e, ends by %.2e / %.2e\n",
              r1.estimate.lambda, r1.estimate.conf_low, r1.estimate.conf_high,
              std::fabs(r1.estimate.lambda - r2.estimate.lambda),
              std::fabs(r1.estimate.conf_low - r2.estimate.conf_low),
              std::fabs(r1.estimate.conf_high - r2.estimate.conf_high));
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  std::printf("peak resident memory: %.1f MB\n", ru.ru_maxrss / 1024.0);
  return 0;
}
