// Held-out scores in original units (see crossval.hpp).
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <utility>
#include <vector>

#include "powerback/crossval.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double mid_of(double lo, double hi) {
  if (std::isinf(hi) && std::isinf(lo)) return hi;  // both unbounded: inf - inf is no width
  return lo + (hi - lo) / 2;
}

double median_of(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const std::size_t h = v.size() / 2;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(h), v.end());
  const double hi = v[h];
  if (v.size() % 2 == 1) return hi;
  const double lo = *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(h));
  return mid_of(lo, hi);
}

// Weighted median of (value, weight) pairs with positive weights: the first sorted value whose
// cumulative weight passes half the total, or the midpoint of it and the next one when the
// cumulative weight meets half exactly (so unit weights give the ordinary median).
double weighted_median_of(std::vector<std::pair<double, double>> v) {
  if (v.empty()) return kNaN;
  std::sort(v.begin(), v.end());
  double total = 0;
  for (const auto& p : v) total += p.second;
  const double half = total / 2;
  double cum = 0;
  for (std::size_t i = 0; i < v.size(); ++i) {
    cum += v[i].second;
    if (cum == half && i + 1 < v.size()) return mid_of(v[i].first, v[i + 1].first);
    if (cum >= half) return v[i].first;
  }
  return v.back().first;
}

void score_points(const double* y, const double* fit, const double* w, std::size_t n,
                  HoldoutScores& s) {
  double mean = 0, wsum = 0;
  for (std::size_t i = 0; i < n; ++i)
    if (std::isfinite(fit[i])) {
      ++s.n_point;
      const double wi = w ? w[i] : 1.0;
      if (wi == 0) continue;
      mean += wi * y[i];
      wsum += wi;
    }
  s.n_nonfinite = n - s.n_point;
  if (s.n_point == 0 || !(wsum > 0)) {
    s.rmse = s.mae = s.r2 = kNaN;
    return;
  }
  mean /= wsum;
  double sse = 0, sae = 0, sst = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(fit[i])) continue;
    const double wi = w ? w[i] : 1.0;
    if (wi == 0) continue;
    const double e = y[i] - fit[i];
    sse += wi * e * e;
    sae += wi * std::fabs(e);
    sst += wi * (y[i] - mean) * (y[i] - mean);
  }
  s.rmse = std::sqrt(sse / wsum);
  s.mae = sae / wsum;
  // a constant held-out response has no variation to explain: R^2 is undefined (NaN)
  s.r2 = sst > 0 ? 1.0 - sse / sst : kNaN;
}

void score_intervals(const double* y, const double* lwr, const double* upr, const double* w,
                     std::size_t n, HoldoutScores& s) {
  std::vector<double> widths;
  std::vector<std::pair<double, double>> weighted;
  double covered = 0, width = 0, unbounded = 0, wsum = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (std::isnan(lwr[i]) || std::isnan(upr[i])) continue;
    ++s.n_interval;
    const double wi = w ? w[i] : 1.0;
    if (wi == 0) continue;  // no weight: no contribution (and no 0 * Inf)
    wsum += wi;
    covered += (lwr[i] <= y[i] && y[i] <= upr[i]) ? wi : 0.0;
    const double wd = upr[i] - lwr[i];
    if (w) weighted.emplace_back(wd, wi); else widths.push_back(wd);
    width += wi * wd;
    if (std::isinf(lwr[i]) || std::isinf(upr[i])) unbounded += wi;
  }
  if (s.n_interval == 0 || !(wsum > 0)) {
    s.coverage = s.mean_width = s.median_width = s.share_unbounded = kNaN;
    return;
  }
  s.coverage = covered / wsum;
  s.mean_width = width / wsum;
  s.median_width = w ? weighted_median_of(std::move(weighted)) : median_of(std::move(widths));
  s.share_unbounded = unbounded / wsum;
}

// Rows whose weight is not finite (NonFinite) or negative (Domain), named.
void check_weights(const double* w, std::size_t n) {
  std::vector<std::size_t> nonfinite, negative;
  std::size_t n_nonfinite = 0, n_negative = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(w[i])) {
      if (nonfinite.size() < kMaxReportedIndices) nonfinite.push_back(i);
      ++n_nonfinite;
    } else if (w[i] < 0) {
      if (negative.size() < kMaxReportedIndices) negative.push_back(i);
      ++n_negative;
    }
  }
  if (n_nonfinite > 0)
    throw IndexedError(ErrorCode::NonFinite,
                       "the weights have " + std::to_string(n_nonfinite) +
                           " non-finite values at rows " + format_indices(nonfinite, n_nonfinite) +
                           " (0-based): give every row a finite weight >= 0",
                       n_nonfinite, nonfinite);
  if (n_negative > 0)
    throw IndexedError(ErrorCode::Domain,
                       "the weights have " + std::to_string(n_negative) +
                           " negative values at rows " + format_indices(negative, n_negative) +
                           " (0-based): precision weights must be >= 0",
                       n_negative, negative);
}

}  // namespace

HoldoutScores holdout_scores(const double* y, const double* fit, const double* lwr,
                             const double* upr, std::size_t n, const double* w) {
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
  if (w) check_weights(w, n);
  HoldoutScores s;
  s.n = n;
  poll_cancel();  // the scores sort the held-out rows (for medians)
  score_points(y, fit, w, n, s);
  if (lwr) {
    score_intervals(y, lwr, upr, w, n, s);
  } else {
    s.coverage = s.mean_width = s.median_width = s.share_unbounded = kNaN;
  }
  return s;
}

}  // namespace powerback
