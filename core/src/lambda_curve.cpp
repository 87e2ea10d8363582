// Profile curves of lambda for plotting: grids and log-likelihood values along them.
#include <algorithm>
#include <cmath>

#include "powerback/errors.hpp"
#include "powerback/transform.hpp"
#include "lambda_internal.hpp"

namespace powerback {
namespace {

std::vector<double> along(const detail::LambdaProfile& prof, const double* grid, std::size_t m) {
  require(grid != nullptr || m == 0, "the lambda grid is NULL");
  std::vector<double> out(m);
  for (std::size_t i = 0; i < m; ++i)
    require(std::isfinite(grid[i]) && std::fabs(grid[i]) <= kMaxLambdaMagnitude,
            "the lambda grid has a value that is not finite or beyond +-" +
                format_number(kMaxLambdaMagnitude) + " at index " + std::to_string(i) +
                " (0-based)");
  prof.loglik_batch(grid, m, out.data());
  return out;
}

}  // namespace

std::vector<double> lambda_profile(const double* x, std::size_t n, Family family,
                                   const double* grid, std::size_t m) {
  return lambda_profile(x, n, family, nullptr, grid, m);
}

std::vector<double> lambda_profile(const double* x, std::size_t n, Family family,
                                   const double* weights, const double* grid, std::size_t m) {
  const detail::LambdaProfile prof(x, n, family, "x", weights);
  return along(prof, grid, m);
}

std::vector<double> response_lambda_profile(const double* y, const LeastSquares& design,
                                            Family family, const double* grid, std::size_t m) {
  const detail::LambdaProfile prof(y, design, family, "y");
  return along(prof, grid, m);
}

std::vector<double> response_lambda_profile(const double* y, const double* X, std::size_t n,
                                            std::size_t p, Family family, const double* grid,
                                            std::size_t m) {
  return response_lambda_profile(y, X, n, p, family, nullptr, grid, m);
}

std::vector<double> response_lambda_profile(const double* y, const double* X, std::size_t n,
                                            std::size_t p, Family family, const double* weights,
                                            const double* grid, std::size_t m) {
  const detail::LambdaProfile prof(y, X, n, p, family, "y", weights);
  return along(prof, grid, m);
}

std::vector<double> profile_grid(const LambdaEstimate& est, std::size_t m) {
  require(m >= 2, "a profile grid needs at least 2 points");
  require(std::isfinite(est.conf_low) && std::isfinite(est.conf_high) && est.lower < est.upper,
          "the estimate has no finite interval to draw a grid around");
  // 1.5 interval widths on each side (at least 0.1): the interval fills about a quarter of the
  // plot, so its cut line stays visible however narrow it is.
  const double margin = std::max(0.1, 1.5 * (est.conf_high - est.conf_low));
  const double lo = std::max(est.lower, std::min(est.conf_low, est.lambda) - margin);
  const double hi = std::min(est.upper, std::max(est.conf_high, est.lambda) + margin);
  std::vector<double> g(m);
  for (std::size_t i = 0; i < m; ++i)
    g[i] = lo + (hi - lo) * static_cast<double>(i) / static_cast<double>(m - 1);
  g[m - 1] = hi;
  return g;
}

}  // namespace powerback
