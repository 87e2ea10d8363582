// LambdaSummary's finish: the rank decision on R, the centring, the binned profile at any lambda
// and the search (see accumulate.hpp for the guard and the accuracy contract).
#include <algorithm>
#include <cmath>
#include <limits>

#include "powerback/accumulate_detail.hpp"
#include "powerback/least_squares.hpp"
#include "lambda_internal.hpp"

namespace powerback {
namespace summary_detail {

constexpr double kLog2PiPlus1 = 2.837877066409345483560659472811235279722794947275566825634;
constexpr double kKValid = 5.0;

Finished prepare_finish(const LambdaSummary::State& s) {
  require(s.n > 0, "the summary has no rows: add chunks with rows first");
  require(s.n >= 3, "the summary has " + std::to_string(s.n) +
                        " rows; estimating lambda needs at least 3 finite values");
  require(s.y_min != s.y_max, "y is constant (every value is " + format_number(s.y_min) +
                                  "): no power can be estimated; leave it untransformed");
  Finished f;
  const Eigen::VectorXd norms = s.r.colwise().norm().transpose();
  detail::RankedQR rq = detail::apply_rank_rule(s.r, norms, kRankTolerance);
  f.kept = std::move(rq.kept);
  f.aliased = std::move(rq.aliased);
  const Eigen::Index k = static_cast<Eigen::Index>(f.kept.size());
  f.rk = rq.packed.topLeftCorner(k, k).triangularView<Eigen::Upper>();
  if (s.n <= f.kept.size() + 1)
    throw Error(ErrorCode::Singular,
                "y has " + std::to_string(s.n) + " observations but the design has rank " +
                    std::to_string(f.kept.size()) +
                    " (intercept included): the profile needs n > rank + 1; use fewer predictors");
  if (f.kept.empty() || f.kept[0] != 0)
    throw Error(ErrorCode::Singular, "the design's intercept column is zero");
  for (int g = 0; g < 2; ++g) {
    f.t_min[g] = s.t_min[g];
    f.t_max[g] = s.t_max[g];
  }
  if (s.count[0] == 0 || s.count[1] == 0) {
    f.centred = s.count[1] > 0 ? 1 : 0;
    f.centre = s.t_sum[f.centred].value() / static_cast<double>(s.count[f.centred]);
    f.t_min[f.centred] -= f.centre;
    f.t_max[f.centred] -= f.centre;
  }
  return f;
}

// The log-likelihood's parts that do not depend on the sums of squares.
double loglik_from(const LambdaSummary::State& s, const Finished& f, double lambda, double log_rss) {
  const double n = static_cast<double>(s.n);
  const double jac = (lambda - 1.0) * (s.t_sum[0].value() - s.t_sum[1].value());
  const double shift = f.centred < 0 ? 0.0 : 2.0 * (f.centred == 1 ? 2.0 - lambda : lambda) * f.centre;
  return -0.5 * n * (kLog2PiPlus1 + log_rss + shift - std::log(n)) + jac + 0.5 * s.log_w.value();
}

namespace {

double inverse_factorial(int m) {
  double f = 1.0;
  for (int i = 2; i <= m; ++i) f *= i;
  return 1.0 / f;
}

// The binned profile, with the sums rearranged once for evaluation.
class BinnedEvaluator {
 public:
  BinnedEvaluator(const LambdaSummary::State& s, const Finished& f) : s_(s), f_(f) {
    using St = LambdaSummary::State;
    const std::size_t bins = s.bins(), L = s.L;
    centre_.resize(bins);
    count_.resize(bins);
    sign_.resize(bins);
    second_.resize(bins);
    s1_.assign(bins * St::K, 0.0);
    s2_.assign(bins * St::K, 0.0);
    const std::size_t kk = f.kept.size();
    xm_.assign(bins * kk * St::S, 0.0);
    for (std::size_t b = 0; b < bins; ++b) {
      const int g = s.group[b];
      const double* rec = &s.rec[b * L];
      const double* cmp = &s.comp[b * L];
      centre_[b] = (static_cast<double>(s.key[b]) + 0.5) * kSummaryBinWidth - (f.centred == g ? f.centre : 0.0);
      count_[b] = rec[0] + cmp[0];
      sign_[b] = g ? -1.0 : 1.0;
      second_[b] = static_cast<unsigned char>(g);
      for (int m = 1; m <= St::K; ++m) {
        const double pm = rec[m] + cmp[m];
        s1_[b * St::K + m - 1] = pm * inverse_factorial(m);
        s2_[b * St::K + m - 1] = m >= 2 ? pm * (std::ldexp(1.0, m) - 2.0) * inverse_factorial(m) : 0.0;
      }
      for (std::size_t c = 1; c < kk; ++c) {
        const std::size_t col = f.kept[c] - 1;
        for (int m = 0; m <= St::KC; ++m) {
          const std::size_t at = 1 + St::K + col * St::S + static_cast<std::size_t>(m);
          xm_[(b * kk + c) * St::S + static_cast<std::size_t>(m)] = (rec[at] + cmp[at]) * inverse_factorial(m);
        }
      }
    }
    a_.resize(bins);
    bb_.resize(bins);
    e1_.resize(bins);
    const double n = static_cast<double>(s.n);
    guard_ = std::max(1e-6, 64.0 * n * std::numeric_limits<double>::epsilon());
  }

  bool log_rss(double lambda, double* out) const {
    using St = LambdaSummary::State;
    constexpr int K = St::K, KC = St::KC, S = St::S;
    const double k2 = 2.0 - lambda;
    if ((s_.count[0] > 0 && std::fabs(lambda) > kKValid) || (s_.count[1] > 0 && std::fabs(k2) > kKValid))
      return false;
    const std::size_t bins = centre_.size();
    double m = -std::numeric_limits<double>::infinity();
    for (std::size_t b = 0; b < bins; ++b)
      if (count_[b] > 0.0) m = std::max(m, (second_[b] ? k2 : lambda) * centre_[b]);
    m += 1.0 / 32.0;
    const bool scaled = m > kScaleLimit;
    const double em = scaled ? std::exp(-m) : 1.0;
    CompensatedSum sum;
    double n = 0.0;
    for (std::size_t b = 0; b < bins; ++b) {
      const double k = second_[b] ? k2 : lambda;
      const detail::BinTerms ab = detail::bin_terms(k, centre_[b], scaled, m, em);
      const double e1 = detail::power_sum(&s1_[b * K], 0, K - 1, k);
      a_[b] = sign_[b] * ab.a;
      bb_[b] = sign_[b] * ab.b;
      e1_[b] = e1;
      sum.add(count_[b] * a_[b] + bb_[b] * e1);
      n += count_[b];
    }
    const double wbar = sum.value() / n;
    CompensatedSum tss;
    for (std::size_t b = 0; b < bins; ++b) {
      const double k = second_[b] ? k2 : lambda;
      const double e2 = detail::power_sum(&s2_[b * K], 1, K - 1, k);
      const double da = a_[b] - wbar;
      tss.add(count_[b] * da * da + 2.0 * da * bb_[b] * e1_[b] + bb_[b] * bb_[b] * e2);
    }
    double rss = tss.value();
    const std::size_t kk = f_.kept.size();
    if (kk > 1) {
      // X_k' W z, then R^-T of it: its first coordinate is the weighted mean's, the others carry
      // the explained part of the centred sum of squares.
      std::vector<CompensatedSum> v(kk);
      for (std::size_t b = 0; b < bins; ++b) {
        const double k = second_[b] ? k2 : lambda;
        for (std::size_t c = 1; c < kk; ++c) {
          const double* x = &xm_[(b * kk + c) * S];
          v[c].add(a_[b] * x[0] + bb_[b] * detail::power_sum(x, 1, KC, k));
        }
      }
      Eigen::VectorXd vv(static_cast<Eigen::Index>(kk));
      vv(0) = sum.value();
      for (std::size_t c = 1; c < kk; ++c) vv(static_cast<Eigen::Index>(c)) = v[c].value();
      const Eigen::VectorXd u = f_.rk.transpose().triangularView<Eigen::Lower>().solve(vv);
      rss = tss.value() - u.tail(u.size() - 1).squaredNorm();
      // Too much explained to subtract safely at this n: the caller needs the grid pass.
      if (!(rss > guard_ * tss.value())) return false;
    }
    if (!(rss > 0.0) || !std::isfinite(rss)) return false;
    *out = std::log(rss) + (scaled ? 2.0 * m : 0.0);
    return true;
  }

 private:
  const LambdaSummary::State& s_;
  const Finished& f_;
  std::vector<double> centre_, count_, sign_, s1_, s2_, xm_;
  std::vector<unsigned char> second_;
  mutable std::vector<double> a_, bb_, e1_;
  double guard_ = 1e-6;
};

}  // namespace
}  // namespace summary_detail

bool LambdaSummary::loglik(double lambda, double* out) const {
  const summary_detail::Finished f = summary_detail::prepare_finish(*s_);
  const summary_detail::BinnedEvaluator ev(*s_, f);
  double lr;
  if (!ev.log_rss(lambda, &lr)) return false;
  *out = summary_detail::loglik_from(*s_, f, lambda, lr);
  return true;
}

SummaryLambdaResult LambdaSummary::finish(const LambdaOptions& opt, std::size_t curve_points,
                                          std::size_t pass_points) const {
  using namespace summary_detail;
  check_lambda_options(opt);
  require(curve_points >= 2, "a profile grid needs at least 2 points");
  require(pass_points >= 4, "a grid pass needs at least 4 points");
  const State& s = *s_;
  const Finished f = prepare_finish(s);
  const BinnedEvaluator ev(s, f);
  SummaryLambdaResult res;
  bool failed = false;
  const auto ll = [&](double l) {
    double lr;
    if (!ev.log_rss(l, &lr)) {
      failed = true;
      return -std::numeric_limits<double>::max();
    }
    return loglik_from(s, f, l, lr);
  };
  // Every lambda the search may visit must be served; probe the range first.
  constexpr int kProbes = 121;
  for (int i = 0; i < kProbes && !failed; ++i)
    ll(opt.lower + (opt.upper - opt.lower) * i / (kProbes - 1.0));
  LambdaEstimate est;
  if (!failed) est = search_profile(ll, opt);
  if (failed) {
    res.needs_pass = true;
    res.pass_lower = opt.lower;
    res.pass_upper = opt.upper;
    res.pass_points = pass_points;
    res.note = "the binned sums cannot serve every lambda in [" + format_number(opt.lower) + ", " +
               format_number(opt.upper) +
               "] (a range beyond |k| <= 5, or a fit so close to exact that its residual sum of "
               "squares would lose its digits): evaluate the profile on a grid in one more pass";
    est = LambdaEstimate();
    est.level = opt.level;
    est.lower = opt.lower;
    est.upper = opt.upper;
  } else {
    res.grid = profile_grid(est, curve_points);
    res.loglik.resize(curve_points);
    for (std::size_t i = 0; i < curve_points; ++i) {
      double lr;
      res.loglik[i] = ev.log_rss(res.grid[i], &lr) ? loglik_from(s, f, res.grid[i], lr) : math::kNaN;
    }
  }
  est.family = s.family;
  est.n = static_cast<std::size_t>(s.n);
  est.rank = f.kept.size();
  est.aliased = f.aliased;
  res.estimate = est;
  return res;
}

}  // namespace powerback
