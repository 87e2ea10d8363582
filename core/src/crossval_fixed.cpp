// Every training part of a k-fold split fitted from one Q-less factor per fold (see
// crossval.hpp, crossval_fixed).
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include <Eigen/Dense>
#include <boost/math/distributions/students_t.hpp>

#include "powerback/backtransform.hpp"
#include "powerback/cancel.hpp"
#include "powerback/crossval.hpp"
#include "powerback/errors.hpp"
#include "powerback/model.hpp"
#include "powerback/smearing.hpp"
#include "powerback/tall_qr.hpp"

namespace powerback {

namespace {

using Eigen::Index;
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The power of two that brings m (a largest magnitude) into [0.5, 1); 1 for 0 or non-finite.
double pow2_scale(double m) {
  int e = 0;
  if (m > 0 && std::isfinite(m)) std::frexp(m, &e);
  return std::ldexp(1.0, -e);
}

// Factors [R; rows] in place and keeps the new R (at most `cols` rows, upper trapezoidal).
void stack_and_factor(Eigen::MatrixXd& r, const Eigen::MatrixXd& rows) {
  const Index cols = r.cols(), k = r.rows(), nr = rows.rows();
  if (nr == 0) return;
  Eigen::MatrixXd work(k + nr, cols);
  work.topRows(k) = r;
  work.bottomRows(nr) = rows;
  const Eigen::HouseholderQR<Eigen::Ref<Eigen::MatrixXd>> qr(work);
  r = work.topRows(std::min<Index>(k + nr, cols)).triangularView<Eigen::Upper>();
}

struct Problem {
  const int* fold;             // n fold ids in 1..k
  const double* X;
  std::size_t n, p, c0, c;
  const double* w;
  std::vector<double> z;       // T(y), NaN where T cannot be applied
  std::vector<char> usable;    // finite predictors and finite z
  Eigen::VectorXd scale;       // power-of-two scale of each design column
  double zscale = 1;

  bool finite_row(std::size_t i) const {
    for (std::size_t j = 0; j < p; ++j)
      if (!std::isfinite(X[j * n + i])) return false;
    return true;
  }
};

// Design rows [r0, r0 + m), intercept included (each column a contiguous copy).
void rows_of(const Problem& pr, std::size_t r0, std::size_t m, Eigen::MatrixXd& out) {
  out.resize(static_cast<Index>(m), static_cast<Index>(pr.c));
  if (pr.c0) out.col(0).setOnes();
  for (std::size_t j = 0; j < pr.p; ++j)
    out.col(static_cast<Index>(j + pr.c0)) =
        Eigen::Map<const Eigen::VectorXd>(pr.X + j * pr.n + r0, static_cast<Index>(m));
}

struct Block {
  Eigen::MatrixXd r;     // R of the block's rows of positive weight of [X z], scaled
  std::size_t nobs = 0;  // rows of positive weight
  bool invalid = false;  // a row with a non-finite predictor or z
};

// Every fold's block factored in one pass over the rows: each row goes, scaled, to its fold's
// buffer, which is stacked under the fold's R and factored when full (rows in ascending order).
std::vector<Block> factor_blocks(const Problem& pr, const int* fold, std::size_t k) {
  const Index cols = static_cast<Index>(pr.c + 1), c = static_cast<Index>(pr.c);
  const Index cap = static_cast<Index>(kTallBlockRows);
  std::vector<Block> blocks(k);
  std::vector<Eigen::MatrixXd> buf(k, Eigen::MatrixXd(cap, cols));
  std::vector<Index> filled(k, 0);
  for (Block& b : blocks) b.r.resize(0, cols);
  Eigen::MatrixXd x;
  for (std::size_t r0 = 0; r0 < pr.n; r0 += kTallBlockRows) {
    poll_cancel();
    const std::size_t m = std::min(kTallBlockRows, pr.n - r0);
    rows_of(pr, r0, m, x);
    for (std::size_t q = 0; q < m; ++q) {
      const std::size_t i = r0 + q, f = static_cast<std::size_t>(fold[i] - 1);
      Block& b = blocks[f];
      if (!pr.usable[i]) {
        b.invalid = true;
        continue;
      }
      const double wi = pr.w ? pr.w[i] : 1.0;
      if (!(wi > 0)) continue;
      const double s = pr.w ? std::sqrt(wi) : 1.0;
      Eigen::MatrixXd& dst = buf[f];
      dst.row(filled[f]).head(c) =
          (s * x.row(static_cast<Index>(q))).cwiseProduct(pr.scale.transpose());
      dst(filled[f], c) = s * pr.z[i] * pr.zscale;
      ++b.nobs;
      if (++filled[f] == cap) {
        stack_and_factor(b.r, dst);
        filled[f] = 0;
      }
    }
  }
  for (std::size_t f = 0; f < k; ++f)
    if (filled[f] > 0) stack_and_factor(blocks[f].r, buf[f].topRows(filled[f]));
  return blocks;
}

// The fit of fold j's training part from the other blocks' factors; predictions of its rows.
void fit_fold(const Problem& pr, const Transform& t, const std::vector<Block>& blocks,
              const std::vector<std::vector<std::size_t>>& members, std::size_t j, double level,
              double tol, FixedFoldResult& out) {
  const std::size_t k = blocks.size(), c = pr.c;
  const Index ci = static_cast<Index>(c);
  std::size_t nobs = 0;
  for (std::size_t b = 0; b < k; ++b) {
    if (b == j) continue;
    if (blocks[b].invalid) {
      out.status[j] = static_cast<int>(FoldFit::InvalidTraining);
      return;
    }
    nobs += blocks[b].nobs;
  }
  if (nobs == 0) {
    out.status[j] = static_cast<int>(FoldFit::InvalidTraining);
    return;
  }
  poll_cancel();
  Eigen::MatrixXd r(0, ci + 1);
  for (std::size_t b = 0; b < k; ++b)
    if (b != j) stack_and_factor(r, blocks[b].r);

  // lm's rule on the design's part of R, as LeastSquares::factor_with_response applies it
  const Eigen::MatrixXd rx = r.leftCols(ci);
  const Eigen::VectorXd norms = rx.colwise().norm().transpose();
  detail::RankedQR qr;
  try {
    qr = detail::apply_rank_rule(rx, norms, tol);
  } catch (const Error& e) {
    if (e.code() != ErrorCode::Singular) throw;
    out.status[j] = static_cast<int>(FoldFit::RankDeficient);
    return;
  }
  out.rank[j] = qr.kept.size();
  if (!qr.aliased.empty()) {
    out.status[j] = static_cast<int>(FoldFit::RankDeficient);
    return;
  }
  if (nobs <= c) {
    out.status[j] = static_cast<int>(FoldFit::NoResidualDf);
    return;
  }
  const Eigen::MatrixXd rs = qr.packed.topLeftCorner(ci, ci).triangularView<Eigen::Upper>();
  Eigen::VectorXd tz = r.col(ci);
  const Eigen::HouseholderSequence<Eigen::MatrixXd, Eigen::VectorXd> h(qr.packed, qr.hcoeffs);
  tz.applyOnTheLeft(h.adjoint());
  const Eigen::VectorXd b = pr.scale.asDiagonal() *
                            rs.triangularView<Eigen::Upper>().solve(tz.head(ci)) / pr.zscale;
  const double rss = tz.tail(tz.size() - ci).squaredNorm() / (pr.zscale * pr.zscale);
  const std::size_t df = nobs - c;
  const double sigma = std::sqrt(rss / static_cast<double>(df));
  // R of the unscaled design: R'R = X'WX over the training rows
  const Eigen::MatrixXd ru = rs * pr.scale.cwiseInverse().asDiagonal();
  out.status[j] = static_cast<int>(FoldFit::Ok);
  out.df_residual[j] = df;
  out.sigma[j] = sigma;
  for (std::size_t i = 0; i < c; ++i) out.coefficients[j * c + i] = b(static_cast<Index>(i));

  // One pass over the rows in order: the smearing residuals of the training rows (e, or sqrt(w)
  // e over rows of positive weight) and the linear predictor of the held-out rows.
  const int own = static_cast<int>(j) + 1;
  std::vector<double> e;
  e.reserve(nobs);
  Eigen::MatrixXd x;
  Eigen::VectorXd mu;
  Eigen::VectorXd held_mu(static_cast<Index>(members[j].size()));
  std::size_t held = 0;
  for (std::size_t r0 = 0; r0 < pr.n; r0 += kTallBlockRows) {
    poll_cancel();
    const std::size_t m = std::min(kTallBlockRows, pr.n - r0);
    rows_of(pr, r0, m, x);
    mu.noalias() = x * b;
    for (std::size_t q = 0; q < m; ++q) {
      const std::size_t i = r0 + q;
      if (pr.fold[i] == own) {
        held_mu(static_cast<Index>(held++)) = mu(static_cast<Index>(q));
        continue;
      }
      const double wi = pr.w ? pr.w[i] : 1.0;
      if (pr.w && !(wi > 0)) continue;
      const double ei = pr.z[i] - mu(static_cast<Index>(q));
      e.push_back(pr.w ? std::sqrt(wi) * ei : ei);
    }
  }
  const Smearing smear(t, e.data(), e.size());

  const boost::math::students_t td(static_cast<double>(df));
  const double qt = boost::math::quantile(boost::math::complement(td, (1.0 - level) / 2.0));
  // x0' (R'R)^{-1} x0 = ||x0' R^{-1}||^2, for a block of held-out rows at once
  const Eigen::MatrixXd r_inv =
      ru.triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(ci, ci));
  Eigen::MatrixXd v;
  const std::vector<std::size_t>& rows = members[j];
  for (std::size_t at = 0; at < rows.size(); at += kTallBlockRows) {
    const std::size_t m = std::min(kTallBlockRows, rows.size() - at);
    x.resize(static_cast<Index>(m), ci);
    if (pr.c0) x.col(0).setOnes();
    for (std::size_t col = 0; col < pr.p; ++col) {
      const double* src = pr.X + col * pr.n;
      double* dst = x.col(static_cast<Index>(col + pr.c0)).data();
      for (std::size_t q = 0; q < m; ++q) dst[q] = src[rows[at + q]];
    }
    v.noalias() = x * r_inv.triangularView<Eigen::Upper>();
    for (std::size_t q = 0; q < m; ++q) {
      const std::size_t i = rows[at + q];
      const Index qi = static_cast<Index>(q);
      const double mu_i = held_mu(static_cast<Index>(at + q));
      if (!pr.finite_row(i)) {
        out.flags[i] = kPredMissing;
        continue;
      }
      if (!std::isfinite(mu_i)) {
        out.flags[i] = kPredOverflow;
        continue;
      }
      const double half = qt * sigma * std::sqrt(v.row(qi).squaredNorm() + 1.0);
      unsigned flags = 0;
      const BackValue med = median_back(t, mu_i);
      const BackValue mean = smear.mean(mu_i);
      out.median[i] = med.value;
      out.mean[i] = mean.value;
      bool bounded = med.bounded;
      if (std::isfinite(half)) {
        const BackInterval iv = interval_back(t, mu_i - half, mu_i + half);
        out.lower[i] = iv.lower;
        out.upper[i] = iv.upper;
        bounded = bounded || iv.bounded;
      } else {
        flags |= kPredOverflow;
      }
      if (bounded) flags |= kPredBounded;
      out.flags[i] = flags;
    }
  }
}

}  // namespace

FixedFoldResult crossval_fixed(const double* y, const double* X, std::size_t n, std::size_t p,
                               const Transform* response, const int* fold, int k,
                               const FixedFoldOptions& opt) {
  require(n > 0, "there are no rows");
  require(y != nullptr, "the response y is NULL");
  require(X != nullptr || p == 0, "the predictor matrix is NULL");
  require(fold != nullptr, "the fold ids are NULL");
  require(k >= 2, "at least 2 folds are needed, not " + std::to_string(k));
  require(std::isfinite(opt.level) && opt.level > 0.0 && opt.level < 1.0,
          "level must lie strictly between 0 and 1 (e.g. 0.95), not " + format_number(opt.level));
  const std::size_t c0 = opt.intercept ? 1 : 0, c = p + c0;
  require(c > 0, "the design has no columns");
  // Every fold needs a row: more folds than rows is an error before any per-fold allocation.
  require(static_cast<std::size_t>(k) <= n,
          std::to_string(k) + " folds for " + std::to_string(n) +
              " rows: every fold needs at least one row, so use at most " + std::to_string(n) +
              " folds");
  const std::size_t kk = static_cast<std::size_t>(k);
  std::vector<std::vector<std::size_t>> members(kk);
  for (std::size_t i = 0; i < n; ++i) {
    require(fold[i] >= 1 && fold[i] <= k, "the fold id of row " + std::to_string(i) +
                                              " (0-based) is " + std::to_string(fold[i]) +
                                              ", outside 1.." + std::to_string(k));
    members[static_cast<std::size_t>(fold[i] - 1)].push_back(i);
  }
  for (std::size_t j = 0; j < kk; ++j)
    require(!members[j].empty(), "fold " + std::to_string(j + 1) + " has no rows");
  if (opt.weights) require_model_weights(opt.weights, n);

  const Transform t = response ? *response : Transform();
  Problem pr{fold, X, n, p, c0, c, opt.weights, std::vector<double>(n), std::vector<char>(n, 1),
             Eigen::VectorXd(static_cast<Index>(c)), 1.0};
  t.apply(y, n, pr.z.data());  // NaN where T cannot be applied: such a row cannot train
  if (c0) pr.scale(0) = 0.5;   // 1 = 0.5 * 2^1
  for (std::size_t j = 0; j < p; ++j) {
    double m = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const double v = X[j * n + i];
      if (std::isfinite(v)) m = std::max(m, std::fabs(v));
      else pr.usable[i] = 0;
    }
    pr.scale(static_cast<Index>(j + c0)) = pow2_scale(m);
  }
  double zmax = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (std::isfinite(pr.z[i])) zmax = std::max(zmax, std::fabs(pr.z[i]));
    else pr.usable[i] = 0;
  }
  pr.zscale = pow2_scale(zmax);

  FixedFoldResult out;
  out.columns = c;
  out.median.assign(n, kNaN);
  out.mean.assign(n, kNaN);
  out.lower.assign(n, kNaN);
  out.upper.assign(n, kNaN);
  out.flags.assign(n, 0u);
  out.status.assign(kk, static_cast<int>(FoldFit::InvalidTraining));
  out.rank.assign(kk, 0);
  out.df_residual.assign(kk, 0);
  out.sigma.assign(kk, kNaN);
  out.coefficients.assign(kk * c, kNaN);

  const std::vector<Block> blocks = factor_blocks(pr, fold, kk);
  for (std::size_t j = 0; j < kk; ++j) fit_fold(pr, t, blocks, members, j, opt.level, opt.tol, out);
  return out;
}

}  // namespace powerback
