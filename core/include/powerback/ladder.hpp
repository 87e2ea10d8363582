// powerback/ladder.hpp — the rule-based ladder of powers for one skewed variable.
//
// The rule (applied multivariate statistics practice, as set out in Tabachnick, B. G. & Fidell,
// L. S., Using Multivariate Statistics, the chapter on screening data):
//   1. Is the variable skewed?  n < 300: when |z| = |G1 / SE(G1)| > 3.29 (the conservative
//      two-sided p < .001 cut that textbook gives for small and medium samples). n >= 300: z
//      grows with n, so judge by the size of the skewness instead: |G1| > 0.5 (common practice;
//      the 0.5 band for "moderately skewed" is a widely used rule of thumb). The switch at 300 is
//      common practice; there the z rule's cut is |G1| = 3.29 * SE(G1) = 0.46, so the two rules
//      nearly meet.
//   2. How severe?  By |G1| (common practice; the textbook names the steps but pins no numbers):
//      moderate (|G1| <= 1) -> square root; substantial (1 < |G1| <= 2) -> log10;
//      severe (|G1| > 2) -> reciprocal.
//   3. Negative skew: reflect about pivot = max + 1 first, so the reflected values start at 1.
//      Otherwise shift so the minimum becomes 1 when the minimum is <= 0 (sqrt, log10 and
//      reciprocal all need v > 0).
// Our reciprocal is -1/v, which is increasing, so the ladder never needs a second reflection to
// undo an order flip: a reflected variable keeps the reversed order the reflection gave it, and
// an unreflected one keeps its own order.
//
// The returned spec stores pivot and shift, so new data get exactly the same transform.
#pragma once

#include <cstddef>
#include <string>

#include "powerback/normality.hpp"
#include "powerback/transform.hpp"

namespace powerback {

enum class LadderStep { None = 0, Sqrt, Log10, Reciprocal };

// The rule's constants, documented above.
struct LadderRule {
  static constexpr std::size_t kLargeN = 300;   // from here on judge by |G1|, not by z
  static constexpr double kZCut = 3.29;         // |z| above this is skewed (n < kLargeN)
  static constexpr double kSizeCut = 0.5;       // |G1| above this is skewed (n >= kLargeN)
  static constexpr double kLog10Cut = 1.0;      // |G1| above this: log10 instead of sqrt
  static constexpr double kReciprocalCut = 2.0; // |G1| above this: reciprocal instead of log10
};

struct LadderAdvice {
  TransformSpec spec;               // identity when no step is needed
  LadderStep step = LadderStep::None;
  bool skewed = false;              // the rule judged the variable skewed
  bool by_size = false;             // judged by |G1| (n >= kLargeN) rather than by |z|
  double skewness = 0.0;            // G1 of the input
  double skewness_z = 0.0;          // G1 / SE(G1)
  std::size_t n = 0;
  std::string reason;               // one line, e.g. "G1 = 1.42, z = 6.1 > 3.29: substantial right skew -> log10"
};

// "none", "sqrt", "log10", "reciprocal".
const char* ladder_step_name(LadderStep s) noexcept;

// The ladder recommendation for x (finite values; throws IndexedError(NonFinite) otherwise).
// Throws Error(Argument) when n < 3 or all values are identical: there is no skewness to judge.
LadderAdvice ladder_recommend(const double* x, std::size_t n);

// The same from already computed moments and the sample's minimum and maximum.
LadderAdvice ladder_from_moments(const Moments& m, double min, double max);

}  // namespace powerback
