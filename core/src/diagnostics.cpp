// Residual checks of a fitted model: Koenker's Breusch-Pagan, Ramsey's RESET, normality.
#include "powerback/diagnostics.hpp"

#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/fisher_f.hpp>
#include <algorithm>
#include <cmath>
#include <string>

#include "powerback/errors.hpp"
#include "powerback/normality.hpp"
#include "powerback/tall_qr.hpp"

namespace powerback {

namespace {

void breusch_pagan(const Model& m, ResidualChecks& out) {
  const LeastSquares& ls = m.least_squares();
  const Eigen::VectorXd u = m.residuals().array().square().matrix();
  const double tss = (u.array() - u.mean()).square().sum();
  if (!(tss > 0.0)) return;
  double df, rss;
  if (m.intercept()) {
    // The auxiliary regression [1 Z] is the model's own design: its factorisation is reused.
    df = static_cast<double>(ls.rank()) - 1.0;
    rss = ls.rss(u);
  } else {
    // A model without an intercept: the auxiliary regression still has one, so that R^2 is the
    // centred one; its df are the regressors not aliased with it.
    const Eigen::Index n = static_cast<Eigen::Index>(m.n());
    Eigen::MatrixXd z(n, static_cast<Eigen::Index>(ls.rank()));
    for (std::size_t i = 0; i < ls.rank(); ++i)
      z.col(static_cast<Eigen::Index>(i)) = ls.design().col(static_cast<Eigen::Index>(ls.kept()[i]));
    const LeastSquares aux(z.data(), m.n(), ls.rank(), true);
    df = static_cast<double>(aux.rank()) - 1.0;
    rss = aux.rss(u);
  }
  if (df < 1.0) return;
  out.bp_statistic = static_cast<double>(m.n()) * (1.0 - rss / tss);
  out.bp_df = df;
  // Residuals too large to square (or an aux fit that overflowed) give no statistic: p stays NaN.
  if (!std::isfinite(out.bp_statistic)) return;
  const boost::math::chi_squared cs(df);
  out.bp_p = boost::math::cdf(boost::math::complement(cs, std::max(out.bp_statistic, 0.0)));
}

// Rank and residual sum of squares of z on the augmented design. The Q-less blocked factor of
// [aug | z] reads the rows once (a full Householder QR sweeps them once per column); its rank
// rule is LeastSquares's, and z's own column being aliased means an exact fit (RSS 0).
// LeastSquares remains the path for a non-finite entry, whose error it reports.
void reset_fit(const Eigen::MatrixXd& aug, const Eigen::VectorXd& z, double* rank, double* rss) {
  const Eigen::Index n = aug.rows(), c = aug.cols();
  if (aug.allFinite() && z.allFinite()) {
    Eigen::MatrixXd xz(n, c + 1);
    xz.leftCols(c) = aug;
    xz.col(c) = z;
    const TallFactor f = factor_tall(xz.data(), static_cast<std::size_t>(n),
                                     static_cast<std::size_t>(c + 1), false, kRankTolerance);
    const bool z_kept = !f.kept.empty() && f.kept.back() == static_cast<std::size_t>(c);
    *rank = static_cast<double>(f.rank()) - (z_kept ? 1.0 : 0.0);
    const Eigen::Index last = static_cast<Eigen::Index>(f.rank()) - 1;
    *rss = z_kept ? f.r(last, last) * f.r(last, last) : 0.0;
    return;
  }
  const LeastSquares ls1(aug);
  *rank = static_cast<double>(ls1.rank());
  *rss = ls1.rss(z);
}

void reset(const Model& m, ResidualChecks& out) {
  const LeastSquares& ls = m.least_squares();
  const Eigen::Index n = static_cast<Eigen::Index>(m.n());
  const Eigen::Index k = static_cast<Eigen::Index>(ls.rank());
  Eigen::MatrixXd aug(n, k + 2);
  for (Eigen::Index i = 0; i < k; ++i)
    aug.col(i) = ls.design().col(static_cast<Eigen::Index>(ls.kept()[static_cast<std::size_t>(i)]));
  // With an intercept, the span of {1, f, f^2, f^3} equals that of {1, g, g^2, g^3} for
  // g = (f - c) / s, and f lies in the design's span, so the F statistic is unchanged by
  // centring and scaling the fitted values; doing so keeps the augmented design well conditioned.
  Eigen::VectorXd g = m.fitted();
  if (m.intercept()) {
    const double c = g.mean();
    const double s = std::sqrt((g.array() - c).square().sum() / static_cast<double>(n));
    // Constant fitted values (up to rounding): the added columns would be aliased.
    if (!(s > 1e-10 * std::max(1.0, std::fabs(c)))) return;
    g = ((g.array() - c) / s).matrix();
  }
  aug.col(k) = g.array().square().matrix();
  aug.col(k + 1) = g.array().cube().matrix();
  double rank1 = 0, rss1 = 0;
  reset_fit(aug, m.transformed_response(), &rank1, &rss1);
  const double q = rank1 - static_cast<double>(k);
  const double df2 = static_cast<double>(n) - rank1;
  if (q < 1.0 || df2 < 1.0) return;
  out.reset_df1 = q;
  out.reset_df2 = df2;
  if (!(rss1 > 0.0)) return;
  out.reset_f = ((m.rss() - rss1) / q) / (rss1 / df2);
  if (!std::isfinite(out.reset_f)) return;
  const boost::math::fisher_f fd(q, df2);
  out.reset_p = boost::math::cdf(boost::math::complement(fd, std::max(out.reset_f, 0.0)));
}

}  // namespace

ResidualChecks residual_checks(const Model& model) {
  // A weighted model: the checks of the regression of sqrt(w) z on sqrt(w) [1 X].
  if (model.weighted()) return residual_checks(model.weighted_regression());
  ResidualChecks out;
  out.n = model.n();
  breusch_pagan(model, out);
  reset(model, out);
  const Eigen::VectorXd& e = model.residuals();
  const ShapiroWilk sw = shapiro_wilk(e.data(), static_cast<std::size_t>(e.size()));
  out.sw_computed = sw.computed;
  out.sw_statistic = sw.computed ? sw.w : math::kNaN;
  out.sw_p = sw.computed ? sw.p_value : math::kNaN;
  out.sw_note = sw.note;
  out.skewness = sample_moments(e.data(), static_cast<std::size_t>(e.size())).skewness;
  return out;
}

}  // namespace powerback
