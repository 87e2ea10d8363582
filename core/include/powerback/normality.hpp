// powerback/normality.hpp — normality statistics of one sample: Shapiro-Wilk W with its p-value,
// and the sample skewness and excess kurtosis with their standard errors.
//
// References
//   Royston, P. (1992). Approximating the Shapiro-Wilk W-test for non-normality. Statistics and
//     Computing 2, 117-119 (the coefficient and p-value approximations).
//   Royston, P. (1995). Remark AS R94: A remark on Algorithm AS 181: The W-test for normality.
//     Applied Statistics 44, 547-551 (the algorithm, valid for 3 <= n <= 5000).
//   Joanes, D. N. & Gill, C. A. (1998). Comparing measures of sample skewness and kurtosis.
//     The Statistician 47, 183-189 (G1, G2 and their standard errors).
#pragma once

#include <cstddef>
#include <string>

namespace powerback {

// Why a Shapiro-Wilk test was not computed.
enum class NormalitySkip { None = 0, TooFew, TooMany, Constant, Overflow };

// The fixed text for a skip reason ("" for None); a static string.
const char* normality_skip_text(NormalitySkip why) noexcept;

struct ShapiroWilk {
  double w = 0.0;           // NaN when not computed
  double p_value = 0.0;     // NaN when not computed
  std::size_t n = 0;
  bool computed = false;    // false outside 3..5000 values or for a constant sample
  std::string note;         // why not computed ("" when computed)
  NormalitySkip skip = NormalitySkip::None;
};

// Shapiro-Wilk W and its p-value by Royston's algorithm (AS R94) for 3 <= n <= 5000; outside
// that range, or when every value is the same, computed = false with a note, never a made-up
// value. x need not be sorted. Throws IndexedError(NonFinite) naming the elements when any x is
// NaN or infinite (remove missing values first).
ShapiroWilk shapiro_wilk(const double* x, std::size_t n);

struct Moments {
  std::size_t n = 0;
  double mean = 0.0, sd = 0.0;  // sd with divisor n - 1
  double skewness = 0.0;        // adjusted Fisher-Pearson G1; NaN when n < 3 or constant
  double skewness_se = 0.0;     // sqrt(6n(n-1) / ((n-2)(n+1)(n+3)))
  double skewness_z = 0.0;      // G1 / SE
  double kurtosis = 0.0;        // excess kurtosis G2; NaN when n < 4 or constant
  double kurtosis_se = 0.0;     // sqrt(24n(n-1)^2 / ((n-3)(n-2)(n+3)(n+5)))
  double kurtosis_z = 0.0;      // G2 / SE
};

// Sample moments with the small-sample adjustments above. Throws IndexedError(NonFinite) for NaN
// or infinite values; n = 0 gives all-NaN statistics.
Moments sample_moments(const double* x, std::size_t n);

namespace detail {
// Throws IndexedError(NonFinite) naming `what` and the first NaN or infinite elements of x.
void require_finite_sample(const double* x, std::size_t n, const char* what);
}  // namespace detail

}  // namespace powerback
