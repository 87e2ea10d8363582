// Box-Tidwell, steps 3 and 4: the iteration with the standard errors at its end, then the Wald
// intervals and the advice; and the driver that runs the steps (see box_tidwell.hpp).
#include "powerback/box_tidwell.hpp"

#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <string>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/lambda.hpp"
#include "powerback/least_squares.hpp"
#include "box_tidwell_tall.hpp"

namespace powerback {
namespace detail {
namespace {

using Index = Eigen::Index;

// Coefficients of x^a (b) and of x^a log x in the augmented fit (g) at powers a; with se_g,
// the standard errors of g as well.
void fit_at(const BoxTidwellData& d, const std::vector<double>& a, Eigen::VectorXd& b,
            Eigen::VectorXd& g, Eigen::VectorXd* se_g) {
  const Index first_w = 1 + d.z.cols(), m = d.lx.cols();
  const auto fw = static_cast<std::size_t>(first_w), mm = static_cast<std::size_t>(m);
  if (!se_g) {
    // One pass over the rows: the base design [1 Z x^a] is the leading block of the augmented
    // one, so R of [augmented | y] gives both fits (LeastSquares below when a column is aliased).
    Eigen::MatrixXd r;
    if (box_tidwell_tall_r(box_tidwell_design(d, a, true), d.y, r)) {
      b = box_tidwell_leading_coefficients(r, first_w + m).segment(first_w, m);
      g = box_tidwell_leading_coefficients(r, first_w + 2 * m).segment(first_w + m, m);
      return;
    }
  }
  const LeastSquares base(box_tidwell_design(d, a, false), kRankTolerance);
  box_tidwell_require_kept(base.aliased(), fw, mm, "with the other predictors");
  b = base.coefficients(d.y).segment(first_w, m);
  const LeastSquares aug(box_tidwell_design(d, a, true), kRankTolerance);
  box_tidwell_require_kept(aug.aliased(), fw, mm, "with the other predictors");
  g = aug.coefficients(d.y).segment(first_w + m, m);
  if (!se_g) return;
  const double s2 = aug.rss(d.y) / static_cast<double>(aug.df_residual());
  const Eigen::MatrixXd cov = aug.unscaled_covariance();
  se_g->resize(m);
  for (Index j = 0; j < m; ++j) (*se_g)(j) = std::sqrt(s2 * cov(first_w + m + j, first_w + m + j));
}

}  // namespace

void box_tidwell_iterate(const BoxTidwellData& d, const BoxTidwellOptions& opt,
                         BoxTidwellResult& res) {
  const std::size_t m = static_cast<std::size_t>(d.lx.cols());
  std::vector<double> a(m, 1.0);
  res.history.assign(1, a);
  Eigen::VectorXd b, g;
  for (int it = 0; it < opt.max_iter; ++it) {
    poll_cancel();  // each iteration is a least-squares fit
    fit_at(d, a, b, g, nullptr);
    std::vector<double> next(m);
    double change = 0;
    bool finite = true;
    for (std::size_t j = 0; j < m; ++j) {
      const Index jj = static_cast<Index>(j);
      if (std::isnan(g(jj))) g(jj) = 0;  // the log column aliased: no first-order change
      if (b(jj) == 0)
        throw Error(ErrorCode::Singular, "Box-Tidwell variable " + std::to_string(j) +
                                             " has a coefficient of exactly 0: no power can be estimated");
      next[j] = a[j] + g(jj) / b(jj);
      finite = finite && std::isfinite(next[j]) && std::fabs(next[j]) <= opt.max_abs_power;
      change = std::fmax(change, std::fabs(next[j] - a[j]));
    }
    res.iterations = it + 1;
    res.last_change = change;
    if (!finite) break;  // diverging: keep the last finite powers, flagged by converged = false
    a = next;
    res.history.push_back(a);
    if (change < opt.tol) {
      res.converged = true;
      break;
    }
  }
  // se(a_j) = se(g_j) / |b_j| from the augmented fit at the final powers.
  Eigen::VectorXd se_g;
  fit_at(d, a, b, g, &se_g);
  res.alpha = a;
  res.se.resize(m);
  for (std::size_t j = 0; j < m; ++j)
    res.se[j] = se_g(static_cast<Index>(j)) / std::fabs(b(static_cast<Index>(j)));
}

void box_tidwell_advise(const BoxTidwellOptions& opt, BoxTidwellResult& res) {
  const std::size_t m = res.alpha.size();
  const double zq = boost::math::quantile(boost::math::normal(), 0.5 + opt.level / 2);
  res.level = opt.level;
  res.conf_low.resize(m);
  res.conf_high.resize(m);
  res.advice.resize(m);
  res.suggested.resize(m);
  for (std::size_t j = 0; j < m; ++j) {
    const double lo = res.alpha[j] - zq * res.se[j], hi = res.alpha[j] + zq * res.se[j];
    res.conf_low[j] = lo;
    res.conf_high[j] = hi;
    const bool rejects = res.score_p[j] < 1 - opt.level;
    const bool holds_one = lo <= 1 && hi >= 1;
    const double c = convenient_lambda(res.alpha[j], lo, hi);
    if (!rejects || holds_one || !std::isfinite(c) || c == 1) {
      res.advice[j] = BoxTidwellAdvice::Linear;
      res.suggested[j] = 1;
    } else if (c == 0) {
      res.advice[j] = BoxTidwellAdvice::Log;
      res.suggested[j] = 0;
    } else {
      res.advice[j] = BoxTidwellAdvice::Power;
      res.suggested[j] = c;
    }
  }
}

}  // namespace detail

BoxTidwellResult box_tidwell(const double* y, const double* Z, std::size_t n, std::size_t q,
                             const double* X, std::size_t m, const BoxTidwellOptions& opt) {
  const detail::BoxTidwellData d = detail::box_tidwell_data(y, Z, n, q, X, m, opt);
  BoxTidwellResult res;
  res.n = static_cast<std::size_t>(d.y.size());
  detail::box_tidwell_score_tests(d, res);
  detail::box_tidwell_iterate(d, opt, res);
  detail::box_tidwell_advise(opt, res);
  return res;
}

}  // namespace powerback
