// Box-Tidwell, step 2: the (weighted) designs and the score tests of power 1 (see
// box_tidwell.hpp).
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <string>

#include "powerback/box_tidwell.hpp"
#include "powerback/errors.hpp"
#include "powerback/least_squares.hpp"
#include "box_tidwell_tall.hpp"

namespace powerback {
namespace detail {

using Index = Eigen::Index;

Eigen::MatrixXd box_tidwell_design(const BoxTidwellData& d, const std::vector<double>& a,
                                   bool augment) {
  const Index n = d.lx.rows(), q = d.z.cols(), m = d.lx.cols();
  Eigen::MatrixXd x(n, 1 + q + m * (augment ? 2 : 1));
  x.col(0).setOnes();
  if (q > 0) x.block(0, 1, n, q) = d.z;
  for (Index j = 0; j < m; ++j) {
    const Eigen::ArrayXd w = (a[static_cast<std::size_t>(j)] * d.lx.col(j).array()).exp();
    x.col(1 + q + j) = w.matrix();
    if (augment) x.col(1 + q + m + j) = (w * d.lx.col(j).array()).matrix();
  }
  return d.sqrt_w.asDiagonal() * x;
}

void box_tidwell_require_kept(const std::vector<std::size_t>& aliased, std::size_t first,
                              std::size_t count, const char* what) {
  for (std::size_t c : aliased)
    if (c >= first && c < first + count)
      throw Error(ErrorCode::Singular,
                  "Box-Tidwell variable " + std::to_string(c - first) + " is aliased " + what +
                      ": its power cannot be estimated; drop it from the Box-Tidwell variables");
}

namespace {

// The score tests from one Q-less factor R of [lin | x_1 log x_1 ... x_m log x_m | y] (lin the
// linear design): the fit with lin and column j alone is the QR of those columns of R (R's
// columns are Q' times the design's), so each test costs a small QR instead of a pass over the
// rows. False when a column is aliased or not finite (the caller then fits each design).
bool score_tests_tall(const BoxTidwellData& d, BoxTidwellResult& res) {
  const Index m = d.lx.cols(), lin = 1 + d.z.cols() + m;
  Eigen::MatrixXd r;
  if (!box_tidwell_tall_r(box_tidwell_design(d, std::vector<double>(static_cast<std::size_t>(m), 1.0),
                                             true),
                          d.y, r))
    return false;
  const Index yc = r.cols() - 1;
  const double df = static_cast<double>(d.y.size() - (lin + 1));
  const boost::math::students_t dist(df);
  Eigen::MatrixXd sub(r.rows(), lin + 2);
  sub.leftCols(lin) = r.leftCols(lin);
  sub.col(lin + 1) = r.col(yc);
  for (Index j = 0; j < m; ++j) {
    sub.col(lin) = r.col(lin + j);
    const Eigen::HouseholderQR<Eigen::MatrixXd> qr(sub);
    const Eigen::MatrixXd rs = qr.matrixQR().topRows(lin + 2).triangularView<Eigen::Upper>();
    const double rjj = rs(lin, lin), rss = rs(lin + 1, lin + 1) * rs(lin + 1, lin + 1);
    const double g = rs(lin, lin + 1) / rjj, se = std::sqrt(rss / df) / std::fabs(rjj);
    const auto jj = static_cast<std::size_t>(j);
    res.score_t[jj] = g / se;
    res.score_p[jj] = std::isfinite(res.score_t[jj])
                          ? 2 * boost::math::cdf(boost::math::complement(dist, std::fabs(res.score_t[jj])))
                          : 0.0;
  }
  res.score_df = df;
  return true;
}

}  // namespace

// One added column x_j log x_j at a time, every variable linear: the t statistic of the added
// column, two-sided p-value from Student's t on the fit's residual df.
void box_tidwell_score_tests(const BoxTidwellData& d, BoxTidwellResult& res) {
  const std::size_t m = static_cast<std::size_t>(d.lx.cols());
  const std::size_t first_w = 1 + static_cast<std::size_t>(d.z.cols());
  res.score_t.resize(m);
  res.score_p.resize(m);
  if (score_tests_tall(d, res)) return;
  const Eigen::MatrixXd lin = box_tidwell_design(d, std::vector<double>(m, 1.0), false);
  const Index added = lin.cols();
  for (std::size_t j = 0; j < m; ++j) {
    Eigen::MatrixXd x(lin.rows(), added + 1);
    x.leftCols(added) = lin;
    // sqrt(w) x_j times log x_j: the weighted column of x_j log x_j
    x.col(added) = (lin.col(static_cast<Index>(first_w + j)).array() *
                    d.lx.col(static_cast<Index>(j)).array()).matrix();
    const LeastSquares ls(x, kRankTolerance);
    box_tidwell_require_kept(ls.aliased(), first_w, m, "with the other predictors");
    for (std::size_t c : ls.aliased())
      if (static_cast<Index>(c) == added)
        throw Error(ErrorCode::Singular, "Box-Tidwell variable " + std::to_string(j) +
                                             " takes too few distinct values for a power");
    const double df = static_cast<double>(ls.df_residual());
    const double s2 = ls.rss(d.y) / df;
    const double g = ls.coefficients(d.y)(added);
    const double se = std::sqrt(s2 * ls.unscaled_variances()(added));
    res.score_t[j] = g / se;
    res.score_df = df;
    const boost::math::students_t dist(df);
    res.score_p[j] = std::isfinite(res.score_t[j])
                         ? 2 * boost::math::cdf(boost::math::complement(dist, std::fabs(res.score_t[j])))
                         : 0.0;
  }
}

}  // namespace detail
}  // namespace powerback
