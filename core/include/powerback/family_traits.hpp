// powerback/family_traits.hpp — one table of what each transform family needs and gives.
//
// The formulas live in family_math.hpp; this table holds the facts every other place reads:
// the name, whether the family has a lambda, its domain (for validation and messages), the
// range of its inverse (for invert, back-transformed limits, the normal-theory mean and its
// divergence, the messages), the remedy for input outside the domain, and whether the inverse is
// an exponential (log-type families: closed-form lognormal means, percent effects, smearing).
// A new family adds one row here (in enumerator order) and its formulas in family_math.hpp.
#pragma once

#include <cmath>

#include "powerback/family_math.hpp"

namespace powerback {

// Where v may lie for one lambda: lower < v (or lower <= v when lower_closed) and v < upper.
// lower = -Inf and upper = +Inf when unbounded. `condition` qualifies a domain that depends on
// lambda in messages ("with lambda < 0"); "" otherwise.
struct FamilyDomain {
  double lower = -math::kInf;
  bool lower_closed = false;
  double upper = math::kInf;
  const char* condition = "";
  bool unbounded() const { return lower == -math::kInf && upper == math::kInf; }
};

// Where the inverse stops existing on the transformed scale, for one lambda.
struct RangeLimit {
  bool limited = false;
  double z = math::kNaN;         // the boundary on the transformed scale
  bool beyond_is_above = true;   // the invalid side is z > boundary (else z < boundary)
  bool boundary_valid = false;   // the boundary itself is in the range (sqrt: z = 0)
  double v = math::kNaN;         // limit of v on the invalid side: 0, +Inf or -Inf
  // When v tends to +-Inf at the boundary, the exponent p with v ~ distance^p there; else 0.
  // The normal-theory mean diverges when p <= -1 (see normal_mean_diverges).
  double pole = 0.0;
  // A z at the boundary is where large |v| rounds to (the family flattens out towards it), so
  // reaching it means the precision of the original values is exhausted.
  bool precision_limit = false;
};

struct FamilyTraits {
  Family family;
  const char* name;  // as the R package, the C ABI and the text spec spell it
  bool has_lambda;
  FamilyDomain (*domain)(double lambda);
  RangeLimit (*range)(double lambda);
  // Does the inverse exist at the finite z? The test in the inverse's own arithmetic (e.g.
  // 1 + lambda z > 0 for Box-Cox), so that it agrees with the inverse to the last bit.
  bool (*in_range)(double z, double lambda);
  // What to do about input outside the domain.
  const char* domain_remedy;
  // a > 0 when the inverse is exp(a z) (a = 1 for the natural log, ln 10 for log10); else 0.
  double (*log_scale)(double lambda);
  // p when the inverse grows like |z|^p away from the origin (sets how far the normal-theory
  // mean's quadrature reaches beyond the normal's centre); 0 for exponential growth.
  double (*growth_power)(double lambda);
};

namespace family_rows {

inline FamilyDomain whole_line(double) { return {}; }
inline FamilyDomain positive(double) { return {0.0, false, math::kInf, ""}; }
inline FamilyDomain nonnegative(double) { return {0.0, true, math::kInf, ""}; }
inline FamilyDomain unit_interval(double) { return {0.0, false, 1.0, ""}; }
inline FamilyDomain power_domain(double l) {
  return l > 0.0 ? FamilyDomain{} : FamilyDomain{0.0, false, math::kInf, "with lambda < 0"};
}

inline RangeLimit unlimited(double) { return {}; }
inline RangeLimit box_cox_range(double l) {
  RangeLimit r;
  if (l == 0.0) return r;
  r.limited = true;
  r.z = -1.0 / l;
  r.beyond_is_above = l < 0.0;  // 1 + l z > 0
  r.v = l > 0.0 ? 0.0 : math::kInf;
  r.pole = l < 0.0 ? 1.0 / l : 0.0;
  r.precision_limit = l < 0.0;
  return r;
}
inline RangeLimit yeo_johnson_range(double l) {
  RangeLimit r;
  if (l < 0.0) {  // the z >= 0 branch needs 1 + l z > 0
    r.limited = true;
    r.z = -1.0 / l;
    r.beyond_is_above = true;
    r.v = math::kInf;
    r.pole = 1.0 / l;
    r.precision_limit = true;
  } else if (l > 2.0) {  // the z < 0 branch needs 1 - (2 - l) z > 0
    r.limited = true;
    r.z = 1.0 / (2.0 - l);
    r.beyond_is_above = false;
    r.v = -math::kInf;
    r.pole = 1.0 / (2.0 - l);
    r.precision_limit = true;
  }
  return r;
}
inline RangeLimit sqrt_range(double) {
  RangeLimit r;
  r.limited = true;
  r.z = 0.0;
  r.beyond_is_above = false;
  r.boundary_valid = true;
  r.v = 0.0;
  return r;
}
inline RangeLimit reciprocal_range(double) {
  RangeLimit r;
  r.limited = true;
  r.z = 0.0;
  r.beyond_is_above = true;
  r.v = math::kInf;
  r.pole = -1.0;
  return r;
}
inline RangeLimit power_range(double l) {
  if (l > 0.0) return {};
  RangeLimit r = reciprocal_range(l);
  r.pole = 1.0 / l;
  return r;
}

inline bool any_z(double, double) { return true; }
inline bool box_cox_in_range(double z, double l) { return l == 0.0 || 1.0 + l * z > 0.0; }
inline bool sqrt_in_range(double z, double) { return z >= 0.0; }
inline bool negative_z(double z, double) { return z < 0.0; }
inline bool power_in_range(double z, double l) { return l > 0.0 || z < 0.0; }

inline double not_log(double) { return 0.0; }
inline double natural_log(double) { return 1.0; }
inline double common_log(double) { return math::kLn10; }
inline double box_cox_log(double l) { return l == 0.0 ? 1.0 : 0.0; }

inline double no_power(double) { return 0.0; }
inline double square(double) { return 2.0; }
inline double reciprocal_of_lambda(double l) { return l != 0.0 ? 1.0 / l : 0.0; }

constexpr const char* kPositiveRemedy = "use yeo-johnson, or a shift that makes every value > 0";
constexpr const char* kNoDomainRemedy = "remove or impute the non-finite values";

}  // namespace family_rows

// One row per family, in the order of the enumerators (checked below).
constexpr FamilyTraits kFamilyTraits[kFamilyCount] = {
    {Family::Identity, "identity", false, family_rows::whole_line, family_rows::unlimited,
     family_rows::any_z, family_rows::kNoDomainRemedy, family_rows::not_log, family_rows::no_power},
    {Family::BoxCox, "box-cox", true, family_rows::positive, family_rows::box_cox_range,
     family_rows::box_cox_in_range, family_rows::kPositiveRemedy, family_rows::box_cox_log,
     family_rows::reciprocal_of_lambda},
    {Family::YeoJohnson, "yeo-johnson", true, family_rows::whole_line, family_rows::yeo_johnson_range,
     math::yeo_johnson_in_range, family_rows::kNoDomainRemedy, family_rows::not_log,
     family_rows::reciprocal_of_lambda},
    {Family::Log, "log", false, family_rows::positive, family_rows::unlimited, family_rows::any_z,
     family_rows::kPositiveRemedy, family_rows::natural_log, family_rows::no_power},
    {Family::Log10, "log10", false, family_rows::positive, family_rows::unlimited, family_rows::any_z,
     family_rows::kPositiveRemedy, family_rows::common_log, family_rows::no_power},
    {Family::Sqrt, "sqrt", false, family_rows::nonnegative, family_rows::sqrt_range,
     family_rows::sqrt_in_range, "use yeo-johnson, or a shift that makes every value >= 0",
     family_rows::not_log, family_rows::square},
    {Family::Reciprocal, "reciprocal", false, family_rows::positive, family_rows::reciprocal_range,
     family_rows::negative_z, family_rows::kPositiveRemedy, family_rows::not_log,
     family_rows::no_power},
    {Family::Power, "power", true, family_rows::power_domain, family_rows::power_range,
     family_rows::power_in_range, family_rows::kPositiveRemedy, family_rows::not_log,
     family_rows::reciprocal_of_lambda},
    {Family::Asinh, "asinh", false, family_rows::whole_line, family_rows::unlimited,
     family_rows::any_z, family_rows::kNoDomainRemedy, family_rows::not_log, family_rows::no_power},
    {Family::Logit, "logit", false, family_rows::unit_interval, family_rows::unlimited,
     family_rows::any_z, "rescale the variable to a proportion strictly between 0 and 1",
     family_rows::not_log, family_rows::no_power},
};

namespace family_rows {
constexpr bool rows_in_enum_order() {
  for (int i = 0; i < kFamilyCount; ++i)
    if (static_cast<int>(kFamilyTraits[i].family) != i) return false;
  return true;
}
}  // namespace family_rows
static_assert(family_rows::rows_in_enum_order(), "kFamilyTraits rows must follow the enumerators");

// The row of a valid family (callers check family_is_valid for codes from outside).
inline const FamilyTraits& family_traits(Family f) { return kFamilyTraits[static_cast<int>(f)]; }

// The normal-theory mean of T^{-1}(Z) is infinite: v grows like distance^p with p <= -1 at the
// range limit, where a normal density is positive, so the integral diverges.
inline bool normal_mean_diverges(const RangeLimit& r) { return r.pole != 0.0 && r.pole <= -1.0; }

namespace math {

// Is the finite value v inside the family's domain?
inline bool in_domain(Family f, double v, double lambda) {
  const FamilyDomain d = family_traits(f).domain(lambda);
  return (v > d.lower || (d.lower_closed && v == d.lower)) && v < d.upper;
}

// Is the finite value z inside the family's range (so the inverse exists)?
inline bool in_range(Family f, double z, double lambda) {
  return family_traits(f).in_range(z, lambda);
}

}  // namespace math
}  // namespace powerback
