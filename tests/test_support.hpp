// Small helpers shared by the Catch2 tests of the core and the C ABI.
#pragma once

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

// True when a and b are the same double bit for bit (distinguishes -0 and NaN payloads).
inline bool same_bits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

}  // namespace pwbtest
