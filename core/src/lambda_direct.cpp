// The direct evaluation of the lambda profile (lambdas the binned series cannot serve): blocks of
// rows transformed for a whole batch of lambdas, projected with the design's R in two passes
// (see LambdaProfile in lambda_internal.hpp).
#include <algorithm>
#include <cmath>
#include <limits>

#include "lambda_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace detail {
namespace {

// Rows per block of the direct evaluation: a block of transformed values for a batch of ~100
// lambdas stays within a couple of megabytes.
constexpr Eigen::Index kDirectBlockRows = 2048;

// s * expm1(k t) / k, divided by exp(m) when scaled (m > 0); k == 0 gives the log limit s * t.
inline double power_term(double t, double k, double m, bool scaled) {
  if (!scaled) return k == 0.0 ? t : std::expm1(k * t) / k;
  if (k == 0.0) return t * std::exp(-m);
  return (std::exp(k * t - m) - std::exp(-m)) / k;
}

}  // namespace

void LambdaProfile::design_block(Eigen::Index r0, Eigen::Index nr, Eigen::MatrixXd& out) const {
  const bool weighted = w_.size() > 0;
  if (!response_) {
    out.resize(nr, 1);
    if (weighted) out.col(0) = root_w_.segment(r0, nr).matrix();
    else out.setOnes();
    return;
  }
  const Eigen::Index k = static_cast<Eigen::Index>(kept_.size());
  out.resize(nr, k);
  for (Eigen::Index c = 0; c < k; ++c) {
    const std::size_t col = kept_[static_cast<std::size_t>(c)];
    if (design_) {
      out.col(c) = design_->design().block(r0, static_cast<Eigen::Index>(col), nr, 1);
    } else if (col == 0) {
      if (weighted) out.col(c) = root_w_.segment(r0, nr).matrix();
      else out.col(c).setOnes();
    } else {
      const double* xc = X_ + (col - 1) * n_all_;
      for (Eigen::Index i = 0; i < nr; ++i) {
        const Eigen::Index r = r0 + i;
        const std::size_t src = rows_.empty() ? static_cast<std::size_t>(r) : rows_[static_cast<std::size_t>(r)];
        out(i, c) = weighted ? root_w_(r) * xc[src] : xc[src];
      }
    }
  }
}

void LambdaProfile::log_rss_direct(const double* lambdas, std::size_t m, double* out,
                                   double* log_tss) const {
  const Eigen::Index nl = static_cast<Eigen::Index>(m);
  if (nl == 0) return;
  // Per lambda: the exponent by which the values are divided when they would overflow.
  Eigen::ArrayXd scale(nl);
  std::vector<unsigned char> scaled(m);
  for (Eigen::Index j = 0; j < nl; ++j) {
    const double k1 = lambdas[j], k2 = 2.0 - k1;
    double s = -std::numeric_limits<double>::infinity();
    if (any_pos_) s = std::max({s, k1 * pos_min_, k1 * pos_max_});
    if (any_neg_) s = std::max({s, k2 * neg_min_, k2 * neg_max_});
    scaled[static_cast<std::size_t>(j)] = s > kDirectLimit;
    scale(j) = s > kDirectLimit ? s : 0.0;
  }
  const Eigen::Index n = t_.size();
  const bool weighted = w_.size() > 0, yj = family_ == Family::YeoJohnson;
  Eigen::MatrixXd Z, Xb;
  // The block's transformed values (times sqrt(w)) for every lambda.
  const auto fill = [&](Eigen::Index r0, Eigen::Index nr) {
    Z.resize(nr, nl);
    for (Eigen::Index j = 0; j < nl; ++j) {
      const double k1 = lambdas[j], k2 = 2.0 - k1, s = scale(j);
      const bool sc = scaled[static_cast<std::size_t>(j)] != 0;
      double* z = Z.col(j).data();
      const double* t = t_.data() + r0;
      if (!yj && !sc && k1 != 0.0) {
        const double inv = 1.0 / k1;
        for (Eigen::Index i = 0; i < nr; ++i) z[i] = std::expm1(k1 * t[i]) * inv;
      } else if (!yj) {
        for (Eigen::Index i = 0; i < nr; ++i) z[i] = power_term(t[i], k1, s, sc);
      } else {
        for (Eigen::Index i = 0; i < nr; ++i)
          z[i] = neg_(r0 + i) ? -power_term(t[i], k2, s, sc) : power_term(t[i], k1, s, sc);
      }
      if (weighted) Z.col(j).array() *= root_w_.segment(r0, nr);
    }
  };
  // The design's rows are read in place when no copy is needed (equal weights, every row used,
  // no aliased column): the intercept's part is a column sum; otherwise gathered per block.
  using Stride = Eigen::OuterStride<>;
  using ConstMap = Eigen::Map<const Eigen::MatrixXd, 0, Stride>;
  const bool plain = !weighted && rows_.empty();
  const std::size_t all_columns = design_ ? design_->columns() : p_ + 1;
  const bool in_place = plain && (!response_ || kept_.size() == all_columns);
  const auto x_map = [&](Eigen::Index r0, Eigen::Index nr) {
    if (design_) return ConstMap(design_->design().data() + r0 + design_->design().rows(), nr,
                                 static_cast<Eigen::Index>(all_columns - 1), Stride(design_->design().rows()));
    return ConstMap(X_ + r0, nr, static_cast<Eigen::Index>(p_), Stride(static_cast<Eigen::Index>(n_all_)));
  };
  const auto gather_xz = [&](Eigen::Index r0, Eigen::Index nr, Eigen::MatrixXd& C) {
    if (!in_place) {
      design_block(r0, nr, Xb);
      C.noalias() += Xb.transpose() * Z;
      return;
    }
    C.row(0) += Z.colwise().sum();
    if (C.rows() > 1) C.bottomRows(C.rows() - 1).noalias() += x_map(r0, nr).transpose() * Z;
  };
  const auto subtract_fit = [&](Eigen::Index r0, Eigen::Index nr, const Eigen::MatrixXd& B) {
    if (!in_place) {
      design_block(r0, nr, Xb);
      Z.noalias() -= Xb * B;
      return;
    }
    Z.rowwise() -= B.row(0);
    if (B.rows() > 1) Z.noalias() -= x_map(r0, nr) * B.bottomRows(B.rows() - 1);
  };
  const Eigen::Index k = r_.rows();
  Eigen::MatrixXd C = Eigen::MatrixXd::Zero(k, nl);
  Eigen::RowVectorXd wsum = Eigen::RowVectorXd::Zero(nl);  // sum w z per lambda
  for (Eigen::Index r0 = 0; r0 < n; r0 += kDirectBlockRows) {
    const Eigen::Index nr = std::min(kDirectBlockRows, n - r0);
    poll_cancel();
    fill(r0, nr);
    gather_xz(r0, nr, C);
    if (weighted) wsum.noalias() += root_w_.segment(r0, nr).matrix().transpose() * Z;
    else wsum += Z.colwise().sum();
  }
  // B = (R'R)^-1 C
  const Eigen::MatrixXd B = r_.triangularView<Eigen::Upper>().solve(
      r_.transpose().triangularView<Eigen::Lower>().solve(C));
  const Eigen::RowVectorXd mean = wsum / sum_w_;
  Eigen::ArrayXd rss = Eigen::ArrayXd::Zero(nl), tss = Eigen::ArrayXd::Zero(nl);
  for (Eigen::Index r0 = 0; r0 < n; r0 += kDirectBlockRows) {
    const Eigen::Index nr = std::min(kDirectBlockRows, n - r0);
    poll_cancel();
    fill(r0, nr);
    if (log_tss) {
      for (Eigen::Index j = 0; j < nl; ++j) {
        if (weighted)
          tss(j) += (Z.col(j).array() - mean(j) * root_w_.segment(r0, nr)).square().sum();
        else
          tss(j) += (Z.col(j).array() - mean(j)).square().sum();
      }
    }
    subtract_fit(r0, nr, B);
    rss += Z.colwise().squaredNorm().transpose().array();
  }
  for (Eigen::Index j = 0; j < nl; ++j) {
    if (!(rss(j) > 0.0))
      throw Error(ErrorCode::Singular,
                  "the predictors fit the transformed response exactly at lambda = " +
                      format_number(lambdas[j]) +
                      " (zero residuals): the likelihood has no maximum there and no power can "
                      "be estimated; check that the response is not a function of the predictors");
    out[j] = std::log(rss(j)) + 2.0 * scale(j);
    if (log_tss) log_tss[j] = std::log(tss(j)) + 2.0 * scale(j);
  }
}

double LambdaProfile::unexplained_share(double lambda) const {
  double lr, lt;
  log_rss_direct(&lambda, 1, &lr, &lt);
  return std::exp(lr - lt);  // both carry the same scale factor, which cancels
}

}  // namespace detail
}  // namespace powerback
