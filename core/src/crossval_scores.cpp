// Held-out scores in original units (see crossval.hpp).
#include <cmath>
#include <limits>
#include <string>

#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"

namespace powerback {

HoldoutScores holdout_scores(const double* y, const double* fit, const double* lwr,
                             const double* upr, std::size_t n) {
  require(n > 0, "there are no held-out rows to score");
  require(y != nullptr && fit != nullptr, "y or fit is NULL");
  require((lwr == nullptr) == (upr == nullptr), "give both interval ends or neither");
  std::vector<std::size_t> bad;
  std::size_t n_bad = 0;
  double mean = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(y[i])) {
      if (bad.size() < kMaxReportedIndices) bad.push_back(i);
      ++n_bad;
    }
    mean += y[i] / static_cast<double>(n);
  }
  if (n_bad > 0)
    throw IndexedError(ErrorCode::NonFinite,
                       "the held-out response has " + std::to_string(n_bad) +
                           " non-finite values at rows " + format_indices(bad, n_bad) + " (0-based)",
                       n_bad, bad);
  HoldoutScores s;
  s.n = n;
  double sse = 0, sae = 0, sst = 0, covered = 0, width = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double e = y[i] - fit[i];
    sse += e * e;
    sae += std::fabs(e);
    sst += (y[i] - mean) * (y[i] - mean);
    bool finite = std::isfinite(fit[i]);
    if (lwr) {
      finite = finite && std::isfinite(lwr[i]) && std::isfinite(upr[i]);
      covered += (lwr[i] <= y[i] && y[i] <= upr[i]) ? 1.0 : 0.0;
      width += upr[i] - lwr[i];
    }
    if (!finite) ++s.n_nonfinite;
  }
  const double dn = static_cast<double>(n);
  s.rmse = std::sqrt(sse / dn);
  s.mae = sae / dn;
  // a constant held-out response has no variation to explain: R^2 is undefined (NaN)
  s.r2 = sst > 0 ? 1.0 - sse / sst : std::numeric_limits<double>::quiet_NaN();
  s.coverage = lwr ? covered / dn : std::numeric_limits<double>::quiet_NaN();
  s.mean_width = lwr ? width / dn : std::numeric_limits<double>::quiet_NaN();
  return s;
}

}  // namespace powerback
