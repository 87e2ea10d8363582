// Validation, vector loops and messages for powerback::Transform; formulas live in family_math.hpp.
#include "powerback/transform.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "powerback/errors.hpp"

namespace powerback {
namespace {

void note(std::vector<std::size_t>& first, std::size_t i) {
  if (first.size() < kMaxReportedIndices) first.push_back(i);
}

}  // namespace

std::string format_number(double x) {
  if (std::isnan(x)) return "NaN";
  if (std::isinf(x)) return x > 0 ? "Inf" : "-Inf";
  char buf[40];
  // Start at the count of integer digits so that 10 prints as "10", not "1e+01".
  const double a = std::fabs(x);
  const int first = (a >= 1 && a < 1e17) ? static_cast<int>(std::floor(std::log10(a))) + 1 : 1;
  for (int digits = first; digits <= 17; ++digits) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, x);
    if (std::strtod(buf, nullptr) == x) break;
  }
  return buf;
}

const char* family_name(Family f) noexcept {
  const int i = static_cast<int>(f);
  return (i >= 0 && i < kFamilyCount) ? kFamilyTraits[i].name : "unknown";
}

bool family_is_valid(int f) noexcept { return f >= 0 && f < kFamilyCount; }

Family family_from_name(const std::string& name) {
  for (const FamilyTraits& t : kFamilyTraits)
    if (name == t.name) return t.family;
  std::string known;
  for (const FamilyTraits& t : kFamilyTraits) known += (known.empty() ? "" : ", ") + std::string(t.name);
  throw Error(ErrorCode::Argument, "unknown family \"" + name + "\"; known families: " + known);
}

bool family_has_lambda(Family f) noexcept {
  return family_is_valid(static_cast<int>(f)) && family_traits(f).has_lambda;
}

Transform::Transform(const TransformSpec& spec) : spec_(spec) {
  require(family_is_valid(static_cast<int>(spec.family)),
          "unknown family code " + std::to_string(static_cast<int>(spec.family)));
  const std::string fam = family_name(spec.family);
  if (family_has_lambda(spec.family)) {
    require(std::isfinite(spec.lambda), fam + " needs a finite lambda; got " + format_number(spec.lambda));
    require(!(spec.family == Family::Power && spec.lambda == 0.0),
            "power needs lambda != 0; use the log family for the zero power");
  } else {
    spec_.lambda = math::kNaN;
  }
  require(std::isfinite(spec.shift), "shift must be finite; got " + format_number(spec.shift));
  if (spec.reflect) {
    require(std::isfinite(spec.pivot),
            "reflect needs a finite pivot (e.g. max(x) + 1); got " + format_number(spec.pivot));
  } else {
    spec_.pivot = math::kNaN;
  }
}

namespace {

enum class Outcome { Ok, Outside, Overflow, Boundary };

double spec_to_v(const TransformSpec& s, double x) {
  return (s.reflect ? s.pivot - x : x) + s.shift;
}
double spec_from_v(const TransformSpec& s, double v) {
  const double u = v - s.shift;
  return s.reflect ? s.pivot - u : u;
}

// x -> z for a finite x. v must be finite too: a shift or a reflection can overflow.
Outcome eval_apply(const TransformSpec& s, double x, double& z) {
  const double v = spec_to_v(s, x);
  if (!std::isfinite(v)) return Outcome::Overflow;
  if (!math::in_domain(s.family, v, s.lambda)) return Outcome::Outside;
  z = math::forward(s.family, v, s.lambda);
  return std::isfinite(z) ? Outcome::Ok : Outcome::Overflow;
}

Outcome eval_invert(const TransformSpec& s, double z, double& x) {
  if (!math::in_range(s.family, z, s.lambda)) return Outcome::Outside;
  const double v = math::inverse(s.family, z, s.lambda);
  if (!std::isfinite(v)) return Outcome::Overflow;
  x = spec_from_v(s, v);
  return std::isfinite(x) ? Outcome::Ok : Outcome::Overflow;
}

// A finite v in the domain whose log |f'(v)| is not finite is a point where f' is zero or
// unbounded (v = 0 for the power family): the boundary, reported as -Inf.
Outcome eval_log_derivative(const TransformSpec& s, double x, double& d) {
  const double v = spec_to_v(s, x);
  if (!std::isfinite(v)) return Outcome::Overflow;
  if (!math::in_domain(s.family, v, s.lambda)) return Outcome::Outside;
  d = math::log_deriv(s.family, v, s.lambda);
  if (std::isfinite(d)) return Outcome::Ok;
  d = -math::kInf;
  return Outcome::Boundary;
}

void count(std::size_t& k, std::vector<std::size_t>& first, std::size_t i) {
  ++k;
  note(first, i);
}

// One loop for the three vector maps: eval classifies each finite element and writes its value.
template <class Eval>
MapReport map_loop(const TransformSpec& s, const double* in, std::size_t n, double* out, Eval eval) {
  MapReport r;
  for (std::size_t i = 0; i < n; ++i) {
    const double a = in[i];
    double v = math::kNaN;
    const Outcome o = std::isfinite(a) ? eval(s, a, v) : Outcome::Ok;
    if (!std::isfinite(a)) count(r.n_nonfinite, r.first_nonfinite, i);
    else if (o == Outcome::Outside) count(r.n_outside, r.first_outside, i);
    else if (o == Outcome::Overflow) count(r.n_overflow, r.first_overflow, i);
    else if (o == Outcome::Boundary) count(r.n_boundary, r.first_boundary, i);
    out[i] = (o == Outcome::Ok || o == Outcome::Boundary) ? v : math::kNaN;
  }
  return r;
}

template <class Eval>
double map_one(const TransformSpec& s, double a, Eval eval) noexcept {
  double v = math::kNaN;
  if (!std::isfinite(a)) return v;
  const Outcome o = eval(s, a, v);
  return (o == Outcome::Ok || o == Outcome::Boundary) ? v : math::kNaN;
}

}  // namespace

double Transform::apply(double x) const noexcept { return map_one(spec_, x, eval_apply); }
double Transform::invert(double z) const noexcept { return map_one(spec_, z, eval_invert); }
double Transform::log_abs_derivative(double x) const noexcept {
  return map_one(spec_, x, eval_log_derivative);
}

MapReport Transform::apply(const double* x, std::size_t n, double* out) const {
  return map_loop(spec_, x, n, out, eval_apply);
}
MapReport Transform::invert(const double* z, std::size_t n, double* out) const {
  return map_loop(spec_, z, n, out, eval_invert);
}
MapReport Transform::log_abs_derivative(const double* x, std::size_t n, double* out) const {
  return map_loop(spec_, x, n, out, eval_log_derivative);
}

std::string Transform::describe() const {
  std::string s = family_name(spec_.family);
  if (family_has_lambda(spec_.family)) s += "(lambda = " + format_number(spec_.lambda) + ")";
  std::string v = spec_.reflect ? format_number(spec_.pivot) + " - x" : "x";
  if (spec_.shift != 0.0)
    v = (spec_.reflect ? "(" + v + ")" : v) + (spec_.shift > 0 ? " + " : " - ") +
        format_number(std::fabs(spec_.shift));
  return s + " of " + (v == "x" ? v : "(" + v + ")");
}

static std::string v_definition(const TransformSpec& s) {
  std::string v = s.reflect ? "pivot - x" : "x";
  if (s.shift != 0.0) v += " + shift";
  return v == "x" ? "" : ", where v = " + v;
}

// "box-cox needs v > 0, where v = x + shift", from the family's domain at this lambda.
std::string Transform::domain_requirement() const {
  const FamilyDomain d = family_traits(spec_.family).domain(spec_.lambda);
  std::string fam = family_name(spec_.family);
  if (*d.condition) fam += std::string(" ") + d.condition;
  if (d.unbounded()) return fam + " accepts any finite v";
  std::string need = format_number(d.lower) + (d.lower_closed ? " <= v" : " < v");
  if (d.upper == math::kInf)
    need = std::string("v ") + (d.lower_closed ? ">= " : "> ") + format_number(d.lower);
  else
    need += " < " + format_number(d.upper);
  return fam + " needs " + need + v_definition(spec_);
}

std::string Transform::domain_remedy() const { return family_traits(spec_.family).domain_remedy; }

// "the inverse of box-cox (lambda = -2) needs z < 0.5", from the family's range at this lambda.
std::string Transform::range_requirement() const {
  const std::string head = "the inverse of " + std::string(family_name(spec_.family)) +
                           (family_has_lambda(spec_.family)
                                ? " (lambda = " + format_number(spec_.lambda) + ")"
                                : std::string());
  const RangeLimit r = family_traits(spec_.family).range(spec_.lambda);
  if (!r.limited) return head + " accepts any finite z";
  return head + " needs z " + (r.beyond_is_above ? "<" : ">") + (r.boundary_valid ? "= " : " ") +
         format_number(r.z);
}

std::string Transform::range_remedy() const {
  if (!family_traits(spec_.family).range(spec_.lambda).precision_limit)
    return "the value lies beyond the transform's range";
  return "the transform approaches that limit as |v| grows, so a z at the limit comes from "
         "values too large for lambda's precision (no digits of v are left to recover); "
         "rescale the variable (divide it by a power of ten) or use a lambda closer to 0";
}

void Transform::throw_if_failed(const MapReport& r, std::size_t n, const std::string& what,
                                bool inverse) const {
  if (r.n_nonfinite > 0) {
    throw IndexedError(ErrorCode::NonFinite,
                       what + " has " + std::to_string(r.n_nonfinite) + " of " + std::to_string(n) +
                           " values NaN or infinite at index " +
                           format_indices(r.first_nonfinite, r.n_nonfinite) +
                           " (0-based): remove or impute them first",
                       r.n_nonfinite, r.first_nonfinite);
  }
  if (r.n_outside > 0) {
    const std::string req = inverse ? range_requirement() : domain_requirement();
    const std::string remedy = inverse ? range_remedy() : domain_remedy();
    throw IndexedError(ErrorCode::Domain,
                       req + "; " + std::to_string(r.n_outside) + " of " + std::to_string(n) +
                           " values of " + what + " are outside, at index " +
                           format_indices(r.first_outside, r.n_outside) + " (0-based): " + remedy,
                       r.n_outside, r.first_outside);
  }
  if (r.n_overflow > 0) {
    throw IndexedError(
        ErrorCode::Domain,
        std::to_string(r.n_overflow) + " of " + std::to_string(n) + " values of " + what +
            (inverse ? " map back" : " map") + " beyond the largest double (about 1.8e308) under " +
            describe() + ", at index " + format_indices(r.first_overflow, r.n_overflow) +
            " (0-based): rescale the variable (e.g. divide it by a power of ten)" +
            (family_has_lambda(spec_.family) ? " or use a lambda closer to 0" : ""),
        r.n_overflow, r.first_overflow);
  }
}

std::vector<double> Transform::apply_checked(const std::vector<double>& x,
                                             const std::string& what) const {
  std::vector<double> out(x.size());
  throw_if_failed(apply(x.data(), x.size(), out.data()), x.size(), what, false);
  return out;
}

std::vector<double> Transform::invert_checked(const std::vector<double>& z,
                                              const std::string& what) const {
  std::vector<double> out(z.size());
  throw_if_failed(invert(z.data(), z.size(), out.data()), z.size(), what, true);
  return out;
}

}  // namespace powerback
