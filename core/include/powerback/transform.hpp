// powerback/transform.hpp — one variable's transform: reflect -> shift -> family.
//
//   v = (reflect ? pivot - x : x) + shift,   z = f(v; lambda)
//
// Every constant is stored, so new data get exactly the transform learned at fit time. All
// families are increasing in v; only reflection reverses order.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "powerback/family_traits.hpp"

namespace powerback {

struct TransformSpec {
  Family family = Family::Identity;
  double lambda = math::kNaN;  // used by box-cox, yeo-johnson and power; NaN for the others
  double shift = 0.0;
  bool reflect = false;
  double pivot = math::kNaN;   // used when reflect; NaN otherwise
};

// Names as in the public contract: "identity", "box-cox", "yeo-johnson", "log", "log10", "sqrt",
// "reciprocal", "power", "asinh", "logit".
const char* family_name(Family f) noexcept;
// Throws Error(Argument) naming the known families when `name` is none of them.
Family family_from_name(const std::string& name);
bool family_has_lambda(Family f) noexcept;
// A family value that is one of the enumerators?
bool family_is_valid(int f) noexcept;

// Elements an apply/invert could not map; `first` holds up to kMaxReportedIndices 0-based indices.
struct MapReport {
  std::size_t n_nonfinite = 0;  // NaN or +-Inf inputs
  std::size_t n_outside = 0;    // finite inputs outside the domain (apply) or range (invert)
  // Finite inputs whose result (or v = x + shift, or the value after reflection) is beyond the
  // largest double: an error, as for values outside the domain.
  std::size_t n_overflow = 0;
  // log_abs_derivative only: inputs where f'(v) is zero or unbounded (v = 0 for the power family
  // with lambda != 1). Not an error: the output there is -Inf, which marks a Jacobian that makes
  // the likelihood incomparable (a model holding such a value must rank last, never first).
  std::size_t n_boundary = 0;
  std::vector<std::size_t> first_nonfinite;
  std::vector<std::size_t> first_outside;
  std::vector<std::size_t> first_overflow;
  std::vector<std::size_t> first_boundary;
  bool ok() const noexcept { return n_nonfinite == 0 && n_outside == 0 && n_overflow == 0; }
};

class Transform {
 public:
  Transform() = default;
  // Validates the spec (Error(Argument) with the reason) and normalises unused fields to NaN.
  explicit Transform(const TransformSpec& spec);

  const TransformSpec& spec() const noexcept { return spec_; }

  // x -> z. Elements that cannot be mapped (outside the domain, or overflowing) become NaN and
  // are counted in the report; the others are always written. `out` may alias `x`.
  MapReport apply(const double* x, std::size_t n, double* out) const;
  // z -> x, the inverse of apply. Same reporting; `out` may alias `z`. The round trip
  // invert(apply(x)) is exact up to rounding amplified by the condition of the inverse: its
  // relative error is about 2^-53 * |z| / |v f'(v)| (a few ulps for the log, the power and
  // Box-Cox near lambda = 1). It grows where f flattens out: Box-Cox with lambda < 0 at large v
  // has |z| / |v f'(v)| ~ v^-lambda / |lambda|, so lambda = -2 keeps about 1e-4 relative at
  // v = 1e6, and beyond v ~ 1e8 every z rounds to the limit -1/lambda and no digit of v is
  // left (the inverse then reports the value as outside the range, saying so).
  MapReport invert(const double* z, std::size_t n, double* out) const;
  // log |dz/dx| at each x (reflection has |dv/dx| = 1); NaN where apply would fail; -Inf where
  // f'(v) is zero or unbounded (counted in n_boundary, see MapReport).
  MapReport log_abs_derivative(const double* x, std::size_t n, double* out) const;

  // Scalar forms; NaN when the element cannot be mapped (-Inf at a log-derivative boundary).
  double apply(double x) const noexcept;
  double invert(double z) const noexcept;
  double log_abs_derivative(double x) const noexcept;

  // The same maps, throwing IndexedError (NonFinite first, then Domain) with a full message
  // naming `what` (e.g. "x") when any element fails.
  std::vector<double> apply_checked(const std::vector<double>& x, const std::string& what) const;
  std::vector<double> invert_checked(const std::vector<double>& z, const std::string& what) const;

  // Human text, used in error messages by every front end:
  // "box-cox needs v > 0, where v = x + shift" / "the inverse of box-cox (lambda = 0.5) needs
  // z > -2" and a remedy such as "use yeo-johnson, or a shift that makes every value > 0".
  std::string domain_requirement() const;
  std::string domain_remedy() const;
  std::string range_requirement() const;
  // What to do about z outside the range: for a family with a finite limit (Box-Cox or
  // Yeo-Johnson beyond the limit -1/lambda), z at the limit means the values were too large for
  // lambda's precision.
  std::string range_remedy() const;
  // One line, e.g. "box-cox(lambda = 0.5) of (x + 1)".
  std::string describe() const;

  // Throws IndexedError for a failed report: NonFinite first, then Domain for values outside
  // ("<requirement>; <k> of <n> values of <what> ..."), then Domain for overflow.
  void throw_if_failed(const MapReport& r, std::size_t n, const std::string& what,
                       bool inverse) const;

 private:
  double to_v(double x) const noexcept { return (spec_.reflect ? spec_.pivot - x : x) + spec_.shift; }
  double from_v(double v) const noexcept {
    const double u = v - spec_.shift;
    return spec_.reflect ? spec_.pivot - u : u;
  }
  TransformSpec spec_{};
};

// Shortest decimal text that reads back to the same double ("0.5", "-1", "0.1").
std::string format_number(double x);

}  // namespace powerback
