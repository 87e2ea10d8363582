// Box-Tidwell iteration for the powers of positive predictors (see box_tidwell.hpp).
#include "powerback/box_tidwell.hpp"

#include <Eigen/Dense>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <string>

#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

namespace {

using Index = Eigen::Index;

std::string var_name(std::size_t j) { return "Box-Tidwell variable " + std::to_string(j); }

// Checks the inputs; returns log(x / geometric mean of x), column by column.
Eigen::MatrixXd scaled_logs(const double* X, std::size_t n, std::size_t m) {
  Eigen::MatrixXd lx(static_cast<Index>(n), static_cast<Index>(m));
  for (std::size_t j = 0; j < m; ++j) {
    std::size_t n_bad = 0, n_nonfinite = 0;
    std::vector<std::size_t> bad, nonfinite;
    for (std::size_t i = 0; i < n; ++i) {
      const double v = X[j * n + i];
      if (!std::isfinite(v)) {
        if (nonfinite.size() < kMaxReportedIndices) nonfinite.push_back(i);
        ++n_nonfinite;
      } else if (v <= 0) {
        if (bad.size() < kMaxReportedIndices) bad.push_back(i);
        ++n_bad;
      }
    }
    if (n_nonfinite > 0)
      throw IndexedError(ErrorCode::NonFinite,
                         var_name(j) + " has " + std::to_string(n_nonfinite) +
                             " non-finite values at rows " + format_indices(nonfinite, n_nonfinite) +
                             " (0-based): remove or impute them first",
                         n_nonfinite, nonfinite);
    if (n_bad > 0)
      throw IndexedError(ErrorCode::Domain,
                         var_name(j) + " must be > 0 but " + std::to_string(n_bad) + " of " +
                             std::to_string(n) + " values are not, at rows " +
                             format_indices(bad, n_bad) +
                             " (0-based): shift the variable first or leave it out of the powers",
                         n_bad, bad);
    double mean_log = 0;
    for (std::size_t i = 0; i < n; ++i) mean_log += std::log(X[j * n + i]) / static_cast<double>(n);
    for (std::size_t i = 0; i < n; ++i)
      lx(static_cast<Index>(i), static_cast<Index>(j)) = std::log(X[j * n + i]) - mean_log;
  }
  return lx;
}

// [1, Z, w_1..w_m] with w_j = exp(a_j * lx_j), then (when augment) the columns w_j * lx_j.
Eigen::MatrixXd design(const Eigen::MatrixXd& z, const Eigen::MatrixXd& lx,
                       const std::vector<double>& a, bool augment) {
  const Index n = lx.rows(), q = z.cols(), m = lx.cols();
  Eigen::MatrixXd d(n, 1 + q + m * (augment ? 2 : 1));
  d.col(0).setOnes();
  if (q > 0) d.block(0, 1, n, q) = z;
  for (Index j = 0; j < m; ++j) {
    const Eigen::ArrayXd w = (a[static_cast<std::size_t>(j)] * lx.col(j).array()).exp();
    d.col(1 + q + j) = w.matrix();
    if (augment) d.col(1 + q + m + j) = (w * lx.col(j).array()).matrix();
  }
  return d;
}

// Throws Error(Singular) unless every column from `first` on is kept by the factorisation.
void require_kept(const LeastSquares& ls, Index first, Index count, const char* what) {
  for (std::size_t c : ls.aliased()) {
    const Index ci = static_cast<Index>(c);
    if (ci >= first && ci < first + count)
      throw Error(ErrorCode::Singular,
                  var_name(static_cast<std::size_t>(ci - first)) + std::string(" is aliased ") +
                      what + ": its power cannot be estimated; drop it from the Box-Tidwell variables");
  }
}

}  // namespace

BoxTidwellResult box_tidwell(const double* y, const double* Z, std::size_t n, std::size_t q,
                             const double* X, std::size_t m, const BoxTidwellOptions& opt) {
  require(m > 0, "no Box-Tidwell variables were given");
  require(y != nullptr && X != nullptr && (Z != nullptr || q == 0), "a data pointer is NULL");
  require(opt.max_iter >= 1, "max_iter must be at least 1");
  require(opt.tol > 0 && std::isfinite(opt.tol), "tol must be a positive number");
  require(opt.max_abs_power > 1 && std::isfinite(opt.max_abs_power),
          "max_abs_power must be a number > 1");
  require(n > 1 + q + 2 * m,
          "Box-Tidwell needs more rows (" + std::to_string(n) + ") than columns of the augmented fit (" +
              std::to_string(1 + q + 2 * m) + ")");
  for (std::size_t i = 0; i < n; ++i)
    if (!std::isfinite(y[i]))
      throw IndexedError(ErrorCode::NonFinite,
                         "the response has a non-finite value at row " + std::to_string(i) +
                             " (0-based): remove or impute it first",
                         1, {i});
  const Eigen::MatrixXd lx = scaled_logs(X, n, m);
  Eigen::MatrixXd z(static_cast<Index>(n), static_cast<Index>(q));
  for (std::size_t j = 0; j < q; ++j)
    for (std::size_t i = 0; i < n; ++i) {
      const double v = Z[j * n + i];
      if (!std::isfinite(v))
        throw IndexedError(ErrorCode::NonFinite,
                           "other predictor column " + std::to_string(j) +
                               " has a non-finite value at row " + std::to_string(i) +
                               " (0-based): remove or impute it first",
                           1, {i});
      z(static_cast<Index>(i), static_cast<Index>(j)) = v;
    }
  const Eigen::VectorXd yv = Eigen::Map<const Eigen::VectorXd>(y, static_cast<Index>(n));
  const Index first_w = 1 + static_cast<Index>(q), mm = static_cast<Index>(m);

  BoxTidwellResult res;
  res.n = n;

  // Score tests at power 1: one added column x_j log x_j at a time.
  std::vector<double> ones(m, 1.0);
  const Eigen::MatrixXd lin = design(z, lx, ones, false);
  res.score_t.resize(m);
  res.score_p.resize(m);
  for (std::size_t j = 0; j < m; ++j) {
    Eigen::MatrixXd d(lin.rows(), lin.cols() + 1);
    d.leftCols(lin.cols()) = lin;
    d.col(lin.cols()) = (lin.col(first_w + static_cast<Index>(j)).array() *
                         lx.col(static_cast<Index>(j)).array()).matrix();
    const LeastSquares ls(d);
    require_kept(ls, first_w, mm, "with the other predictors");
    for (std::size_t c : ls.aliased())
      if (static_cast<Index>(c) == lin.cols())
        throw Error(ErrorCode::Singular, var_name(j) + " takes too few distinct values for a power");
    const double df = static_cast<double>(ls.df_residual());
    const double s2 = ls.rss(yv) / df;
    const double g = ls.coefficients(yv)(lin.cols());
    const double se = std::sqrt(s2 * ls.unscaled_covariance()(lin.cols(), lin.cols()));
    res.score_t[j] = g / se;
    res.score_df = df;
    const boost::math::students_t dist(df);
    res.score_p[j] = std::isfinite(res.score_t[j])
                         ? 2 * boost::math::cdf(boost::math::complement(dist, std::fabs(res.score_t[j])))
                         : 0.0;
  }

  // The iteration.
  std::vector<double> a(m, 1.0);
  res.history.push_back(a);
  Eigen::VectorXd b, g;
  auto fit = [&](const std::vector<double>& pw, Eigen::VectorXd& coef_w, Eigen::VectorXd& coef_g,
                 Eigen::VectorXd* se_g) {
    const LeastSquares base(design(z, lx, pw, false));
    require_kept(base, first_w, mm, "with the other predictors");
    coef_w = base.coefficients(yv).segment(first_w, mm);
    const LeastSquares aug(design(z, lx, pw, true));
    require_kept(aug, first_w, mm, "with the other predictors");
    const Eigen::VectorXd c = aug.coefficients(yv);
    coef_g = c.segment(first_w + mm, mm);
    if (se_g) {
      const double s2 = aug.rss(yv) / static_cast<double>(aug.df_residual());
      const Eigen::MatrixXd cov = aug.unscaled_covariance();
      se_g->resize(mm);
      for (Index j = 0; j < mm; ++j) (*se_g)(j) = std::sqrt(s2 * cov(first_w + mm + j, first_w + mm + j));
    }
  };
  for (int it = 0; it < opt.max_iter; ++it) {
    fit(a, b, g, nullptr);
    std::vector<double> next(m);
    double change = 0;
    bool finite = true;
    for (std::size_t j = 0; j < m; ++j) {
      const Index jj = static_cast<Index>(j);
      if (std::isnan(g(jj))) g(jj) = 0;  // the log column aliased: no first-order change
      if (b(jj) == 0)
        throw Error(ErrorCode::Singular,
                    var_name(j) + " has a coefficient of exactly 0: no power can be estimated");
      next[j] = a[j] + g(jj) / b(jj);
      finite = finite && std::isfinite(next[j]) && std::fabs(next[j]) <= opt.max_abs_power;
      change = std::fmax(change, std::fabs(next[j] - a[j]));
    }
    res.iterations = it + 1;
    res.last_change = change;
    if (!finite) break;  // diverging: keep the last finite powers, flagged below
    a = next;
    res.history.push_back(a);
    if (change < opt.tol) {
      res.converged = true;
      break;
    }
  }
  Eigen::VectorXd se_g;
  fit(a, b, g, &se_g);
  res.alpha = a;
  res.se.resize(m);
  for (std::size_t j = 0; j < m; ++j)
    res.se[j] = se_g(static_cast<Index>(j)) / std::fabs(b(static_cast<Index>(j)));
  return res;
}

}  // namespace powerback
