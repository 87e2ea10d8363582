// A C++ program of a parent project linking the core target directly: it needs C++17 (from
// the target's usage requirement) and gets the transform's round trip.
#include <cmath>
#include <cstdio>
#include <optional>

#include "powerback/transform.hpp"

int main() {
  powerback::TransformSpec s;
  s.family = powerback::Family::BoxCox;
  s.lambda = 0.5;
  const powerback::Transform t(s);
  const std::optional<double> z = t.apply(9.0);  // (3 - 1) / 0.5 = 4
  if (!z || std::fabs(*z - 4.0) > 1e-12 || std::fabs(t.invert(*z) - 9.0) > 1e-12) {
    std::fprintf(stderr, "core_consumer: wrong round trip\n");
    return 1;
  }
  std::printf("core ok\n");
  return 0;
}
