// Small helpers shared by the Catch2 tests of the core and the C ABI.
#pragma once

#include <cstddef>
#include <cstring>
#include <sstream>
#include <string>
#include <vector>

namespace pwbtest {

// The numbers of a whitespace-separated fixture cell ("1.5 2 3e-4").
inline std::vector<double> parse_values(const std::string& text) {
  std::vector<double> v;
  std::stringstream ss(text);
  std::string tok;
  while (ss >> tok) v.push_back(std::stod(tok));
  return v;
}

// n evenly spaced quantiles of a distribution: a smooth sample with the distribution's shape.
// Dist is a Boost.Math distribution; its quantile() is found by argument-dependent lookup.
template <class Dist>
std::vector<double> quantiles(const Dist& d, std::size_t n) {
  std::vector<double> x(n);
  for (std::size_t i = 0; i < n; ++i)
    x[i] = quantile(d, (static_cast<double>(i) + 0.5) / static_cast<double>(n));
  return x;
}

// True when a and b are the same double bit for bit (distinguishes -0 and NaN payloads).
inline bool same_bits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

}  // namespace pwbtest

// For the tests of the core (the C ABI tests do not see the core's headers).
#if defined(__has_include)
#if __has_include("powerback/transform.hpp")
#include "powerback/transform.hpp"

namespace pwbtest {

// A transform from its constants; Error(Argument) for an invalid spec, as Transform's own.
inline powerback::Transform make(powerback::Family f, double lambda = powerback::math::kNaN,
                                 double shift = 0.0, bool reflect = false,
                                 double pivot = powerback::math::kNaN) {
  powerback::TransformSpec s;
  s.family = f;
  s.lambda = lambda;
  s.shift = shift;
  s.reflect = reflect;
  s.pivot = pivot;
  return powerback::Transform(s);
}

}  // namespace pwbtest
#endif
#endif
