// The residual parts of the smearing mean's delta variance (see mean_interval.hpp): closed forms
// for the identity and exponential families, direct or residual-quantile sums otherwise.
#include <algorithm>
#include <cmath>

#include "mean_interval_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {
namespace detail {

namespace {

// The residuals the variance term sums over for families without a closed form: all of them,
// or q evenly spaced order statistics when n x rows is large (see mean_interval.hpp).
std::vector<double> residual_sample(const Eigen::VectorXd& e, std::size_t rows) {
  const std::size_t n = static_cast<std::size_t>(e.size());
  std::vector<double> all(e.data(), e.data() + n);
  if (rows == 0 || n <= kMeanDirectPairs / rows) return all;
  const std::size_t q = std::min(n, std::max(kMeanMinQuantiles, kMeanDirectPairs / rows));
  std::sort(all.begin(), all.end());
  std::vector<double> out(q);
  for (std::size_t j = 0; j < q; ++j) {
    const double pos = (static_cast<double>(j) + 0.5) / static_cast<double>(q) * static_cast<double>(n) - 0.5;
    const std::size_t lo = static_cast<std::size_t>(std::max(0.0, std::floor(pos)));
    const std::size_t hi = std::min(n - 1, lo + 1);
    const double f = std::max(0.0, pos - static_cast<double>(lo));
    out[j] = all[lo] + f * (all[hi] - all[lo]);
  }
  return out;
}

// Sample variance (divisor n - 1) of x by Welford's update.
struct Welford {
  double n = 0, mean = 0, m2 = 0;
  void add(double x) {
    n += 1;
    const double d = x - mean;
    mean += d / n;
    m2 += d * (x - mean);
  }
  double variance() const { return n > 1 ? m2 / (n - 1) : math::kNaN; }
};

}  // namespace

// Declared and described in mean_interval_internal.hpp.
ResidualTerms residual_terms(const Model& model, const MeanEvaluator& ev, const Grouping& g,
                             const std::vector<double>& mu, const std::vector<char>& missing,
                             const std::vector<double>& mean_slope) {
  const Transform& t = model.response();
  const Eigen::VectorXd& e = model.smearing_residuals();
  const auto D = model.least_squares().design();  // a view (owned or borrowed), no copy
  const std::size_t G = g.rows.size(), n = static_cast<std::size_t>(e.size());
  const double sign = t.spec().reflect ? -1.0 : 1.0, nd = static_cast<double>(n);
  ResidualTerms out;
  out.s2.assign(G, math::kNaN);
  out.cov.assign(G, math::kNaN);
  out.w = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(G), D.cols());
  const Eigen::RowVectorXd dbar = D.colwise().mean();
  if (t.spec().family == Family::Identity) {
    Welford w;
    for (Eigen::Index i = 0; i < e.size(); ++i) w.add(e(i));
    std::fill(out.s2.begin(), out.s2.end(), w.variance());
    std::fill(out.cov.begin(), out.cov.end(), sign * w.variance());
    for (std::size_t k = 0; k < G; ++k) out.w.row(static_cast<Eigen::Index>(k)) = sign * dbar;
    return out;
  }
  const double a = ev.exp_scale();
  if (a != 0.0) {
    // u_i = sign Q_k exp(a r_i) + const with Q_k = mean_{j in K} exp(a mu_j), written with
    // exp(a (r_i - r_max)) so that no term overflows unless the mean does.
    const double top = e.maxCoeff();
    Welford w;
    double emean = 0, rmean = e.mean(), c = 0;
    Eigen::RowVectorXd ed = Eigen::RowVectorXd::Zero(D.cols());
    for (Eigen::Index i = 0; i < e.size(); ++i) {
      const double ex = std::exp(a * (e(i) - top));
      w.add(ex);
      emean += ex / nd;
      ed += ex * D.row(i) / nd;
    }
    for (Eigen::Index i = 0; i < e.size(); ++i) c += (std::exp(a * (e(i) - top)) - emean) * (e(i) - rmean);
    c /= nd - 1;
    for (std::size_t k = 0; k < G; ++k) {
      double mx = -math::kInf;
      for (std::size_t r : g.rows[k]) mx = std::max(mx, a * mu[r]);
      double s = 0;
      for (std::size_t r : g.rows[k]) s += std::exp(a * mu[r] - mx);
      const double scale = std::exp(mx + std::log(s / static_cast<double>(g.rows[k].size())) + a * top);
      out.s2[k] = scale * scale * w.variance();
      out.cov[k] = sign * scale * c;
      out.w.row(static_cast<Eigen::Index>(k)) = sign * a * scale * ed;
    }
    return out;
  }
  // Other families: sums over residuals and rows, directly below kMeanDirectPairs pairs; above,
  // over residual quantiles, with the gradient part taken as mean slope x mean design row.
  const bool direct = mu.empty() || n <= kMeanDirectPairs / mu.size();
  std::vector<double> sample;
  if (!direct) sample = residual_sample(e, mu.size());
  const double rmean = e.mean();
  for (std::size_t k = 0; k < G; ++k) {
    bool skip = false;
    for (std::size_t r : g.rows[k]) skip = skip || missing[r];
    if (skip) continue;
    const double inv = 1.0 / static_cast<double>(g.rows[k].size());
    const std::size_t count = direct ? n : sample.size();
    Welford w;
    double c = 0;
    std::vector<double> us(count);
    Eigen::RowVectorXd wk = Eigen::RowVectorXd::Zero(D.cols());
    for (std::size_t i = 0; i < count; ++i) {
      const double ei = direct ? e(static_cast<Eigen::Index>(i)) : sample[i];
      double u = 0, slope = 0;
      for (std::size_t r : g.rows[k]) {
        const BackValue x = invert_bounded(t, mu[r] + ei);
        u += x.value;
        // dx/dz = sign / f'(v) = sign exp(-log |dz/dx|); 0 where x sits at the range limit.
        if (direct && !x.bounded) slope += sign * std::exp(-t.log_abs_derivative(x.value));
      }
      us[i] = u * inv;
      w.add(us[i]);
      if (direct) wk += (slope * inv / nd) * D.row(static_cast<Eigen::Index>(i));
    }
    for (std::size_t i = 0; i < count; ++i) c += (us[i] - w.mean) * ((direct ? e(static_cast<Eigen::Index>(i)) : sample[i]) - rmean);
    out.s2[k] = w.variance();
    out.cov[k] = c / (static_cast<double>(count) - 1);
    out.w.row(static_cast<Eigen::Index>(k)) = direct ? wk : Eigen::RowVectorXd(mean_slope[k] * dbar);
    poll_cancel();
  }
  return out;
}


}  // namespace detail
}  // namespace powerback
