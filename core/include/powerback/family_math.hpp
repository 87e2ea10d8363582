// powerback/family_math.hpp — scalar formulas of the transform families, no validation.
//
// Each family f maps v (the value after reflection and shift) to z = f(v). For each we give the
// forward map, its inverse and log |f'(v)| (the Jacobian term of a normal likelihood on the
// transformed scale); the domain and range facts are rows of family_traits.hpp. Callers validate;
// these functions assume a parameter the family accepts and return NaN outside the domain.
//
// References
//   Box, G. E. P. & Cox, D. R. (1964). An analysis of transformations. JRSS B 26, 211-252.
//     psi(v; lambda) = (v^lambda - 1) / lambda, lambda != 0;  log v, lambda = 0;  v > 0.
//   Yeo, I.-K. & Johnson, R. A. (2000). A new family of power transformations to improve
//     normality or symmetry. Biometrika 87, 954-959, eq. (2.1):
//     v >= 0: ((v + 1)^lambda - 1) / lambda  (lambda != 0),  log(v + 1)  (lambda = 0)
//     v <  0: -((1 - v)^(2 - lambda) - 1) / (2 - lambda)  (lambda != 2),  -log(1 - v)  (lambda = 2)
// Powers are written as expm1(lambda * log(.)) / lambda and inverses through log1p, so the
// maps are continuous (and accurate) as lambda -> 0 (and 2 - lambda -> 0 for Yeo-Johnson).
#pragma once

#include <cmath>
#include <limits>

namespace powerback {

enum class Family {
  Identity = 0,
  BoxCox,
  YeoJohnson,
  Log,
  Log10,
  Sqrt,
  Reciprocal,
  Power,
  Asinh,
  Logit
};
constexpr int kFamilyCount = 10;

namespace math {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kLn10 = 2.302585092994045684017991454684364208;

// ---- Box-Cox -------------------------------------------------------------------------------
inline double box_cox(double v, double lambda) {
  const double lv = std::log(v);
  return lambda == 0.0 ? lv : std::expm1(lambda * lv) / lambda;
}
// v = (1 + lambda z)^(1/lambda) = exp(log1p(lambda z) / lambda); needs 1 + lambda z > 0.
inline double box_cox_inverse(double z, double lambda) {
  return lambda == 0.0 ? std::exp(z) : std::exp(std::log1p(lambda * z) / lambda);
}
// d psi / dv = v^(lambda - 1)
inline double box_cox_log_deriv(double v, double lambda) { return (lambda - 1.0) * std::log(v); }

// ---- Yeo-Johnson ---------------------------------------------------------------------------
inline double yeo_johnson(double v, double lambda) {
  if (v >= 0.0) {
    const double l1 = std::log1p(v);
    return lambda == 0.0 ? l1 : std::expm1(lambda * l1) / lambda;
  }
  const double m = 2.0 - lambda;
  const double l1 = std::log1p(-v);
  return m == 0.0 ? -l1 : -std::expm1(m * l1) / m;
}
// z >= 0 came from v >= 0 (psi(0) = 0 and psi is increasing); z < 0 from v < 0.
inline double yeo_johnson_inverse(double z, double lambda) {
  if (z >= 0.0) return lambda == 0.0 ? std::expm1(z) : std::expm1(std::log1p(lambda * z) / lambda);
  const double m = 2.0 - lambda;
  return m == 0.0 ? -std::expm1(-z) : -std::expm1(std::log1p(-m * z) / m);
}
// d psi / dv = (v + 1)^(lambda - 1) for v >= 0, (1 - v)^(1 - lambda) for v < 0
inline double yeo_johnson_log_deriv(double v, double lambda) {
  return v >= 0.0 ? (lambda - 1.0) * std::log1p(v) : (1.0 - lambda) * std::log1p(-v);
}
// The inverse exists where the argument of log1p is > -1.
inline bool yeo_johnson_in_range(double z, double lambda) {
  return z >= 0.0 ? (lambda >= 0.0 || 1.0 + lambda * z > 0.0)
                  : (lambda <= 2.0 || 1.0 - (2.0 - lambda) * z > 0.0);
}

// ---- sign-preserving power, lambda != 0 ----------------------------------------------------
// lambda > 0: sign(v) |v|^lambda on the real line; lambda < 0: -v^lambda on v > 0.
inline double power(double v, double lambda) {
  if (lambda > 0.0) return std::copysign(std::pow(std::fabs(v), lambda), v);
  return -std::pow(v, lambda);
}
inline double power_inverse(double z, double lambda) {
  if (lambda > 0.0) return std::copysign(std::pow(std::fabs(z), 1.0 / lambda), z);
  return std::pow(-z, 1.0 / lambda);
}
// |f'(v)| = |lambda| |v|^(lambda - 1)
inline double power_log_deriv(double v, double lambda) {
  if (lambda == 1.0) return 0.0;  // f(v) = v: the formula would give 0 * log 0 at v = 0
  return std::log(std::fabs(lambda)) + (lambda - 1.0) * std::log(std::fabs(v));
}

// ---- asinh ---------------------------------------------------------------------------------
// f'(v) = 1 / sqrt(1 + v^2); for |v| > 1e150, v^2 overflows, so use -log|v| - log1p(1/v^2)/2.
inline double asinh_log_deriv(double v) {
  const double a = std::fabs(v);
  if (a > 1e150) return -std::log(a) - 0.5 * std::log1p(1.0 / (a * a));
  return -0.5 * std::log1p(a * a);
}

// ---- logit ---------------------------------------------------------------------------------
inline double logit(double v) { return std::log(v) - std::log1p(-v); }
inline double logit_inverse(double z) {
  return z >= 0.0 ? 1.0 / (1.0 + std::exp(-z)) : std::exp(z) / (1.0 + std::exp(z));
}
// f'(v) = 1 / (v (1 - v))
inline double logit_log_deriv(double v) { return -std::log(v) - std::log1p(-v); }

// ---- dispatch ------------------------------------------------------------------------------
inline double forward(Family f, double v, double lambda) {
  switch (f) {
    case Family::Identity: return v;
    case Family::BoxCox: return box_cox(v, lambda);
    case Family::YeoJohnson: return yeo_johnson(v, lambda);
    case Family::Log: return std::log(v);
    case Family::Log10: return std::log10(v);
    case Family::Sqrt: return std::sqrt(v);
    case Family::Reciprocal: return -1.0 / v;
    case Family::Power: return power(v, lambda);
    case Family::Asinh: return std::asinh(v);
    case Family::Logit: return logit(v);
  }
  return kNaN;
}

inline double inverse(Family f, double z, double lambda) {
  switch (f) {
    case Family::Identity: return z;
    case Family::BoxCox: return box_cox_inverse(z, lambda);
    case Family::YeoJohnson: return yeo_johnson_inverse(z, lambda);
    case Family::Log: return std::exp(z);
    case Family::Log10: return std::pow(10.0, z);
    case Family::Sqrt: return z * z;
    case Family::Reciprocal: return -1.0 / z;
    case Family::Power: return power_inverse(z, lambda);
    case Family::Asinh: return std::sinh(z);
    case Family::Logit: return logit_inverse(z);
  }
  return kNaN;
}

inline double log_deriv(Family f, double v, double lambda) {
  switch (f) {
    case Family::Identity: return 0.0;
    case Family::BoxCox: return box_cox_log_deriv(v, lambda);
    case Family::YeoJohnson: return yeo_johnson_log_deriv(v, lambda);
    case Family::Log: return -std::log(v);
    case Family::Log10: return -std::log(v) - std::log(kLn10);
    case Family::Sqrt: return -std::log(2.0) - 0.5 * std::log(v);
    case Family::Reciprocal: return -2.0 * std::log(v);
    case Family::Power: return power_log_deriv(v, lambda);
    case Family::Asinh: return asinh_log_deriv(v);
    case Family::Logit: return logit_log_deriv(v);
  }
  return kNaN;
}

// The domain and range tests (in_domain, in_range) read the table in family_traits.hpp.

}  // namespace math
}  // namespace powerback
