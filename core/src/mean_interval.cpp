// Delta-method intervals for the original-scale mean at new rows and over groups of rows (see
// mean_interval.hpp for the formulas, the cost and the accuracy).
#include "powerback/mean_interval.hpp"

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <string>

#include "mean_interval_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {
namespace detail {

namespace {

// Five-point central difference of f at x with step h (error O(h^4)).
template <class F>
double derivative5(F f, double x, double h) {
  const double a = f(x + h), b = f(x - h), c = f(x + 2 * h), d = f(x - 2 * h);
  if (!std::isfinite(a) || !std::isfinite(b) || !std::isfinite(c) || !std::isfinite(d))
    return math::kNaN;
  return (8.0 * (a - b) - (c - d)) / (12.0 * h);
}

double exponential_scale(const TransformSpec& s) {
  if (s.family == Family::Log || (s.family == Family::BoxCox && s.lambda == 0.0)) return 1.0;
  if (s.family == Family::Log10) return math::kLn10;
  return 0.0;
}

}  // namespace

MeanEvaluator::MeanEvaluator(const Transform& t, MeanMethod method, const double* resid,
                             std::size_t n, double sigma)
    : t_(t), method_(method), sigma_(sigma) {
  const TransformSpec& s = t.spec();
  a_ = exponential_scale(s);
  sign_ = s.reflect ? -1.0 : 1.0;
  identity_ = s.family == Family::Identity;
  if (method == MeanMethod::Smearing) smear_.reset(new Smearing(t, resid, n));
}

BackValue MeanEvaluator::mean(double mu) const {
  if (method_ == MeanMethod::Smearing) return smear_->mean(mu);
  return normal_mean(t_, mu, sigma_);
}

double MeanEvaluator::normal_at(double mu, double s) const { return normal_mean(t_, mu, s).value; }

MeanDerivatives MeanEvaluator::at(double mu) const {
  MeanDerivatives d;
  const BackValue mv = mean(mu);
  d.mean = mv.value;
  d.bounded = mv.bounded;
  d.d_sigma2 = math::kNaN;
  if (!std::isfinite(mu)) {
    d.d_mu = math::kNaN;
    return d;
  }
  const TransformSpec& s = t_.spec();
  const bool normal = method_ == MeanMethod::Normal;
  if (identity_) {
    d.d_mu = sign_;
    if (normal) d.d_sigma2 = 0.0;
    return d;
  }
  if (a_ != 0.0) {
    // v-scale mean m_v = exp(a mu) E[exp(a e)]: dm_v/dmu = a m_v, and for the normal mean
    // m_v = exp(a mu + a^2 sigma^2 / 2), dm_v/dsigma^2 = a^2 m_v / 2.
    const double mvv = s.reflect ? s.pivot + s.shift - d.mean : d.mean + s.shift;
    d.d_mu = sign_ * a_ * mvv;
    if (normal) d.d_sigma2 = sign_ * 0.5 * a_ * a_ * mvv;
    return d;
  }
  const double h = 1e-4 * std::max(1.0, std::fabs(mu));
  d.d_mu = derivative5([&](double x) { return mean(x).value; }, mu, h);
  if (normal && sigma_ > 0.0) {
    const double hs = 1e-4 * sigma_;
    const double ds = derivative5([&](double x) { return normal_at(mu, x); }, sigma_, hs);
    d.d_sigma2 = ds / (2.0 * sigma_);
  }
  return d;
}

Eigen::MatrixXd mean_design_rows(const Model& model, const double* Xnew, std::size_t m,
                                 std::size_t p, std::vector<char>& missing) {
  const std::size_t c0 = model.intercept() ? 1 : 0;
  require(p + c0 == model.columns(), "new data have " + std::to_string(p) +
                                         " predictor columns; the model was fitted with " +
                                         std::to_string(model.columns() - c0));
  require(Xnew != nullptr || m == 0 || p == 0, "the new predictor matrix is NULL");
  missing.assign(m, 0);
  Eigen::MatrixXd rows(static_cast<Eigen::Index>(m), static_cast<Eigen::Index>(model.columns()));
  if (c0) rows.col(0).setOnes();
  for (std::size_t j = 0; j < p; ++j)
    for (std::size_t i = 0; i < m; ++i) {
      const double v = Xnew[j * m + i];
      const bool ok = std::isfinite(v);
      rows(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j + c0)) = ok ? v : 0.0;
      if (!ok) missing[i] = 1;
    }
  return rows;
}

Grouping make_grouping(std::size_t m, const std::size_t* group, std::size_t n_groups) {
  Grouping g;
  g.of_row.resize(m);
  if (!group) {
    g.rows.resize(m);
    for (std::size_t i = 0; i < m; ++i) {
      g.of_row[i] = i;
      g.rows[i].push_back(i);
    }
    return g;
  }
  g.rows.resize(n_groups);
  for (std::size_t i = 0; i < m; ++i) {
    if (group[i] >= n_groups)
      throw Error(ErrorCode::Argument, "group id " + std::to_string(group[i]) + " of row " +
                                           std::to_string(i) + " is not below the number of groups (" +
                                           std::to_string(n_groups) + ")");
    g.of_row[i] = group[i];
    g.rows[group[i]].push_back(i);
  }
  for (std::size_t k = 0; k < n_groups; ++k)
    if (g.rows[k].empty())
      throw Error(ErrorCode::Argument, "group " + std::to_string(k) +
                                           " has no rows: number the groups 0.." +
                                           std::to_string(n_groups) + "-1 without gaps");
  return g;
}

Eigen::VectorXd usable_coefficients(const Eigen::VectorXd& coef) {
  Eigen::VectorXd b = coef;
  for (Eigen::Index j = 0; j < b.size(); ++j)
    if (std::isnan(b(j))) b(j) = 0.0;
  return b;
}

double z_quantile(double level) {
  const boost::math::normal n01;
  return boost::math::quantile(boost::math::complement(n01, (1.0 - level) / 2.0));
}

}  // namespace detail

using detail::Grouping;
using detail::ResidualTerms;
using detail::residual_terms;

std::size_t uniform_index(std::mt19937_64& rng, std::size_t n) {
  const std::uint64_t N = static_cast<std::uint64_t>(n);
  const std::uint64_t floor_reject = (0 - N) % N;  // 2^64 mod N
  std::uint64_t x;
  do x = rng();
  while (x < floor_reject);
  return static_cast<std::size_t>(x % N);
}

MeanDerivatives mean_derivatives(const Model& model, double mu, MeanMethod method) {
  const Eigen::VectorXd& e = model.smearing_residuals();
  const detail::MeanEvaluator ev(model.response(), method, e.data(),
                                 static_cast<std::size_t>(e.size()), model.sigma());
  return ev.at(mu);
}

namespace detail {
MeanIntervals bootstrap_mean_intervals(const Model& model, const Eigen::MatrixXd& rows,
                                       const std::vector<char>& missing, const Grouping& g,
                                       const MeanIntervals& point, const MeanIntervalOptions& opt);
}

MeanIntervals mean_intervals(const Model& model, const double* Xnew, std::size_t m, std::size_t p,
                             const std::size_t* group, std::size_t n_groups,
                             const MeanIntervalOptions& opt) {
  require(std::isfinite(opt.level) && opt.level > 0.0 && opt.level < 1.0,
          "level must lie strictly between 0 and 1 (e.g. 0.95), not " + format_number(opt.level));
  require(opt.mean_method == MeanMethod::Smearing || opt.mean_method == MeanMethod::Normal,
          "unknown mean method");
  if (opt.method == MeanIntervalMethod::Bootstrap)
    require(opt.replicates >= kMeanMinReplicates,
            "the bootstrap needs at least " + std::to_string(kMeanMinReplicates) +
                " replicates (999 is usual for a 95% interval), not " + std::to_string(opt.replicates));
  std::vector<char> missing;
  const Eigen::MatrixXd rows = detail::mean_design_rows(model, Xnew, m, p, missing);
  const Grouping g = detail::make_grouping(m, group, n_groups);
  const std::size_t G = g.rows.size();
  if (opt.method == MeanIntervalMethod::Bootstrap && G > 0)
    require(opt.replicates <= kMeanBootstrapMaxValues / G,
            "the bootstrap would store " + std::to_string(opt.replicates) + " replicates x " +
                std::to_string(G) + " outputs, more than " + std::to_string(kMeanBootstrapMaxValues) +
                " values: use fewer replicates, fewer groups or the delta method");

  const Eigen::VectorXd b = detail::usable_coefficients(model.coefficients());
  const Eigen::VectorXd muv = rows * b;
  std::vector<double> mu(muv.data(), muv.data() + m);
  const Eigen::VectorXd& e = model.smearing_residuals();
  const double sigma = model.sigma();
  const detail::MeanEvaluator ev(model.response(), opt.mean_method, e.data(),
                                 static_cast<std::size_t>(e.size()), sigma);

  MeanIntervals out;
  out.fit.assign(G, math::kNaN);
  out.se.assign(G, math::kNaN);
  out.lower.assign(G, math::kNaN);
  out.upper.assign(G, math::kNaN);
  out.flags.assign(G, 0u);
  out.rows.resize(G);
  Eigen::MatrixXd grad = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(G), rows.cols());
  std::vector<double> d_s2(G, 0.0), slope(G, 0.0);
  for (std::size_t k = 0; k < G; ++k) {
    out.rows[k] = g.rows[k].size();
    double sum = 0;
    for (std::size_t r : g.rows[k]) {
      if (missing[r]) {
        out.flags[k] |= kPredMissing;
        continue;
      }
      const MeanDerivatives d = ev.at(mu[r]);
      if (d.bounded || !std::isfinite(d.mean)) out.flags[k] |= kPredBounded;
      sum += d.mean;
      grad.row(static_cast<Eigen::Index>(k)) += d.d_mu * rows.row(static_cast<Eigen::Index>(r));
      d_s2[k] += d.d_sigma2;
      slope[k] += d.d_mu;
    }
    const double inv = 1.0 / static_cast<double>(g.rows[k].size());
    grad.row(static_cast<Eigen::Index>(k)) *= inv;
    d_s2[k] *= inv;
    slope[k] *= inv;
    if (!(out.flags[k] & kPredMissing)) out.fit[k] = sum * inv;
  }
  if (G == 0) return out;
  if (opt.method == MeanIntervalMethod::Bootstrap)
    return detail::bootstrap_mean_intervals(model, rows, missing, g, out, opt);

  const LeastSquares& ls = model.least_squares();
  const double n_res = static_cast<double>(e.size());
  const double df = static_cast<double>(model.df_residual());
  const double z = detail::z_quantile(opt.level);
  ResidualTerms rt;
  Eigen::VectorXd one_proj;
  if (opt.mean_method == MeanMethod::Smearing) {
    rt = residual_terms(model, ev, g, mu, missing, slope);
    grad -= rt.w;
    // (D'D)^{-1} D' 1: the sum over i of the weights c_i with which the coefficients' error
    // g'(D'D)^{-1} D' eps loads each error; 0 for an unweighted model with an intercept.
    one_proj = detail::usable_coefficients(ls.coefficients(Eigen::VectorXd::Ones(static_cast<Eigen::Index>(ls.n()))));
  }
  const Eigen::VectorXd vf = ls.variance_factor(grad);
  for (std::size_t k = 0; k < G; ++k) {
    if (out.flags[k] & kPredMissing) continue;
    double var = sigma * sigma * vf(static_cast<Eigen::Index>(k));
    if (opt.mean_method == MeanMethod::Smearing) {
      const double csum = grad.row(static_cast<Eigen::Index>(k)).dot(one_proj);
      var += rt.s2[k] / n_res + 2.0 * csum * rt.cov[k] / n_res;
    } else {
      var += d_s2[k] * d_s2[k] * 2.0 * sigma * sigma * sigma * sigma / df;
    }
    const double se = std::sqrt(var), M = out.fit[k];
    out.se[k] = se;
    if (M > 0.0 && std::isfinite(M)) {
      const double half = z * se / M;
      out.lower[k] = M * std::exp(-half);
      out.upper[k] = M * std::exp(half);
    } else {
      out.flags[k] |= kMeanLinearScale;
      out.lower[k] = M - z * se;
      out.upper[k] = M + z * se;
    }
  }
  return out;
}

}  // namespace powerback
