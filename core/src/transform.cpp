// Validation, vector loops and messages for powerback::Transform; formulas live in family_math.hpp.
#include "powerback/transform.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "powerback/errors.hpp"

namespace powerback {
namespace {

constexpr const char* kNames[kFamilyCount] = {"identity", "box-cox", "yeo-johnson", "log", "log10",
                                              "sqrt",     "reciprocal", "power", "asinh", "logit"};

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
  return (i >= 0 && i < kFamilyCount) ? kNames[i] : "unknown";
}

bool family_is_valid(int f) noexcept { return f >= 0 && f < kFamilyCount; }

Family family_from_name(const std::string& name) {
  for (int i = 0; i < kFamilyCount; ++i)
    if (name == kNames[i]) return static_cast<Family>(i);
  std::string known;
  for (int i = 0; i < kFamilyCount; ++i) known += (i ? ", " : "") + std::string(kNames[i]);
  throw Error(ErrorCode::Argument, "unknown family \"" + name + "\"; known families: " + known);
}

bool family_has_lambda(Family f) noexcept {
  return f == Family::BoxCox || f == Family::YeoJohnson || f == Family::Power;
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

double Transform::apply(double x) const noexcept {
  if (!std::isfinite(x)) return math::kNaN;
  const double v = to_v(x);
  if (!math::in_domain(spec_.family, v, spec_.lambda)) return math::kNaN;
  return math::forward(spec_.family, v, spec_.lambda);
}

double Transform::invert(double z) const noexcept {
  if (!std::isfinite(z) || !math::in_range(spec_.family, z, spec_.lambda)) return math::kNaN;
  return from_v(math::inverse(spec_.family, z, spec_.lambda));
}

double Transform::log_abs_derivative(double x) const noexcept {
  if (!std::isfinite(x)) return math::kNaN;
  const double v = to_v(x);
  if (!math::in_domain(spec_.family, v, spec_.lambda)) return math::kNaN;
  return math::log_deriv(spec_.family, v, spec_.lambda);
}

// One loop shape for the three vector maps: classify each element, then map the good ones.
template <class Good, class Map>
static MapReport map_loop(const double* in, std::size_t n, double* out, Good good, Map map) {
  MapReport r;
  for (std::size_t i = 0; i < n; ++i) {
    const double a = in[i];
    if (!std::isfinite(a)) {
      ++r.n_nonfinite;
      note(r.first_nonfinite, i);
      out[i] = math::kNaN;
    } else if (!good(a)) {
      ++r.n_outside;
      note(r.first_outside, i);
      out[i] = math::kNaN;
    } else {
      out[i] = map(a);
    }
  }
  return r;
}

MapReport Transform::apply(const double* x, std::size_t n, double* out) const {
  const Family f = spec_.family;
  const double lam = spec_.lambda;
  return map_loop(
      x, n, out, [&](double a) { return math::in_domain(f, to_v(a), lam); },
      [&](double a) { return math::forward(f, to_v(a), lam); });
}

MapReport Transform::invert(const double* z, std::size_t n, double* out) const {
  const Family f = spec_.family;
  const double lam = spec_.lambda;
  return map_loop(
      z, n, out, [&](double a) { return math::in_range(f, a, lam); },
      [&](double a) { return from_v(math::inverse(f, a, lam)); });
}

MapReport Transform::log_abs_derivative(const double* x, std::size_t n, double* out) const {
  const Family f = spec_.family;
  const double lam = spec_.lambda;
  return map_loop(
      x, n, out, [&](double a) { return math::in_domain(f, to_v(a), lam); },
      [&](double a) { return math::log_deriv(f, to_v(a), lam); });
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

std::string Transform::domain_requirement() const {
  const std::string fam = family_name(spec_.family);
  const std::string where = v_definition(spec_);
  switch (spec_.family) {
    case Family::BoxCox:
    case Family::Log:
    case Family::Log10:
    case Family::Reciprocal: return fam + " needs v > 0" + where;
    case Family::Sqrt: return fam + " needs v >= 0" + where;
    case Family::Power:
      return spec_.lambda > 0 ? fam + " accepts any finite v"
                              : fam + " with lambda < 0 needs v > 0" + where;
    case Family::Logit: return fam + " needs 0 < v < 1" + where;
    default: return fam + " accepts any finite v";
  }
}

std::string Transform::domain_remedy() const {
  switch (spec_.family) {
    case Family::BoxCox:
    case Family::Log:
    case Family::Log10:
    case Family::Reciprocal:
    case Family::Power:
      return "use yeo-johnson, or a shift that makes every value > 0";
    case Family::Sqrt: return "use yeo-johnson, or a shift that makes every value >= 0";
    case Family::Logit: return "rescale the variable to a proportion strictly between 0 and 1";
    default: return "remove or impute the non-finite values";
  }
}

std::string Transform::range_requirement() const {
  const std::string head = "the inverse of " + std::string(family_name(spec_.family)) +
                           (family_has_lambda(spec_.family)
                                ? " (lambda = " + format_number(spec_.lambda) + ")"
                                : std::string());
  const double lam = spec_.lambda;
  switch (spec_.family) {
    case Family::BoxCox:
      if (lam > 0) return head + " needs z > " + format_number(-1.0 / lam);
      if (lam < 0) return head + " needs z < " + format_number(-1.0 / lam);
      break;
    case Family::YeoJohnson:
      if (lam < 0) return head + " needs z < " + format_number(-1.0 / lam);
      if (lam > 2) return head + " needs z > " + format_number(1.0 / (2.0 - lam));
      break;
    case Family::Sqrt: return head + " needs z >= 0";
    case Family::Reciprocal: return head + " needs z < 0";
    case Family::Power:
      if (lam < 0) return head + " needs z < 0";
      break;
    default: break;
  }
  return head + " accepts any finite z";
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
    const std::string remedy =
        inverse ? "the value lies beyond the transform's range" : domain_remedy();
    throw IndexedError(ErrorCode::Domain,
                       req + "; " + std::to_string(r.n_outside) + " of " + std::to_string(n) +
                           " values of " + what + " are outside, at index " +
                           format_indices(r.first_outside, r.n_outside) + " (0-based): " + remedy,
                       r.n_outside, r.first_outside);
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
