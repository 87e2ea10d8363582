// The smearing mean in linear time: closed forms for the identity and log families, a tree of
// residual power sums with local series for the others (see smearing.hpp for the accuracy).
#include "powerback/smearing.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

constexpr int K = 26;                 // series terms kept
constexpr std::size_t kLeaf = 32;     // residuals at most in a leaf
constexpr double kRho = 0.9;          // node half-width / distance to a sign change, at most
constexpr double kExpReach = 2.0;     // half-width limit for exponential-type inverses
constexpr double kLogisticReach = 0.25 * 3.141592653589793;  // a quarter of the pole distance
constexpr double kEps = 1.1102230246251565e-16;               // 2^-53
constexpr double kConditioning = 64.0;  // sum |terms| / smallest value accepted in a node
constexpr int kMaxDepth = 250;
constexpr int kZeroDegree = 10;       // degree of the Yeo-Johnson polynomials at z = 0
constexpr double kInf = std::numeric_limits<double>::infinity();

struct Tables {
  double choose[K + 1][K + 1];  // C(k, i)
  double inv_fact[K + 1];       // 1 / k!
  Tables() {
    for (int k = 0; k <= K; ++k) {
      choose[k][0] = choose[k][k] = 1.0;
      for (int i = 1; i < k; ++i) choose[k][i] = choose[k - 1][i - 1] + choose[k - 1][i];
    }
    inv_fact[0] = 1.0;
    for (int k = 1; k <= K; ++k) inv_fact[k] = inv_fact[k - 1] / k;
  }
};
const Tables& tables() {
  static const Tables t;
  return t;
}

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

inline void prefetch_line(const void* p) {
#if defined(__GNUC__) || defined(__clang__)
  __builtin_prefetch(p);
#else
  (void)p;
#endif
}

// Asks for the node's power sums ahead of their use (they are read after the Taylor
// coefficients, whose transcendental functions hide the memory latency).
inline void prefetch_moments(const double* m) {
#if defined(__GNUC__) || defined(__clang__)
  for (int k = 0; k < K; k += 8) __builtin_prefetch(m + k);
  __builtin_prefetch(m + K - 1);
#else
  (void)m;
#endif
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

double Smearing::x_sum(double vsum, double count) const {
  const TransformSpec& s = t_.spec();
  if (s.reflect) return count * (s.pivot + s.shift) - vsum;
  return s.shift == 0.0 ? vsum : vsum - count * s.shift;
}

double Smearing::near_zero(double z) const {
  const std::vector<double>& a = zpoly_[z >= 0.0 ? 0 : 1];
  double v = a[kZeroDegree];
  for (int k = kZeroDegree - 1; k >= 1; --k) v = v * z + a[static_cast<std::size_t>(k)];
  return v * z;
}

double Smearing::direct(std::size_t i0, std::size_t i1, double mu, bool in_range, bool* bounded,
                        SmearingWork* work) const {
  const TransformSpec& s = t_.spec();
  if (in_range && !zpoly_[0].empty() && mu + e_[i0] >= -zreach_[1] && mu + e_[i1 - 1] <= zreach_[0]) {
    double vs = 0.0;  // Yeo-Johnson next to its branch point: the polynomials at z = 0
    for (std::size_t j = i0; j < i1; ++j) vs += near_zero(mu + e_[j]);
    if (work) work->zero_polynomial += i1 - i0;
    return x_sum(vs, static_cast<double>(i1 - i0));
  }
  if (in_range) {  // every term in range: sum the inverse itself; a finite sum has no bounded term
    double vs = 0.0;
    for (std::size_t j = i0; j < i1; ++j) vs += math::inverse(s.family, mu + e_[j], s.lambda);
    if (std::isfinite(vs)) return x_sum(vs, static_cast<double>(i1 - i0));
  }
  double sum = 0.0;
  for (std::size_t j = i0; j < i1; ++j) {
    const BackValue v = invert_bounded(t_, mu + e_[j]);
    sum += v.value;
    *bounded = *bounded || v.bounded;
  }
  return sum;
}

bool Smearing::series(const Node& nd, const double* mom, double mu, bool check_ends, double* vsum,
                      SmearingWork* work) const {
  const TransformSpec& s = t_.spec();
  const double lambda = s.lambda;
  const double ctr = nd.centre();
  const double w = mu + ctr, r = std::max(nd.hi - ctr, ctr - nd.lo);
  const double cnt = static_cast<double>(nd.i1 - nd.i0);
  const Tables& tb = tables();
  double c0 = 0.0;
  double c[K + 1];  // c[k], k >= 1: k-th Taylor coefficient of g at w (asinh, logistic)
  int kmax = K;     // terms used: the series stops once its terms are decreasing and negligible
  double tail = 0.0;
  bool summed = false;  // tail already summed (the power and exponential branches)
  // |c_k| r^k bounds the k-th term per residual; below 2^-60 |c0| (the node sum is at least
  // |c0| / 64 per residual in an accepted node) and past the terms' peak, the rest cannot count.
  // The branches below compute c_k by a recurrence and add c_k M_k as they go.
  auto sum_terms = [&](double first, double x, const double* coef) {
    const double stop = 8.673617379884035e-19 * std::fabs(c0);
    double xp = first, rk = 1.0, prev = kInf, t = 0.0;
    int k = 1;
    for (;; ++k) {
      xp *= x;
      rk *= r;
      const double ck = coef[k] * xp;
      t += ck * mom[k - 1];
      const double bound = std::fabs(ck) * rk;
      if (k == K || (bound < stop && bound <= prev)) break;
      prev = bound;
    }
    kmax = k;
    tail = t;
    summed = true;
  };
  // A power branch g(w + d) = A + B (W + s d)^p with base W > 0: c_k = B W^p binom(p, k) (s/W)^k.
  auto power_branch = [&](double W, double sl, double B, double Wp, int br) {
    if (!(W > 0.0) || r * std::fabs(sl) > reach_[br] * W) return false;
    sum_terms(B * Wp, sl / W, binom_[br].data());
    return true;
  };
  // An exponential branch g(w + d) = A + B exp(sl (w + d)): c_k = B E sl^k / k!, E = exp(sl w).
  auto exp_branch = [&](double sl, double B, double E) {
    if (r * std::fabs(sl) > kExpReach) return false;
    sum_terms(B * E, sl, tb.inv_fact);
    return true;
  };

  bool ok = false;
  switch (s.family) {
    case Family::BoxCox: {
      const double W = 1.0 + lambda * w;
      c0 = std::exp(std::log1p(lambda * w) / lambda);
      ok = power_branch(W, lambda, 1.0, c0, 0);
      break;
    }
    case Family::Power: {
      const double p = 1.0 / lambda;
      if (lambda > 0.0) {
        if (w == 0.0) return false;
        const double W = std::fabs(w), B = w > 0.0 ? 1.0 : -1.0;
        const double Wp = std::pow(W, p);
        c0 = B * Wp;
        ok = power_branch(W, B, B, Wp, 0);
      } else {
        const double W = -w;
        c0 = std::pow(W, p);
        ok = power_branch(W, -1.0, 1.0, c0, 0);
      }
      break;
    }
    case Family::Reciprocal: {
      const double W = -w;
      c0 = 1.0 / W;
      ok = power_branch(W, -1.0, 1.0, c0, 0);
      break;
    }
    case Family::Sqrt: {
      c0 = w * w;
      ok = power_branch(w, 1.0, 1.0, c0, 0);
      break;
    }
    case Family::YeoJohnson: {
      // Each side of the branch point z = 0 separately; near it, terms change sign, so the
      // node must also stay within rho |w| of its centre. One log1p and one expm1 per node:
      // c0 = +-expm1(L) keeps full precision near w = 0, and W^p = exp(L) = 1 +- c0 (no
      // cancellation: the two terms have the same sign).
      if (r > kRho * std::fabs(w)) return false;
      if (w > 0.0) {
        if (lambda == 0.0) {
          if (r > kExpReach) return false;
          c0 = w <= zreach_[0] ? near_zero(w) : std::expm1(w);
          ok = exp_branch(1.0, 1.0, 1.0 + c0);
        } else {
          const double W = 1.0 + lambda * w;
          if (!(W > 0.0) || r * std::fabs(lambda) > reach_[0] * W) return false;
          c0 = w <= zreach_[0] ? near_zero(w) : std::expm1(std::log1p(lambda * w) / lambda);
          ok = power_branch(W, lambda, 1.0, 1.0 + c0, 0);
        }
      } else {
        const double m = 2.0 - lambda;
        if (m == 0.0) {
          if (r > kExpReach) return false;
          c0 = -w <= zreach_[1] ? near_zero(w) : -std::expm1(-w);
          ok = exp_branch(-1.0, -1.0, 1.0 - c0);
        } else {
          const double W = 1.0 - m * w;
          if (!(W > 0.0) || r * std::fabs(m) > reach_[1] * W) return false;
          c0 = -w <= zreach_[1] ? near_zero(w) : -std::expm1(std::log1p(-m * w) / m);
          ok = power_branch(W, -m, -1.0, 1.0 - c0, 1);
        }
      }
      break;
    }
    case Family::Asinh: {
      if (r > kRho * std::fabs(w) || r > kExpReach) return false;
      const double sh = std::sinh(w), ch = std::cosh(w);
      c0 = sh;
      for (int k = 1; k <= K; ++k) c[k] = (k % 2 ? ch : sh) * tb.inv_fact[k];
      ok = true;
      break;
    }
    case Family::Logit: {
      if (r > kLogisticReach) return false;
      // For w >= 0 expand 1 - logistic(-w - d), whose coefficients are small, and use
      // (-d)^k = (-1)^k d^k.
      const bool upper = w >= 0.0;
      const double y = math::logit_inverse(upper ? -w : w);
      c0 = math::logit_inverse(w);
      for (int k = 1; k <= K; ++k) {
        const double* q = &logistic_[static_cast<std::size_t>(k * (K + 2))];
        double v = 0.0;
        for (int i = k + 1; i >= 1; --i) v = v * y + q[i];
        v *= y;
        c[k] = upper ? ((k % 2) ? v : -v) : v;
      }
      ok = true;
      break;
    }
    default:
      return false;
  }
  if (!ok || !std::isfinite(c0)) return false;
  if (check_ends && (invert_bounded(t_, mu + nd.lo).bounded || invert_bounded(t_, mu + nd.hi).bounded))
    return false;
  if (!summed)
    for (int k = kmax; k >= 1; --k) tail += c[k] * mom[k - 1];
  const double sum = cnt * c0 + tail;
  if (!std::isfinite(sum)) return false;
  *vsum = sum;
  if (work) {
    work->series_terms += static_cast<std::size_t>(kmax);
    if (!zpoly_[0].empty() && std::fabs(w) <= zreach_[w > 0.0 ? 0 : 1]) ++work->zero_polynomial;
  }
  return true;
}

BackValue Smearing::mean(double mu, SmearingWork* work) const {
  BackValue b;
  if (std::isnan(mu)) return b;
  const double n = static_cast<double>(e_.size());
  if (!std::isfinite(mu)) return invert_bounded(t_, mu);  // every term is the same limit
  const TransformSpec& s = t_.spec();
  if (kind_ == Kind::Identity) {
    b.value = x_sum(n * mu + e_sum_, n) / n;
    b.bounded = !std::isfinite(b.value);
    return b;
  }
  if (kind_ == Kind::Exponential) {
    // exp(mu + e_max) * mean(exp(e_j - e_max)): no term exceeds the first factor.
    const double vmax = math::inverse(s.family, mu + top_, s.lambda);
    if (!std::isfinite(vmax)) {
      b.value = x_sum(math::kInf, 1.0);
      b.bounded = true;
      return b;
    }
    b.value = x_sum(vmax * exp_sum_, n) / n;
    return b;
  }

  // Do the row's extreme in-range terms overflow? (The inverse is monotone, so they bound the
  // others.) Only then must accepted nodes check their ends.
  const std::size_t N = e_.size();
  auto ok = [&](std::size_t j) { return math::in_range(s.family, mu + e_[j], s.lambda); };
  std::size_t a = 0, z = 0;  // in-range residuals [a, z)
  if (ok(0)) {
    std::size_t lo = 0, hi = N;  // first index not in range (prefix form)
    if (ok(N - 1)) lo = N;
    while (lo < hi) {
      const std::size_t mid = lo + (hi - lo) / 2;
      if (ok(mid)) lo = mid + 1;
      else hi = mid;
    }
    a = 0;
    z = lo;
  } else if (ok(N - 1)) {
    std::size_t lo = 0, hi = N - 1;  // first index in range (suffix form)
    while (lo < hi) {
      const std::size_t mid = lo + (hi - lo) / 2;
      if (ok(mid)) hi = mid;
      else lo = mid + 1;
    }
    a = lo;
    z = N;
  }
  bool check_ends = false;
  if (z > a) {
    const double za = mu + e_[a], zz = mu + e_[z - 1];
    if (!(za >= safe_lo_ && zz <= safe_hi_))  // beyond the interval known to be unflagged
      check_ends = invert_bounded(t_, za).bounded || invert_bounded(t_, zz).bounded;
  }

  double xs = 0.0;
  bool bounded = false;
  std::array<int, 2 * kMaxDepth + 4> stack;  // no initialisation needed: read only below top
  int top = 0;
  stack[static_cast<std::size_t>(top++)] = 0;
  while (top > 0) {
    const int id = stack[static_cast<std::size_t>(--top)];
    const Node& nd = node(id);
    if (nd.kids >= 0) prefetch_line(&node(nd.kids));  // in case the node is split
    const double cnt = static_cast<double>(nd.i1 - nd.i0);
    const double zlo = mu + nd.lo, zhi = mu + nd.hi;
    // In range exactly when the index lies in [a, z), found above with the same test.
    const std::size_t j0 = nd.i0, j1 = nd.i1 - 1u;
    const bool in_lo = j0 >= a && j0 < z, in_hi = j1 >= a && j1 < z;
    if (!in_lo && !in_hi) {
      const BackValue u = invert_bounded(t_, zlo), v = invert_bounded(t_, zhi);
      if (u.value == v.value) {  // wholly beyond the limit: every term is the limit value
        xs += cnt * u.value;
        bounded = true;
        if (work) ++work->limit_nodes;
        continue;
      }
    } else if (in_lo && in_hi) {
      if (nd.lo == nd.hi) {
        const BackValue u = invert_bounded(t_, zlo);
        xs += cnt * u.value;
        bounded = bounded || u.bounded;
        if (work) ++work->series_nodes;
        continue;
      }
      const double* mom = &mom_[static_cast<std::size_t>(id) * K];
      prefetch_moments(mom);
      double vs = 0.0;
      if (series(nd, mom, mu, check_ends, &vs, work)) {
        xs += x_sum(vs, cnt);
        if (work) ++work->series_nodes;
        continue;
      }
    }
    if (nd.kids < 0) {
      xs += direct(nd.i0, nd.i1, mu, in_lo && in_hi, &bounded, work);
      if (work) work->direct_terms += nd.i1 - nd.i0;
      continue;
    }
    stack[static_cast<std::size_t>(top++)] = nd.kids;
    stack[static_cast<std::size_t>(top++)] = nd.kids + 1;
  }
  b.value = xs / n;
  b.bounded = bounded;
  return b;
}

}  // namespace powerback
