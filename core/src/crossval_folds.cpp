// Reproducible repeated k-fold assignment, plain, stratified or grouped (see crossval.hpp).
#include <algorithm>
#include <limits>
#include <map>
#include <numeric>
#include <random>
#include <string>

#include "powerback/crossval.hpp"
#include "powerback/cancel.hpp"
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

// One stream per repeat, so repeat r does not depend on how many draws earlier ones made.
std::mt19937_64 repeat_stream(std::uint64_t seed, int r) {
  std::seed_seq seq{static_cast<std::uint32_t>(seed), static_cast<std::uint32_t>(seed >> 32),
                    static_cast<std::uint32_t>(r)};
  return std::mt19937_64(seq);
}

template <class T>
void shuffle(std::vector<T>& v, std::mt19937_64& gen) {
  for (std::size_t i = v.size(); i > 1; --i) std::swap(v[i - 1], v[uniform_below(gen, i)]);
}

void check_args(std::size_t n, int k, int repeats) {
  require(k >= 2, "folds must be at least 2; got " + std::to_string(k));
  require(repeats >= 1, "repeats must be at least 1; got " + std::to_string(repeats));
  require(n >= static_cast<std::size_t>(k),
          "there are fewer rows (" + std::to_string(n) + ") than folds (" + std::to_string(k) +
              "): use fewer folds");
}

void check_codes(const int* codes, std::size_t n, const char* what) {
  for (std::size_t i = 0; i < n; ++i)
    require(codes[i] >= 0, std::string(what) + " codes must be >= 0; row " + std::to_string(i) +
                               " (0-based) has " + std::to_string(codes[i]));
}

// Deals the rows of one repeat in the given order to folds 1..k in turn.
void deal(const std::vector<std::size_t>& order, int k, int* fold) {
  for (std::size_t j = 0; j < order.size(); ++j)
    fold[order[j]] = static_cast<int>(j % static_cast<std::size_t>(k)) + 1;
}

void grouped_repeat(std::size_t n, int k, const int* groups, std::mt19937_64& gen, int* fold) {
  std::map<int, std::vector<std::size_t>> rows_of;
  for (std::size_t i = 0; i < n; ++i) rows_of[groups[i]].push_back(i);
  std::vector<const std::vector<std::size_t>*> order;
  order.reserve(rows_of.size());
  for (const auto& g : rows_of) order.push_back(&g.second);
  shuffle(order, gen);
  std::vector<std::size_t> size(static_cast<std::size_t>(k), 0);
  for (const auto* rows : order) {
    const auto f = static_cast<std::size_t>(std::min_element(size.begin(), size.end()) - size.begin());
    size[f] += rows->size();
    for (std::size_t i : *rows) fold[i] = static_cast<int>(f) + 1;
  }
}

}  // namespace

std::vector<int> make_folds(std::size_t n, int k, int repeats, std::uint64_t seed) {
  return make_folds_by(n, k, repeats, seed, nullptr, nullptr);
}

std::vector<int> make_folds_by(std::size_t n, int k, int repeats, std::uint64_t seed,
                               const int* strata, const int* groups) {
  check_args(n, k, repeats);
  require(strata == nullptr || groups == nullptr,
          "give strata or groups, not both: grouped folds keep each group whole");
  if (strata) check_codes(strata, n, "stratum");
  if (groups) {
    check_codes(groups, n, "group");
    std::vector<int> g(groups, groups + n);
    std::sort(g.begin(), g.end());
    const auto n_groups = static_cast<std::size_t>(std::unique(g.begin(), g.end()) - g.begin());
    require(n_groups >= static_cast<std::size_t>(k),
            "there are fewer groups (" + std::to_string(n_groups) + ") than folds (" +
                std::to_string(k) + "): use fewer folds");
  }
  std::vector<int> fold(n * static_cast<std::size_t>(repeats));
  std::vector<std::size_t> order(n);
  for (int r = 0; r < repeats; ++r) {
    poll_cancel();  // each repeat shuffles (and may sort) all n rows
    std::mt19937_64 gen = repeat_stream(seed, r);
    int* out = fold.data() + static_cast<std::size_t>(r) * n;
    if (groups) {
      grouped_repeat(n, k, groups, gen, out);
      continue;
    }
    std::iota(order.begin(), order.end(), std::size_t{0});
    shuffle(order, gen);
    if (strata)
      std::stable_sort(order.begin(), order.end(),
                       [strata](std::size_t a, std::size_t b) { return strata[a] < strata[b]; });
    deal(order, k, out);
  }
  return fold;
}

}  // namespace powerback
