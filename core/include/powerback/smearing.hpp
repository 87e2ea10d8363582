// powerback/smearing.hpp — Duan's smearing mean for many rows at a cost linear in the rows.
//
// The smearing estimate of E[y] at a transformed-scale fit mu is
//   m(mu) = (1/n) sum_j T^{-1}(mu + e_j),
// e_1..e_n the training residuals (Duan 1983, JASA 78, 605-610). Evaluated pair by pair it costs
// n per row. Smearing is built once from the residuals and then answers each row without
// visiting every residual:
//   - identity: mu + mean(e);
//   - log, log10 and Box-Cox with lambda 0 (the closed form): v = exp(mu + e_max) *
//     mean(exp(e_j - e_max)) (10^ for log10), e_max the largest residual so that no term
//     overflows unless the pairwise sum would;
//   - every other family: the residuals are sorted and grouped into a binary tree of value
//     ranges. A node is split at its centre value, moved if needed so that each child keeps at
//     least an eighth of its residuals (depth at most log(n / 32) / log(8 / 7); in a long tail
//     the spine towards the extreme residuals stays short). A node whose range [c - r, c + r]
//     lies inside one smooth branch of the inverse g (on the family's argument v) and far enough
//     from its range limit and branch point adds
//       sum_j g(w + d_j) = sum_{k=0..K} g^(k)(w)/k! * M_k,  w = mu + c, d_j = e_j - c,
//     with the node's residual power sums M_k = sum_j d_j^k stored at construction (K = 26);
//     g^(k)(w)/k! comes from g(w) by a recurrence (two transcendental calls per node at most).
//     Nodes too close to a limit are split; leaves (at most 32 residuals) there are summed
//     directly; nodes wholly beyond the range limit add their count times the limit value.
//   - Yeo-Johnson near its branch point z = 0: each side's inverse is analytic there, and its
//     Taylor polynomial of degree 10 at z = 0 replaces log1p/expm1 for leaf terms and node
//     centres within a reach computed at construction: the largest |z| (from a grid) where the
//     polynomial's tail is below 2^-54 |g(z)| and its terms beyond the first sum to at most
//     |g(z)| / 2 (so Horner's rule loses a few ulp at most).
//
// Accuracy. A node is accepted only where its series is both short and well conditioned:
// powers (W + s d)^p need |s r / W| <= X(p), the largest |x| for which the binomial series of
// (1 + x)^p cut after K terms leaves a tail below 2^-53 of the smallest value (1 -+ |x|)^p and
// sums absolute terms at most 64 times it; exponential-type inverses (exp, sinh) need r <= 2
// (tail 2^27/27! = 1e-20, conditioning e^4); the logistic needs r <= pi/4, a quarter of the
// distance to its nearest complex pole; near a sign change of the terms (Yeo-Johnson's and
// the sign-preserving power's branch point, sinh at 0) a node must stay within 0.9 |w| of its
// centre. A node's series stops at the first k past the terms' peak with |g^(k)(w)/k!| r^k
// below 2^-60 |g(w)| (the node's sum is at least |g(w)| / 64 per residual). The result agrees
// with the pairwise mean to well within 1e-12 relative to mean_j |T^{-1}(mu + e_j)| (checked in
// the tests against the pairwise sum, itself exact only to ~n ulp). Which terms lie beyond the
// range limit, and so the `bounded` flag, is decided with the same floating-point test as the
// pairwise mean: the range is an interval in z and z = mu + e_j is monotone in e_j, so one
// binary search per row finds the in-range residuals and a node's two end indices decide it.
// Overflow: when the extreme terms of a row overflow, accepted nodes must have finite ends,
// else they are summed directly, so non-finite terms give the same Inf and flag. (The unflagged
// z form an interval, found to adjacent doubles at construction; a row whose extreme terms lie
// in it need not evaluate them.)
//
// Cost: O(n log n) to build, O(n K) memory (nodes of 32 bytes, the two children of a node in one
// cache line, their power sums fetched ahead of use); per row the number of accepted nodes (a
// handful when the residual spread is small against the distance to the limit, about one per
// tree level on each side of a limit or branch point inside the residuals) times the terms each
// needs, plus at most a few leaves there. At most 2^31 - 2 residuals.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "powerback/backtransform.hpp"
#include "powerback/transform.hpp"

namespace powerback {

// How a query was evaluated (for tests and benchmarks).
struct SmearingWork {
  std::size_t series_nodes = 0;   // nodes summed by their power series
  std::size_t series_terms = 0;   // Taylor terms (beyond the constant) those nodes used
  std::size_t direct_terms = 0;   // residuals summed one by one
  std::size_t limit_nodes = 0;    // nodes wholly beyond the range limit
  std::size_t zero_polynomial = 0;  // Yeo-Johnson: node centres and residuals evaluated by the
                                    // polynomials at the branch point
};

class Smearing {
 public:
  // Copies the residuals (and sorts them, except for the closed forms). Throws Error(Argument) for n == 0 or a NULL pointer with
  // n > 0, Error(NonFinite) for a non-finite residual.
  Smearing(const Transform& t, const double* residuals, std::size_t n);

  std::size_t n() const { return e_.size(); }

  // m(mu) in original units, with `bounded` when any term used the range limit or overflowed.
  // NaN mu gives NaN. Thread-safe (const).
  BackValue mean(double mu, SmearingWork* work = nullptr) const;

 private:
  enum class Kind { Identity, Exponential, Tree };
  // One node of the residual tree in 32 bytes; the two children of a node sit side by side in
  // one 64-byte line, since a query reads both (the node ends are stored so that a query need
  // not fetch them from the residuals).
  struct Node {
    double lo = 0, hi = 0;          // its smallest and largest residual
    std::uint32_t i0 = 0, i1 = 0;   // sorted residuals [i0, i1)
    std::int32_t kids = -1;         // id of the left child (the right one is kids + 1); -1: leaf
    std::uint32_t unused = 0;
    double centre() const { return 0.5 * lo + 0.5 * hi; }
  };
  struct alignas(64) NodePair {
    Node side[2];
  };
  const Node& node(int id) const { return pairs_[static_cast<std::size_t>(id) >> 1].side[id & 1]; }
  Node& node(int id) { return pairs_[static_cast<std::size_t>(id) >> 1].side[id & 1]; }
  void build(int id, std::size_t i0, std::size_t i1, int depth);
  void find_safe_interval();
  void moments_of_leaf(int id);
  void moments_from_children(int id);
  // sum over the node of g(mu + e_j) on the v scale by its series; false when the node is not
  // accepted at this mu (then the caller splits it).
  bool series(const Node& nd, const double* mom, double mu, bool check_ends, double* vsum,
              SmearingWork* work) const;
  // sum of x (original units) over residuals [i0, i1) one by one; in_range: all of them lie in
  // the inverse's range.
  double direct(std::size_t i0, std::size_t i1, double mu, bool in_range, bool* bounded,
                SmearingWork* work) const;
  // Yeo-Johnson's inverse by its polynomial at the branch point (|z| within zreach_ of its side).
  double near_zero(double z) const;
  // sum of x over `count` terms whose v-sum is vsum.
  double x_sum(double vsum, double count) const;

  Transform t_;
  Kind kind_ = Kind::Tree;
  std::vector<double> e_;        // sorted residuals
  double e_sum_ = 0;             // identity: sum of residuals
  double exp_sum_ = 0;           // exponential: sum of base^(e_j - e_max)
  double top_ = 0;               // exponential: e_max
  std::vector<NodePair> pairs_;  // node ids 2 p and 2 p + 1; the root is id 0 (id 1 unused)
  std::vector<double> mom_;      // K power sums about each node's centre, by node id
  std::vector<double> binom_[2]; // binom(p, k) of the two power branches (Yeo-Johnson: z>=0, z<0)
  double reach_[2] = {0, 0};     // largest accepted |s r / W| of each power branch
  std::vector<double> zpoly_[2]; // Yeo-Johnson: Taylor coefficients at z = 0 of each side
  double zreach_[2] = {-1, -1};  // ... and the largest |z| where they are exact to rounding
  // Every z in [safe_lo_, safe_hi_] has an in-range, finite inverse (empty when safe_lo_ > safe_hi_).
  double safe_lo_ = 1.0, safe_hi_ = -1.0;
  std::vector<double> logistic_; // coefficients of the logistic's k-th derivative / k!, by k
  int depth_ = 0;
};

}  // namespace powerback
