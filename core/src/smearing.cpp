// The smearing mean in linear time: closed forms for the identity and log families, a tree of
// residual power sums with local series for the others (see smearing.hpp for the accuracy).
// This file answers the rows; smearing_build.cpp builds the tree.
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
