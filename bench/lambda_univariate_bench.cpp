// Univariate Box-Cox lambda with its 95% interval at n = 1e7. Writes the sample (raw doubles)
// to argv[1] so that the scipy comparison (lambda_univariate_scipy.py) uses the same data.
//   lambda_univariate_bench DATAFILE [n]
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <vector>

#include "powerback/lambda.hpp"

int main(int argc, char** argv) {
  const std::size_t n = argc > 2 ? std::strtoull(argv[2], nullptr, 10) : 10000000;
  std::mt19937_64 g(20261202);
  std::gamma_distribution<double> gd(2.0, 3.0);  // right-skewed, lambda-hat near 0.25
  std::vector<double> x(n);
  for (auto& v : x) v = gd(g);
  if (argc > 1) {
    std::FILE* f = std::fopen(argv[1], "wb");
    if (!f) return 1;
    std::fwrite(x.data(), sizeof(double), n, f);
    std::fclose(f);
  }
  // The fastest of three runs, so that a busy machine disturbs the figure less.
  double t = 1e300;
  powerback::LambdaEstimate e;
  for (int rep = 0; rep < 3; ++rep) {
    const auto t0 = std::chrono::steady_clock::now();
    e = powerback::estimate_lambda(x.data(), n, powerback::Family::BoxCox);
    t = std::min(t, std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
  }
  std::printf("n=%zu lambda=%.8f ci=[%.8f, %.8f] converged=%d\n", n, e.lambda, e.conf_low,
              e.conf_high, e.converged ? 1 : 0);
  std::printf("univariate_lambda_ci_seconds=%.4f\n", t);
  return 0;
}
