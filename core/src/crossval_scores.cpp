// Held-out scores in original units (see crossval.hpp).
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"

namespace powerback {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double median_of(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const std::size_t h = v.size() / 2;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(h), v.end());
  const double hi = v[h];
  if (v.size() % 2 == 1) return hi;
  const double lo = *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(h));
  if (std::isinf(hi) && std::isinf(lo)) return hi;  // both unbounded: inf - inf is no width
  return lo + (hi - lo) / 2;
}

void score_points(const double* y, const double* fit, std::size_t n, HoldoutScores& s) {
  double mean = 0;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(fit[i])) {
      ++s.n_point;
      mean += y[i];
    }
  s.n_nonfinite = n - s.n_point;
  if (s.n_point == 0) {
    s.rmse = s.mae = s.r2 = kNaN;
    return;
  }
  const double dn = static_cast<double>(s.n_point);
  mean /= dn;
  double sse = 0, sae = 0, sst = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(fit[i])) continue;
    const double e = y[i] - fit[i];
    sse += e * e;
    sae += std::fabs(e);
    sst += (y[i] - mean) * (y[i] - mean);
  }
  s.rmse = std::sqrt(sse / dn);
  s.mae = sae / dn;
  // a constant held-out response has no variation to explain: R^2 is undefined (NaN)
  s.r2 = sst > 0 ? 1.0 - sse / sst : kNaN;
}

void score_intervals(const double* y, const double* lwr, const double* upr, std::size_t n,
                     HoldoutScores& s) {
  std::vector<double> widths;
  double covered = 0, width = 0, unbounded = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (std::isnan(lwr[i]) || std::isnan(upr[i])) continue;
    ++s.n_interval;
    covered += (lwr[i] <= y[i] && y[i] <= upr[i]) ? 1.0 : 0.0;
    const double w = upr[i] - lwr[i];
    widths.push_back(w);
    width += w;
    if (std::isinf(lwr[i]) || std::isinf(upr[i])) unbounded += 1.0;
  }
  if (s.n_interval == 0) {
    s.coverage = s.mean_width = s.median_width = s.share_unbounded = kNaN;
    return;
  }
  const double dn = static_cast<double>(s.n_interval);
  s.coverage = covered / dn;
  s.mean_width = width / dn;
  s.median_width = median_of(std::move(widths));
  s.share_unbounded = unbounded / dn;
}

}  // namespace

HoldoutScores holdout_scores(const double* y, const double* fit, const double* lwr,
                             const double* upr, std::size_t n) {
  require(n > 0, "there are no held-out rows to score");
  require(y != nullptr && fit != nullptr, "y or fit is NULL");
  require((lwr == nullptr) == (upr == nullptr), "give both interval ends or neither");
  std::vector<std::size_t> bad;
  std::size_t n_bad = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(y[i])) {
      if (bad.size() < kMaxReportedIndices) bad.push_back(i);
      ++n_bad;
    }
  }
  if (n_bad > 0)
    throw IndexedError(ErrorCode::NonFinite,
                       "the held-out response has " + std::to_string(n_bad) +
                           " non-finite values at rows " + format_indices(bad, n_bad) + " (0-based)",
                       n_bad, bad);
  HoldoutScores s;
  s.n = n;
  score_points(y, fit, n, s);
  if (lwr) {
    score_intervals(y, lwr, upr, n, s);
  } else {
    s.coverage = s.mean_width = s.median_width = s.share_unbounded = kNaN;
  }
  return s;
}

}  // namespace powerback
