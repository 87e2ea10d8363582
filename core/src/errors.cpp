#include "powerback/errors.hpp"

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

}  // namespace powerback
