// Box-Tidwell, step 1: the options and the data checked, zero-weight rows dropped, each variable
// as log(x / geometric mean) (see box_tidwell.hpp).
#include <cmath>
#include <string>

#include "powerback/box_tidwell.hpp"
#include "powerback/errors.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace detail {
namespace {

using Index = Eigen::Index;

std::string var_name(std::size_t j) { return "Box-Tidwell variable " + std::to_string(j); }

// Counts and first indices of the rows (among `rows`) of column `col` failing `bad`.
template <class Bad>
std::size_t find_bad(const double* v, const std::vector<std::size_t>& rows, Bad bad,
                     std::vector<std::size_t>& first) {
  std::size_t count = 0;
  for (std::size_t i : rows)
    if (bad(v[i]) && ++count <= kMaxReportedIndices) first.push_back(i);
  return count;
}

void check_column(const double* v, const std::vector<std::size_t>& rows, const std::string& what,
                  bool positive, const std::string& remedy) {
  std::vector<std::size_t> first;
  std::size_t k = find_bad(v, rows, [](double x) { return !std::isfinite(x); }, first);
  if (k)
    throw IndexedError(ErrorCode::NonFinite,
                       what + " has " + std::to_string(k) + " non-finite values at rows " +
                           format_indices(first, k) + " (0-based): remove or impute them first",
                       k, first);
  if (!positive) return;
  k = find_bad(v, rows, [](double x) { return x <= 0; }, first);
  if (k)
    throw IndexedError(ErrorCode::Domain,
                       what + " must be > 0 but " + std::to_string(k) + " of " +
                           std::to_string(rows.size()) + " values are not, at rows " +
                           format_indices(first, k) + " (0-based): " + remedy,
                       k, first);
}

// The rows with weight > 0 (every row without weights); weights must be finite and >= 0.
std::vector<std::size_t> used_rows(const double* w, std::size_t n) {
  std::vector<std::size_t> all(n);
  for (std::size_t i = 0; i < n; ++i) all[i] = i;
  if (!w) return all;
  check_column(w, all, "the weights", false, "");
  std::vector<std::size_t> first, used;
  const std::size_t k = find_bad(w, all, [](double x) { return x < 0; }, first);
  if (k)
    throw IndexedError(ErrorCode::Domain,
                       "the weights must be >= 0; " + std::to_string(k) + " are negative at rows " +
                           format_indices(first, k) + " (0-based): fix or drop those rows",
                       k, first);
  for (std::size_t i = 0; i < n; ++i)
    if (w[i] > 0) used.push_back(i);
  return used;
}

}  // namespace

BoxTidwellData box_tidwell_data(const double* y, const double* Z, std::size_t n, std::size_t q,
                                const double* X, std::size_t m, const BoxTidwellOptions& opt) {
  require(m > 0, "no Box-Tidwell variables were given");
  require(y != nullptr && X != nullptr && (Z != nullptr || q == 0), "a data pointer is NULL");
  require(opt.max_iter >= 1, "max_iter must be at least 1");
  require(opt.tol > 0 && std::isfinite(opt.tol), "tol must be a positive number");
  require(opt.max_abs_power > 1 && std::isfinite(opt.max_abs_power),
          "max_abs_power must be a number > 1");
  require(opt.level > 0 && opt.level < 1,
          "the confidence level must lie strictly between 0 and 1; got " + format_number(opt.level));
  const std::vector<std::size_t> rows = used_rows(opt.weights, n);
  const std::size_t N = rows.size();
  require(N > 1 + q + 2 * m,
          "Box-Tidwell needs more rows (" + std::to_string(N) + (opt.weights ? " with weight > 0" : "") +
              ") than columns of the augmented fit (" + std::to_string(1 + q + 2 * m) + ")");
  check_column(y, rows, "the response", false, "");
  for (std::size_t j = 0; j < q; ++j)
    check_column(Z + j * n, rows, "other predictor column " + std::to_string(j), false, "");
  BoxTidwellData d;
  d.lx.resize(static_cast<Index>(N), static_cast<Index>(m));
  for (std::size_t j = 0; j < m; ++j) {
    const double* x = X + j * n;
    check_column(x, rows, var_name(j), true,
                 "shift the variable first or leave it out of the powers");
    double mean_log = 0;
    for (std::size_t i : rows) mean_log += std::log(x[i]) / static_cast<double>(N);
    for (std::size_t r = 0; r < N; ++r)
      d.lx(static_cast<Index>(r), static_cast<Index>(j)) = std::log(x[rows[r]]) - mean_log;
  }
  d.z.resize(static_cast<Index>(N), static_cast<Index>(q));
  d.y.resize(static_cast<Index>(N));
  d.sqrt_w.resize(static_cast<Index>(N));
  for (std::size_t r = 0; r < N; ++r) {
    const Index ri = static_cast<Index>(r);
    d.sqrt_w(ri) = opt.weights ? std::sqrt(opt.weights[rows[r]]) : 1.0;
    d.y(ri) = d.sqrt_w(ri) * y[rows[r]];
    for (std::size_t j = 0; j < q; ++j) d.z(ri, static_cast<Index>(j)) = Z[j * n + rows[r]];
  }
  return d;
}

}  // namespace detail
}  // namespace powerback
