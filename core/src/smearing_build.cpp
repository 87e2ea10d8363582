// Building the smearing mean's residual tree: sorted residuals, node ranges, power sums and
// the per-family constants the queries need (see smearing.hpp for the accuracy).
#include "powerback/smearing.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string>

#include "powerback/errors.hpp"
#include "smearing_internal.hpp"

namespace powerback {

using namespace smearing_detail;

namespace {

std::vector<double> binomials(double p) {
  std::vector<double> b(K + 1);
  b[0] = 1.0;
  for (int k = 1; k <= K; ++k) b[k] = b[k - 1] * (p - (k - 1)) / k;
  return b;
}

// The largest |x| (from a geometric grid) at which the binomial series of (1 + x)^p, cut after
// K terms, leaves a tail below 2^-53 of the smallest value (1 -+ |x|)^p and sums absolute
// terms no larger than kConditioning times it (so rounding stays within ~64 ulp).
double binomial_reach(double p) {
  for (double X = 0.95; X > 1e-9; X *= 0.9) {
    const double floor_value = p > 0.0 ? std::pow(1.0 - X, p) : std::pow(1.0 + X, p);
    double t = 1.0, head = 1.0, tail = 0.0;
    for (int k = 1; k <= K + 400; ++k) {
      t *= std::fabs(p - (k - 1)) / k * X;
      if (k <= K) head += t;
      else tail += t;
    }
    if (tail <= kEps * floor_value && head <= kConditioning * floor_value) return X;
  }
  return 0.0;
}

// Yeo-Johnson near its branch point z = 0. On each side the inverse is g(z) = sg h_s(sg z) with
// h_s(u) = (1 + s u)^(1/s) - 1 (expm1(u) for s = 0): s = lambda, sg = 1 for z >= 0 and
// s = 2 - lambda, sg = -1 for z < 0. The Taylor coefficients of h_s at 0 are h_1 = 1,
// h_k = h_{k-1} (1 - (k - 1) s) / k, so g's are sg^(k+1) h_k; returned for k = 0..kZeroDegree.
std::vector<double> zero_polynomial(double s, double sg) {
  std::vector<double> a(kZeroDegree + 1, 0.0);
  a[1] = 1.0;
  for (std::size_t k = 2; k <= static_cast<std::size_t>(kZeroDegree); ++k)
    a[k] = a[k - 1] * (1.0 - static_cast<double>(k - 1) * s) / static_cast<double>(k) * sg;
  return a;
}

// The largest X (from a geometric grid) such that for 0 < sg z <= X the polynomial leaves a
// tail below 2^-54 |g(z)| and its terms beyond the first sum to at most |g(z)| / 2 (so Horner's
// rule stays within a few ulp). Both bounds are checked at X only: the tail and head divided by
// |z| grow with |z| (absolute terms), and |g(z)| / |z| >= min(1, |g(X)| / X) because g is convex
// or concave on each side with g(0) = 0, g'(0) = 1. 0 when no grid point qualifies.
double zero_reach(double s, double sg, double lambda) {
  for (double X = 0.5; X > 1e-6; X *= 0.9) {
    const double g = std::fabs(math::yeo_johnson_inverse(sg * X, lambda));
    if (!std::isfinite(g)) continue;
    const double floor_value = std::min(X, g);
    double t = X, head = 0.0, tail = 0.0;
    for (int k = 2; k <= kZeroDegree + 400; ++k) {
      t *= std::fabs(1.0 - (k - 1) * s) / k * X;
      if (k <= kZeroDegree) head += t;
      else tail += t;
    }
    if (tail <= 0.5 * kEps * floor_value && head <= 0.5 * floor_value) return X;
  }
  return 0.0;
}
}  // namespace

Smearing::Smearing(const Transform& t, const double* residuals, std::size_t n) : t_(t) {
  require(n > 0 && residuals != nullptr, "smearing needs at least one training residual");
  // Node ids (at most n + 1: every leaf below the root keeps four residuals) fit an int32_t.
  require(n <= 2147483646u, "smearing takes at most 2147483646 training residuals");
  e_.assign(residuals, residuals + n);
  for (std::size_t j = 0; j < n; ++j)
    if (!std::isfinite(e_[j]))
      throw Error(ErrorCode::NonFinite,
                  "training residual " + std::to_string(j) + " is not finite; smearing needs finite residuals");
  const TransformSpec& s = t_.spec();
  if (s.family == Family::Identity) {
    kind_ = Kind::Identity;
    for (double v : e_) e_sum_ += v;
    return;
  }
  if (family_traits(s.family).log_scale(s.lambda) > 0.0) kind_ = Kind::Exponential;
  if (kind_ == Kind::Exponential) {  // no sort needed: the largest residual and one sum
    top_ = *std::max_element(e_.begin(), e_.end());
    for (double v : e_) exp_sum_ += math::inverse(s.family, v - top_, s.lambda);
    return;
  }
  std::sort(e_.begin(), e_.end());
  kind_ = Kind::Tree;
  switch (s.family) {
    case Family::BoxCox:
    case Family::Power: binom_[0] = binomials(1.0 / s.lambda); reach_[0] = binomial_reach(1.0 / s.lambda); break;
    case Family::Reciprocal: binom_[0] = binomials(-1.0); reach_[0] = binomial_reach(-1.0); break;
    case Family::Sqrt: binom_[0] = binomials(2.0); reach_[0] = binomial_reach(2.0); break;
    case Family::YeoJohnson:
      if (s.lambda != 0.0) {
        binom_[0] = binomials(1.0 / s.lambda);
        reach_[0] = binomial_reach(1.0 / s.lambda);
      }
      if (s.lambda != 2.0) {
        binom_[1] = binomials(1.0 / (2.0 - s.lambda));
        reach_[1] = binomial_reach(1.0 / (2.0 - s.lambda));
      }
      zpoly_[0] = zero_polynomial(s.lambda, 1.0);
      zpoly_[1] = zero_polynomial(2.0 - s.lambda, -1.0);
      zreach_[0] = zero_reach(s.lambda, 1.0, s.lambda);
      zreach_[1] = zero_reach(2.0 - s.lambda, -1.0, s.lambda);
      break;
    case Family::Logit: {
      // P_0(y) = y, P_{k+1}(y) = P_k'(y) y (1 - y) gives the k-th derivative of the logistic
      // as a polynomial in y = logistic(z); stored divided by k!, degree k + 1, by k.
      logistic_.assign(static_cast<std::size_t>((K + 1) * (K + 2)), 0.0);
      logistic_[1] = 1.0;
      for (int k = 0; k < K; ++k) {
        const double* q = &logistic_[static_cast<std::size_t>(k * (K + 2))];
        double* nx = &logistic_[static_cast<std::size_t>((k + 1) * (K + 2))];
        for (int i = 1; i <= k + 1; ++i) {  // d/dy of q_i y^i = i q_i y^(i-1); times (y - y^2)
          const double di = i * q[i] / (k + 1);
          nx[i] += di;
          nx[i + 1] -= di;
        }
      }
      break;
    }
    default:
      break;
  }
  find_safe_interval();
  pairs_.reserve(2 * n / kLeaf + 2);
  pairs_.emplace_back();
  mom_.assign(2 * K, 0.0);
  build(0, 0, n, 0);
}

// The terms T^{-1}(z) that are neither beyond the range nor overflowing form an interval of z
// (the range is an interval and the inverse is monotone on it); its ends are found by doubling
// steps from a point inside, then bisection down to adjacent doubles. Rows whose extreme terms
// lie inside it need not evaluate them to know that no term is flagged.
void Smearing::find_safe_interval() {
  auto good = [&](double z) { return std::isfinite(z) && !invert_bounded(t_, z).bounded; };
  double z0 = 0.0;
  if (!good(z0)) z0 = -1.0;
  if (!good(z0)) z0 = 1.0;
  if (!good(z0)) return;  // empty: every row tests its extreme terms
  for (int dir = -1; dir <= 1; dir += 2) {
    double in = z0, step = 1.0, out = kInf;
    while (std::isfinite(z0 + dir * step)) {
      if (!good(z0 + dir * step)) {
        out = z0 + dir * step;
        break;
      }
      in = z0 + dir * step;
      step *= 2.0;
    }
    for (int it = 0; it < 2100 && std::isfinite(out); ++it) {
      const double mid = in + 0.5 * (out - in);
      if (mid == in || mid == out) break;
      (good(mid) ? in : out) = mid;
    }
    (dir < 0 ? safe_lo_ : safe_hi_) = in;  // the last point tested good
  }
}

void Smearing::build(int id, std::size_t i0, std::size_t i1, int depth) {
  if (depth > kMaxDepth) throw Error(ErrorCode::Internal, "smearing tree deeper than expected");
  depth_ = std::max(depth_, depth);
  Node& nd = node(id);
  nd.lo = e_[i0];
  nd.hi = e_[i1 - 1];
  nd.i0 = static_cast<std::uint32_t>(i0);
  nd.i1 = static_cast<std::uint32_t>(i1);
  const double c = nd.centre();
  const std::size_t cnt = i1 - i0;
  if (cnt <= kLeaf || nd.lo == nd.hi) {
    moments_of_leaf(id);
    return;
  }
  // Split at the centre value when both sides keep at least an eighth (depth O(log n)),
  // otherwise at the middle index.
  std::size_t m = static_cast<std::size_t>(std::lower_bound(e_.begin() + static_cast<std::ptrdiff_t>(i0),
                                                            e_.begin() + static_cast<std::ptrdiff_t>(i1), c) -
                                           e_.begin());
  m = std::min(std::max(m, i0 + cnt / 8), i1 - cnt / 8);
  const int kids = static_cast<int>(2 * pairs_.size());
  pairs_.emplace_back();  // invalidates nd
  mom_.resize(2 * pairs_.size() * K, 0.0);
  node(id).kids = kids;
  build(kids, i0, m, depth + 1);
  build(kids + 1, m, i1, depth + 1);
  moments_from_children(id);
}

void Smearing::moments_of_leaf(int id) {
  const Node& nd = node(id);
  const double c = nd.centre();
  double* m = &mom_[static_cast<std::size_t>(id) * K];
  for (std::size_t j = nd.i0; j < nd.i1; ++j) {
    const double d = e_[j] - c;
    double p = d;
    for (int k = 0; k < K; ++k) {
      m[k] += p;
      p *= d;
    }
  }
}

// Power sums about the parent's centre from the children's: (d + delta)^k expanded.
void Smearing::moments_from_children(int id) {
  const Tables& tb = tables();
  const Node& nd = node(id);
  double* m = &mom_[static_cast<std::size_t>(id) * K];
  for (int side = 0; side < 2; ++side) {
    const int ch = nd.kids + side;
    const Node& cn = node(ch);
    const double* mc = &mom_[static_cast<std::size_t>(ch) * K];
    const double delta = cn.centre() - nd.centre();
    double dp[K + 1];
    dp[0] = 1.0;
    for (int k = 1; k <= K; ++k) dp[k] = dp[k - 1] * delta;
    const double cnt = static_cast<double>(cn.i1 - cn.i0);
    for (int k = 1; k <= K; ++k) {
      double s = tb.choose[k][0] * dp[k] * cnt;  // i = 0 term: M_0 = count
      for (int i = 1; i <= k; ++i) s += tb.choose[k][i] * dp[k - i] * mc[i - 1];
      m[k - 1] += s;
    }
  }
}

}  // namespace powerback
