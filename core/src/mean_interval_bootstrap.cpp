// Residual-bootstrap percentile intervals for the original-scale mean (see mean_interval.hpp):
// the design and its factorisation stay fixed, the transform stays fixed, each replicate refits
// the coefficients and recomputes the mean of every output.
#include <algorithm>
#include <cmath>
#include <random>

#include "mean_interval_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {
namespace detail {

namespace {

// R's quantile type 7 of sorted values: linear interpolation at (n - 1) p.
double quantile7(const std::vector<double>& v, double p) {
  const double h = static_cast<double>(v.size() - 1) * p;
  const std::size_t lo = static_cast<std::size_t>(std::floor(h));
  const std::size_t hi = std::min(v.size() - 1, lo + 1);
  return v[lo] + (h - static_cast<double>(lo)) * (v[hi] - v[lo]);
}

}  // namespace

MeanIntervals bootstrap_mean_intervals(const Model& model, const Eigen::MatrixXd& rows,
                                       const std::vector<char>& /*missing*/, const Grouping& g,
                                       const MeanIntervals& point, const MeanIntervalOptions& opt) {
  const LeastSquares& ls = model.least_squares();
  const auto design = ls.design();  // a view (owned or borrowed), no copy
  const Eigen::VectorXd& e = model.smearing_residuals();
  const std::size_t n = static_cast<std::size_t>(e.size());
  const double df = static_cast<double>(model.df_residual());
  require(n == ls.n(), "internal: residuals and design differ in length");
  // Fitted values in the least-squares space (sqrt(w) x'b when weighted).
  const Eigen::VectorXd fitted = design * usable_coefficients(model.coefficients());
  // Modified residuals: scaled to variance sigma^2 and centred.
  Eigen::VectorXd r = e * std::sqrt(static_cast<double>(n) / df);
  r.array() -= r.mean();

  const std::size_t G = g.rows.size(), B = opt.replicates;
  std::vector<double> values(G * B, math::kNaN);
  std::mt19937_64 rng(opt.seed);
  Eigen::VectorXd zstar(static_cast<Eigen::Index>(n));
  for (std::size_t rep = 0; rep < B; ++rep) {
    poll_cancel();
    for (std::size_t i = 0; i < n; ++i)
      zstar(static_cast<Eigen::Index>(i)) =
          fitted(static_cast<Eigen::Index>(i)) + r(static_cast<Eigen::Index>(uniform_index(rng, n)));
    const Eigen::VectorXd bstar = usable_coefficients(ls.coefficients(zstar));
    const Eigen::VectorXd estar = zstar - design * bstar;
    const double sstar = std::sqrt(estar.squaredNorm() / df);
    const MeanEvaluator ev(model.response(), opt.mean_method, estar.data(), n, sstar);
    const Eigen::VectorXd mu = rows * bstar;
    for (std::size_t k = 0; k < G; ++k) {
      if (point.flags[k] & kPredMissing) continue;
      double sum = 0;
      for (std::size_t row : g.rows[k]) sum += ev.mean(mu(static_cast<Eigen::Index>(row))).value;
      values[k * B + rep] = sum / static_cast<double>(g.rows[k].size());
    }
  }

  MeanIntervals out = point;
  const double alpha = (1.0 - opt.level) / 2.0;
  std::vector<double> v;
  for (std::size_t k = 0; k < G; ++k) {
    if (out.flags[k] & kPredMissing) continue;
    v.assign(values.begin() + static_cast<std::ptrdiff_t>(k * B),
             values.begin() + static_cast<std::ptrdiff_t>((k + 1) * B));
    const bool all_finite = std::all_of(v.begin(), v.end(), [](double x) { return std::isfinite(x); });
    if (!all_finite) {
      out.flags[k] |= kMeanReplicateFailed;
      continue;
    }
    double s = 0, s2 = 0;
    for (double x : v) s += x;
    const double mean = s / static_cast<double>(B);
    for (double x : v) s2 += (x - mean) * (x - mean);
    out.se[k] = std::sqrt(s2 / static_cast<double>(B - 1));
    std::sort(v.begin(), v.end());
    out.lower[k] = quantile7(v, alpha);
    out.upper[k] = quantile7(v, 1.0 - alpha);
  }
  return out;
}

}  // namespace detail
}  // namespace powerback
