#include "powerback/errors.hpp"

#include <cmath>

namespace powerback {

std::string format_indices(const std::vector<std::size_t>& first, std::size_t count,
                           std::size_t base) {
  std::string out;
  for (std::size_t i = 0; i < first.size(); ++i) {
    if (i) out += ", ";
    out += std::to_string(first[i] + base);
  }
  if (count > first.size()) out += ", ...";
  return out;
}

void require_model_weights(const double* w, std::size_t n) {
  std::vector<std::size_t> bad;
  std::size_t count = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (std::isfinite(w[i]) && w[i] >= 0.0) continue;
    if (bad.size() < kMaxReportedIndices) bad.push_back(i);
    ++count;
  }
  if (count)
    throw IndexedError(ErrorCode::Domain,
                       "weights must be finite and >= 0; " + std::to_string(count) +
                           " weights are negative or not finite, at rows " +
                           format_indices(bad, count) + " (0-based): fix or drop those rows",
                       count, bad);
}

}  // namespace powerback
