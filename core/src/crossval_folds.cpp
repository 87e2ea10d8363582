// Reproducible repeated k-fold assignment (see crossval.hpp).
#include <algorithm>
#include <limits>
#include <numeric>
#include <random>
#include <string>

#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"

namespace powerback {

namespace {

// Uniform integer in [0, bound) by rejection of the biased top of the 64-bit range.
std::uint64_t uniform_below(std::mt19937_64& gen, std::uint64_t bound) {
  const std::uint64_t limit = std::numeric_limits<std::uint64_t>::max() -
                              std::numeric_limits<std::uint64_t>::max() % bound;
  std::uint64_t v;
  do v = gen(); while (v >= limit);
  return v % bound;
}

}  // namespace

std::vector<int> make_folds(std::size_t n, int k, int repeats, std::uint64_t seed) {
  require(k >= 2, "folds must be at least 2; got " + std::to_string(k));
  require(repeats >= 1, "repeats must be at least 1; got " + std::to_string(repeats));
  require(n >= static_cast<std::size_t>(k),
          "there are fewer rows (" + std::to_string(n) + ") than folds (" + std::to_string(k) +
              "): use fewer folds");
  std::vector<int> fold(n * static_cast<std::size_t>(repeats));
  std::vector<std::size_t> order(n);
  for (int r = 0; r < repeats; ++r) {
    // one stream per repeat, so repeat r does not depend on how many draws earlier ones made
    std::seed_seq seq{static_cast<std::uint32_t>(seed), static_cast<std::uint32_t>(seed >> 32),
                      static_cast<std::uint32_t>(r)};
    std::mt19937_64 gen(seq);
    std::iota(order.begin(), order.end(), std::size_t{0});
    for (std::size_t i = n; i > 1; --i) std::swap(order[i - 1], order[uniform_below(gen, i)]);
    for (std::size_t j = 0; j < n; ++j)
      fold[static_cast<std::size_t>(r) * n + order[j]] = static_cast<int>(j % static_cast<std::size_t>(k)) + 1;
  }
  return fold;
}

}  // namespace powerback
