// The rule-based ladder of powers; the rule and its sources are in powerback/ladder.hpp.
#include "powerback/ladder.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

std::string fixed(double v, int digits) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", digits, v);
  return buf;
}

}  // namespace

const char* ladder_step_name(LadderStep s) noexcept {
  switch (s) {
    case LadderStep::Sqrt: return "sqrt";
    case LadderStep::Log10: return "log10";
    case LadderStep::Reciprocal: return "reciprocal";
    default: return "none";
  }
}

LadderAdvice ladder_from_moments(const Moments& m, double min, double max) {
  if (m.n < 3) throw Error(ErrorCode::Argument, "the ladder needs at least 3 values to judge skewness");
  if (!std::isfinite(m.skewness) || !(max > min))
    throw Error(ErrorCode::Argument, "all values are identical: there is no skewness to judge");
  LadderAdvice a;
  a.n = m.n;
  a.skewness = m.skewness;
  a.skewness_z = m.skewness_z;
  a.by_size = m.n >= LadderRule::kLargeN;
  const double size = std::fabs(m.skewness);
  const std::string head = "G1 = " + fixed(m.skewness, 2) + ", z = " + fixed(m.skewness_z, 2);
  if (a.by_size) {
    a.skewed = size > LadderRule::kSizeCut;
    if (!a.skewed) {
      a.reason = head + ": |G1| <= 0.5 with n >= 300, not skewed enough to transform";
      return a;
    }
  } else {
    a.skewed = std::fabs(m.skewness_z) > LadderRule::kZCut;
    if (!a.skewed) {
      a.reason = head + ": |z| <= 3.29, no significant skew";
      return a;
    }
  }
  const char* severity;
  if (size > LadderRule::kReciprocalCut) {
    a.step = LadderStep::Reciprocal;
    a.spec.family = Family::Reciprocal;
    severity = "severe";
  } else if (size > LadderRule::kLog10Cut) {
    a.step = LadderStep::Log10;
    a.spec.family = Family::Log10;
    severity = "substantial";
  } else {
    a.step = LadderStep::Sqrt;
    a.spec.family = Family::Sqrt;
    severity = "moderate";
  }
  const bool left = m.skewness < 0.0;
  if (left) {
    // v = (max + 1) - x starts at 1; no further shift is needed.
    a.spec.reflect = true;
    a.spec.pivot = max + 1.0;
    a.spec.shift = 0.0;
  } else if (min <= 0.0) {
    a.spec.shift = 1.0 - min;
  }
  a.reason = head + (a.by_size ? ": |G1| > 0.5 with n >= 300, " : ": |z| > 3.29, ") + severity +
             (left ? " left skew -> reflect, then " : " right skew -> ") +
             ladder_step_name(a.step);
  // Validate (and normalise unused fields) through the transform's own checks.
  a.spec = Transform(a.spec).spec();
  return a;
}

LadderAdvice ladder_recommend(const double* x, std::size_t n) {
  if (n > 0 && !x) throw Error(ErrorCode::Argument, "x is NULL but n > 0");
  const Moments m = sample_moments(x, n);
  if (n < 3) throw Error(ErrorCode::Argument, "the ladder needs at least 3 values to judge skewness");
  const auto mm = std::minmax_element(x, x + n);
  return ladder_from_moments(m, *mm.first, *mm.second);
}

}  // namespace powerback
