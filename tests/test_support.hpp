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
