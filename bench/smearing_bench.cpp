// The smearing mean at n_new = n_train (default 1e6 each): build from the training residuals
// plus one query per new row, for the log family (closed form) and for families answered by the
// residual tree (Box-Cox 0.25, Yeo-Johnson 0.5, sqrt), against the pairwise mean timed on the
// first 100 new rows and scaled to all rows (it costs n_train per row). The fast path's time is
// given as wall-clock and as this process's CPU time (on a shared machine the first inflates
// with the load; the second much less).
//   smearing_bench [n]
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <random>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/smearing.hpp"

using namespace powerback;
using Clock = std::chrono::steady_clock;

namespace {
double secs(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

// Training residuals and new-row fits of a straight-line fit of T(y) on x, y lognormal in x.
void simulate(const Transform& t, std::size_t n, std::vector<double>* e, std::vector<double>* mu) {
  std::mt19937_64 g(20261203);
  std::uniform_real_distribution<double> ux(0.0, 1.0);
  std::normal_distribution<double> ne(0.0, 0.5);
  std::vector<double> x(n), z(n);
  double sx = 0, sz = 0;
  for (std::size_t i = 0; i < n; ++i) {
    x[i] = ux(g);
    z[i] = t.apply(std::exp(1.0 + 2.0 * x[i] + ne(g)));
    sx += x[i];
    sz += z[i];
  }
  const double mx = sx / n, mz = sz / n;
  double sxx = 0, sxz = 0;
  for (std::size_t i = 0; i < n; ++i) {
    sxx += (x[i] - mx) * (x[i] - mx);
    sxz += (x[i] - mx) * (z[i] - mz);
  }
  const double b = sxz / sxx, a = mz - b * mx;
  e->resize(n);
  mu->resize(n);
  for (std::size_t i = 0; i < n; ++i) (*e)[i] = z[i] - a - b * x[i];
  for (std::size_t i = 0; i < n; ++i) (*mu)[i] = a + b * ux(g);
}

void run(const char* name, const Transform& t, std::size_t n) {
  std::vector<double> e, mu;
  simulate(t, n, &e, &mu);
  double best = 1e300, best_cpu = 1e300, check = 0;
  std::size_t bounded = 0;
  for (int rep = 0; rep < 2; ++rep) {  // the faster of two runs
    const std::clock_t c0 = std::clock();
    const auto t0 = Clock::now();
    const Smearing sm(t, e.data(), n);
    double s = 0;
    std::size_t nb = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const BackValue v = sm.mean(mu[i]);
      s += v.value;
      nb += v.bounded;
    }
    best = std::min(best, secs(t0));
    best_cpu = std::min(best_cpu, static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC);
    check = s;
    bounded = nb;
  }
  const std::size_t probe = std::min<std::size_t>(100, n);
  const auto t1 = Clock::now();
  double s2 = 0;
  for (std::size_t i = 0; i < probe; ++i) s2 += smearing_mean(t, mu[i], e.data(), n).value;
  const double pair = secs(t1) * static_cast<double>(n) / static_cast<double>(probe);
  std::printf("%s n=%zu fast_seconds=%.3f fast_cpu_seconds=%.3f pairwise_seconds_scaled=%.1f ratio=%.0f "
              "bounded_rows=%zu mean_of_means=%.6g check=%.3g\n",
              name, n, best, best_cpu, pair, pair / best, bounded, check / n, s2);
}
}  // namespace

int main(int argc, char** argv) {
  const std::size_t n = argc > 1 ? std::strtoull(argv[1], nullptr, 10) : 1000000;
  auto make = [](Family f, double l) {
    TransformSpec s;
    s.family = f;
    s.lambda = l;
    return Transform(s);
  };
  run("log", make(Family::Log, math::kNaN), n);
  run("box-cox(0.25)", make(Family::BoxCox, 0.25), n);
  run("yeo-johnson(0.5)", make(Family::YeoJohnson, 0.5), n);
  run("sqrt", make(Family::Sqrt, math::kNaN), n);
  return 0;
}
