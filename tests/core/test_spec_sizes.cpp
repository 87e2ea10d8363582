// The checked size arithmetic of the C ABI (capi/src/capi_sizes.hpp): n * p must not wrap.
#include <catch2/catch.hpp>

#include <cstdint>
#include <limits>

#include "../capi/src/capi_sizes.hpp"

using namespace powerback;

TEST_CASE("checked_mul and checked_matrix_size refuse products that wrap", "[spec][sizes]") {
  constexpr std::size_t kMax = std::numeric_limits<std::size_t>::max();
  CHECK(capi::checked_mul(0, kMax, "X") == 0);
  CHECK(capi::checked_mul(kMax, 1, "X") == kMax);
  CHECK(capi::checked_mul(3, 7, "X") == 21);
  // 2^32 * 2^32 is 2^64, one past the largest 64-bit size (or far past a 32-bit one).
  const std::size_t big = std::size_t(1) << (sizeof(std::size_t) * 4);
  CHECK_THROWS_WITH(capi::checked_mul(big, big, "X (n x p)"),
                    Catch::Matchers::Contains("X (n x p)") && Catch::Matchers::Contains("overflows"));
  try {
    capi::checked_mul(kMax / 2 + 1, 2, "X");
    FAIL("no error");
  } catch (const Error& e) {
    CHECK(e.code() == ErrorCode::Memory);
  }
  // Fits as a count but not as bytes of doubles.
  CHECK(capi::checked_matrix_size(1000, 2000, "X") == 2000000);
  CHECK_THROWS_AS(capi::checked_matrix_size(kMax / 8 + 1, 1, "X"), Error);
  CHECK_THROWS_AS(capi::checked_matrix_size(kMax / 4, 4, "X"), Error);
}
