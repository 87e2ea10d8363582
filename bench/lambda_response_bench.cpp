// Response lambda with its interval at n = 1e6, p = 10, against one least-squares fit of the
// same design in this process, two ways: LeastSquares (the Householder QR a model fit uses,
// which keeps Q for residuals and leverages; the same work as R's lm.fit) and the cheapest
// full-accuracy fit we have (factor_tall of [1 X y]: the coefficients from R alone). Writes the data (raw doubles: y, then X column-major) to the
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
#include "powerback/tall_qr.hpp"

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
  // [X y] for the Q-less fit, built once outside the timings.
  std::vector<double> Xy(X);
  Xy.insert(Xy.end(), y.begin(), y.end());
  double t_fit = 1e300, t_qless = 1e300, t_lambda = 1e300, b0 = 0.0, b0q = 0.0;
  powerback::LambdaEstimate e;
  for (int rep = 0; rep < 3; ++rep) {
    auto t0 = std::chrono::steady_clock::now();
    const powerback::LeastSquares ls(X.data(), n, p);
    const Eigen::VectorXd b =
        ls.coefficients(Eigen::Map<const Eigen::VectorXd>(y.data(), static_cast<Eigen::Index>(n)));
    t_fit = std::min(t_fit, seconds_since(t0));
    b0 = b(0);
    t0 = std::chrono::steady_clock::now();
    {
      // R of [1 X y] = [R11 r; 0 rho]: b = R11^{-1} r, and |rho| is the residual norm.
      const powerback::TallFactor f = powerback::factor_tall(Xy.data(), n, p + 1);
      const Eigen::Index k = static_cast<Eigen::Index>(p + 1);
      const Eigen::VectorXd bq =
          f.r.topLeftCorner(k, k).triangularView<Eigen::Upper>().solve(f.r.col(k).head(k));
      t_qless = std::min(t_qless, seconds_since(t0));
      b0q = bq(0);
    }
    t0 = std::chrono::steady_clock::now();
    e = powerback::estimate_response_lambda(y.data(), X.data(), n, p, powerback::Family::BoxCox);
    t_lambda = std::min(t_lambda, seconds_since(t0));
  }

  std::printf("n=%zu p=%zu lambda=%.6f ci=[%.6f, %.6f] converged=%d (b0=%.4f, Q-less %.4f)\n", n, p,
              e.lambda, e.conf_low, e.conf_high, e.converged ? 1 : 0, b0, b0q);
  std::printf("one_fit_seconds=%.4f\nqless_fit_seconds=%.4f\nresponse_lambda_ci_seconds=%.4f\n",
              t_fit, t_qless, t_lambda);
  std::printf("ratio_lambda_over_fit=%.3f\nratio_lambda_over_qless_fit=%.3f\n", t_lambda / t_fit,
              t_lambda / t_qless);
  return 0;
}
