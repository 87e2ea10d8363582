// Predictions of powerback::Model on the transformed scale and in original units.
#include <boost/math/distributions/students_t.hpp>
#include <atomic>
#include <cmath>
#include <memory>
#include <string>
#include <utility>

#include "powerback/errors.hpp"
#include "powerback/model.hpp"
#include "powerback/smearing.hpp"

namespace powerback {

Eigen::MatrixXd Model::design_rows(const double* Xnew, std::size_t m, std::size_t p,
                                   std::vector<unsigned>& flags) const {
  const std::size_t c0 = intercept() ? 1 : 0;
  require(p + c0 == columns(), "new data have " + std::to_string(p) + " predictor columns; the model was fitted with " +
                                   std::to_string(columns() - c0));
  require(Xnew != nullptr || m == 0 || p == 0, "the new predictor matrix is NULL");
  flags.assign(m, 0u);
  // Rows of the design for the new data; non-finite rows are set aside and flagged.
  const Eigen::Index mi = static_cast<Eigen::Index>(m);
  Eigen::MatrixXd rows(mi, static_cast<Eigen::Index>(columns()));
  if (c0) rows.col(0).setOnes();
  for (std::size_t j = 0; j < p; ++j) {
    const double* col = Xnew + j * m;
    const Eigen::Index jj = static_cast<Eigen::Index>(j + c0);
    for (std::size_t i = 0; i < m; ++i) {
      const double v = col[i];
      if (std::isfinite(v)) {
        rows(static_cast<Eigen::Index>(i), jj) = v;
      } else {
        rows(static_cast<Eigen::Index>(i), jj) = 0.0;
        flags[i] |= kPredMissing;
      }
    }
  }
  return rows;
}

std::vector<double> Model::fit_standard_errors(const double* Xnew, std::size_t m,
                                               std::size_t p) const {
  std::vector<unsigned> flags;
  const Eigen::MatrixXd rows = design_rows(Xnew, m, p, flags);
  std::vector<double> out(m, math::kNaN);
  if (m == 0) return out;
  const Eigen::VectorXd vf = ls_.variance_factor(rows);
  for (std::size_t i = 0; i < m; ++i)
    if (!(flags[i] & kPredMissing)) out[i] = sigma_ * std::sqrt(vf(static_cast<Eigen::Index>(i)));
  return out;
}

Prediction Model::predict(const double* Xnew, std::size_t m, std::size_t p,
                          const PredictOptions& opt) const {
  require(std::isfinite(opt.level) && opt.level > 0.0 && opt.level < 1.0,
          "level must lie strictly between 0 and 1 (e.g. 0.95), not " + format_number(opt.level));
  std::vector<unsigned> flags;
  const Eigen::MatrixXd rows = design_rows(Xnew, m, p, flags);
  return predict_rows(rows, std::move(flags), opt);
}

Prediction Model::predict_fitted(const PredictOptions& opt) const {
  require(std::isfinite(opt.level) && opt.level > 0.0 && opt.level < 1.0,
          "level must lie strictly between 0 and 1 (e.g. 0.95), not " + format_number(opt.level));
  if (!weighted()) return predict_rows(ls_.design(), std::vector<unsigned>(n(), 0u), opt);
  const Eigen::Index ni = static_cast<Eigen::Index>(n());
  Eigen::MatrixXd rows = Eigen::MatrixXd::Zero(ni, static_cast<Eigen::Index>(columns()));
  std::vector<unsigned> flags(n(), kPredMissing);
  const auto d = ls_.design();
  for (std::size_t k = 0; k < kept_rows_.size(); ++k) {
    const std::size_t i = kept_rows_[k];
    const double s = std::sqrt(weights_(static_cast<Eigen::Index>(i)));
    rows.row(static_cast<Eigen::Index>(i)) = d.row(static_cast<Eigen::Index>(k)) / s;
    flags[i] = 0u;
  }
  return predict_rows(rows, std::move(flags), opt);
}

std::shared_ptr<const Smearing> Model::smearing() const {
  std::shared_ptr<const Smearing> have = std::atomic_load(&smearing_cache_);
  if (have) return have;
  const Eigen::VectorXd& sr = smearing_residuals();
  std::shared_ptr<const Smearing> fresh =
      std::make_shared<const Smearing>(response_, sr.data(), static_cast<std::size_t>(sr.size()));
  // A thread that built one at the same time keeps its own; the first stored is shared.
  if (std::atomic_compare_exchange_strong(&smearing_cache_, &have, fresh)) return fresh;
  return have;
}

Prediction Model::predict_rows(const Eigen::Ref<const Eigen::MatrixXd>& rows,
                               std::vector<unsigned> flags,
                               const PredictOptions& opt) const {
  const std::size_t m = static_cast<std::size_t>(rows.rows());
  Prediction out;
  out.flags = std::move(flags);
  out.fit.assign(m, math::kNaN);
  out.lower.assign(m, math::kNaN);
  out.upper.assign(m, math::kNaN);
  out.cut_mass.assign(m, math::kNaN);
  if (m == 0) return out;
  const Eigen::Index mi = static_cast<Eigen::Index>(m);

  // Aliased coefficients contribute nothing (as predict.lm with a rank-deficient fit).
  Eigen::VectorXd b = coef_;
  for (Eigen::Index j = 0; j < b.size(); ++j)
    if (std::isnan(b(j))) b(j) = 0.0;
  const Eigen::VectorXd mu = rows * b;

  Eigen::VectorXd half = Eigen::VectorXd::Constant(mi, math::kNaN);
  if (opt.interval != IntervalKind::None) {
    const boost::math::students_t td(static_cast<double>(df_residual()));
    const double q = boost::math::quantile(boost::math::complement(td, (1.0 - opt.level) / 2.0));
    const Eigen::VectorXd vf = ls_.variance_factor(rows);
    // A new observation has weight 1: variance sigma^2 (as predict.lm's default).
    const double extra = opt.interval == IntervalKind::Prediction ? 1.0 : 0.0;
    for (Eigen::Index i = 0; i < mi; ++i) half(i) = q * sigma_ * std::sqrt(vf(i) + extra);
  }

  // The smearing mean is built once per model from the residuals, then costs about O(1) per row.
  std::shared_ptr<const Smearing> smear;
  if (!opt.transformed_scale && opt.center == Center::Mean && opt.mean_method == MeanMethod::Smearing)
    smear = smearing();

  for (std::size_t i = 0; i < m; ++i) {
    if (out.flags[i] & kPredMissing) continue;
    const Eigen::Index ii = static_cast<Eigen::Index>(i);
    // A linear predictor that overflowed (a huge predictor times a coefficient, or two infinite
    // terms of opposite sign giving NaN) has no value to report or back-transform.
    if (!std::isfinite(mu(ii))) {
      out.flags[i] |= kPredOverflow;
      continue;
    }
    const bool wide = opt.interval != IntervalKind::None && !std::isfinite(half(ii));
    if (wide) out.flags[i] |= kPredOverflow;
    const double lo = wide ? math::kNaN : mu(ii) - half(ii), hi = wide ? math::kNaN : mu(ii) + half(ii);
    if (opt.transformed_scale) {
      out.fit[i] = mu(ii);
      out.lower[i] = lo;
      out.upper[i] = hi;
      continue;
    }
    BackValue f;
    if (opt.center == Center::Median) f = median_back(response_, mu(ii));
    else if (opt.mean_method == MeanMethod::Smearing)
      f = smear->mean(mu(ii));
    else f = normal_mean(response_, mu(ii), sigma_, &out.cut_mass[i]);
    out.fit[i] = f.value;
    bool bounded = f.bounded;
    if (opt.interval != IntervalKind::None && !wide) {
      const BackInterval iv = interval_back(response_, lo, hi);
      out.lower[i] = iv.lower;
      out.upper[i] = iv.upper;
      bounded = bounded || iv.bounded;
    }
    if (bounded) out.flags[i] |= kPredBounded;
  }
  return out;
}

}  // namespace powerback
