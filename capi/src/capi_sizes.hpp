// Checked size arithmetic for the C ABI: array lengths from callers (n rows times p columns,
// element counts times sizeof) must not wrap around before an allocation or a loop bound.
#pragma once

#include <cstddef>
#include <limits>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {
namespace capi {

// a * b, or Error(Memory) naming what is being sized when the product does not fit in size_t.
inline std::size_t checked_mul(std::size_t a, std::size_t b, const char* what) {
  if (a != 0 && b > std::numeric_limits<std::size_t>::max() / a)
    throw Error(ErrorCode::Memory, std::string(what) + ": " + std::to_string(a) + " x " +
                                       std::to_string(b) + " overflows the size type");
  return a * b;
}

// The element count of an n-by-p array that also fits in bytes of doubles: n * p, and
// n * p * sizeof(double) without wrapping. Error(Memory) otherwise.
inline std::size_t checked_matrix_size(std::size_t n, std::size_t p, const char* what) {
  const std::size_t count = checked_mul(n, p, what);
  (void)checked_mul(count, sizeof(double), what);
  return count;
}

}  // namespace capi
}  // namespace powerback
