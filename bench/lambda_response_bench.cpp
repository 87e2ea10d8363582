// Response lambda with its interval at n = 1e6, p = 10, against one least-squares fit of the
// same design in this process. Writes the data (raw doubles: y, then X column-major) to the
// file given as argv[1] so that the base-R comparison (lambda_response_byhand.R) uses the same.
//   lambda_response_bench DATAFILE [n] [p]
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <vector>

#include "powerback/lambda.hpp"
#include "powerback/least_squares.hpp"

namespace {
double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}
}  // namespace

int main(int argc, char** argv) {
  const std::size_t n = argc > 2 ? std::strtoull(argv[2], nullptr, 10) : 1000000;
  const std::size_t p = argc > 3 ? std::strtoull(argv[3], nullptr, 10) : 10;
  std::mt19937_64 g(20261202);
  std::normal_distribution<double> nd(0.0, 1.0);
  std::vector<double> X(n * p), y(n);
  for (auto& v : X) v = nd(g);
  for (std::size_t i = 0; i < n; ++i) {
    double eta = 1.0;
    for (std::size_t j = 0; j < p; ++j) eta += 0.1 * static_cast<double>(j % 3) * X[j * n + i];
    y[i] = std::exp(0.5 * (eta + 0.5 * nd(g)));  // log scale is right: lambda-hat near 0
  }
  if (argc > 1) {
    std::FILE* f = std::fopen(argv[1], "wb");
    if (!f) return 1;
    std::fwrite(y.data(), sizeof(double), n, f);
    std::fwrite(X.data(), sizeof(double), n * p, f);
    std::fclose(f);
  }
  // Warm-up (page faults, caches), not timed.
  { const powerback::LeastSquares warm(X.data(), n, p); (void)warm; }

  // Each timing is the fastest of three, interleaved, so that a busy machine disturbs the
  // ratio less (common practice for wall-clock benchmarks).
  double t_fit = 1e300, t_lambda = 1e300, b0 = 0.0;
  powerback::LambdaEstimate e;
  for (int rep = 0; rep < 3; ++rep) {
    auto t0 = std::chrono::steady_clock::now();
    const powerback::LeastSquares ls(X.data(), n, p);
    const Eigen::VectorXd b =
        ls.coefficients(Eigen::Map<const Eigen::VectorXd>(y.data(), static_cast<Eigen::Index>(n)));
    t_fit = std::min(t_fit, seconds_since(t0));
    b0 = b(0);
    t0 = std::chrono::steady_clock::now();
    e = powerback::estimate_response_lambda(y.data(), X.data(), n, p, powerback::Family::BoxCox);
    t_lambda = std::min(t_lambda, seconds_since(t0));
  }

  std::printf("n=%zu p=%zu lambda=%.6f ci=[%.6f, %.6f] converged=%d (b0=%.4f)\n", n, p, e.lambda,
              e.conf_low, e.conf_high, e.converged ? 1 : 0, b0);
  std::printf("one_fit_seconds=%.4f\nresponse_lambda_ci_seconds=%.4f\n", t_fit, t_lambda);
  std::printf("ratio_lambda_over_fit=%.3f\n", t_lambda / t_fit);
  return 0;
}
