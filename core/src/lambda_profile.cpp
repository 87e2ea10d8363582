// The profile log-likelihood of a power-family lambda: input checks, the once-only preparation
// of the data (rows of weight 0 dropped) and the profile at a batch of lambdas (the binned series
// where it serves, lambda_direct.cpp for the rest).
#include <algorithm>
#include <cmath>
#include <limits>

#include "lambda_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/tall_qr.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace detail {
namespace {

constexpr double kLog2PiPlus1 = 2.837877066409345483560659472811235279722794947275566825634;  // log(2 pi) + 1

std::string plural(std::size_t k, const char* one, const char* many) {
  return std::to_string(k) + " " + (k == 1 ? one : many);
}

std::string at_indices(const std::vector<std::size_t>& first, std::size_t count) {
  return std::string(count == 1 ? "index " : "indices ") + format_indices(first, count) +
         " (0-based)";
}

// The rows i < n (of the used ones: weight > 0) where bad(i) holds: their count and first indices.
template <class Bad>
std::size_t find_rows(std::size_t n, const double* weights, Bad bad, std::vector<std::size_t>& first) {
  std::size_t count = 0;
  for (std::size_t i = 0; i < n; ++i)
    if ((!weights || weights[i] > 0.0) && bad(i)) {
      ++count;
      if (first.size() < kMaxReportedIndices) first.push_back(i);
    }
  return count;
}

void check_weights(const double* w, std::size_t n) {
  std::vector<std::size_t> first;
  std::size_t bad = find_rows(n, nullptr, [&](std::size_t i) { return !std::isfinite(w[i]); }, first);
  if (bad)
    throw LambdaRowsError(ErrorCode::NonFinite,
                          "the weights have " + plural(bad, "non-finite value", "non-finite values") +
                              " (NaN or Inf) at " + at_indices(first, bad) +
                              ": give every row a finite weight >= 0 (0 drops the row)",
                          bad, first, LambdaInput::Weights);
  bad = find_rows(n, nullptr, [&](std::size_t i) { return w[i] < 0.0; }, first);
  if (bad)
    throw LambdaRowsError(ErrorCode::Argument,
                          "the weights must be >= 0; " + plural(bad, "value is", "values are") +
                              " negative at " + at_indices(first, bad) +
                              ": precision weights are inverse relative variances (0 drops a row)",
                          bad, first, LambdaInput::Weights);
}

// NaN/Inf first, then the Box-Cox domain; each error names the count and first 0-based indices
// (rows of weight 0 are not looked at).
[[noreturn]] void describe_bad_values(const double* v, std::size_t n, const double* w, Family family,
                                     const std::string& what) {
  std::vector<std::size_t> first;
  std::size_t bad = find_rows(n, w, [&](std::size_t i) { return !std::isfinite(v[i]); }, first);
  if (bad)
    throw LambdaRowsError(ErrorCode::NonFinite,
                          what + " has " + plural(bad, "non-finite value", "non-finite values") +
                              " (NaN or Inf) at " + at_indices(first, bad) +
                              ": remove or impute them first",
                          bad, first, LambdaInput::Response);
  if (family == Family::BoxCox) {
    bad = find_rows(n, w, [&](std::size_t i) { return !(v[i] > 0.0); }, first);
    if (bad)
      throw LambdaRowsError(ErrorCode::Domain,
                            "Box-Cox needs " + what + " > 0; " + plural(bad, "value", "values") +
                                " <= 0 at " + at_indices(first, bad) +
                                ": use Yeo-Johnson or a shift that makes every value > 0",
                            bad, first, LambdaInput::Response);
  }
  throw Error(ErrorCode::Argument, what + " has values that cannot be used");
}

// rows: the used rows (caller's indices), or empty for all n.
[[noreturn]] void describe_bad_predictors(const double* X, std::size_t n, std::size_t p,
                                         const std::vector<std::size_t>& rows) {
  std::vector<std::size_t> first;
  std::size_t bad = 0;
  const std::size_t used = rows.empty() ? n : rows.size();
  for (std::size_t q = 0; q < used; ++q) {
    const std::size_t i = rows.empty() ? q : rows[q];
    bool row_bad = false;
    for (std::size_t c = 0; c < p && !row_bad; ++c) row_bad = !std::isfinite(X[c * n + i]);
    if (row_bad) {
      ++bad;
      if (first.size() < kMaxReportedIndices) first.push_back(i);
    }
  }
  throw LambdaRowsError(ErrorCode::NonFinite,
                        "the predictors have non-finite values (NaN or Inf) in " +
                            plural(bad, "row", "rows") + " at " + at_indices(first, bad) +
                            ": remove or impute them first",
                        bad, first, LambdaInput::Predictors);
}

}  // namespace

void LambdaProfile::select_rows(const double* v, std::size_t n, const double* weights,
                                const std::string& what) {
  require(family_ == Family::BoxCox || family_ == Family::YeoJohnson,
          std::string("lambda can be estimated for box-cox and yeo-johnson only, not ") +
              family_name(family_));
  require(v != nullptr || n == 0, what + " is NULL");
  n_all_ = n;
  std::size_t used = n;
  if (weights) {
    check_weights(weights, n);
    used = 0;
    for (std::size_t i = 0; i < n; ++i) used += weights[i] > 0.0;
    if (used < n) {
      rows_.reserve(used);
      for (std::size_t i = 0; i < n; ++i)
        if (weights[i] > 0.0) rows_.push_back(i);
    }
  }
  // One quick pass; describe_bad_values makes the detailed ones only to word an error.
  const bool box_cox = family_ == Family::BoxCox;
  bool all_ok = true;
  for (std::size_t i = 0; i < n; ++i)
    all_ok &= (weights && !(weights[i] > 0.0)) || (std::isfinite(v[i]) && (!box_cox || v[i] > 0.0));
  if (!all_ok) describe_bad_values(v, n, weights, family_, what);
  require(used >= 3, what + " has " + plural(used, "value", "values") +
                         (weights ? " of positive weight" : "") +
                         "; estimating lambda needs at least 3 finite values");
  const auto row = [&](std::size_t i) { return rows_.empty() ? i : rows_[i]; };
  const double v0 = v[row(0)];
  bool constant = true;
  for (std::size_t i = 1; i < used && constant; ++i) constant = (v[row(i)] == v0);
  require(!constant, what + " is constant (every value is " + format_number(v0) +
                         "): no power can be estimated; leave it untransformed");
  const Eigen::Index nu = static_cast<Eigen::Index>(used);
  if (weights) {
    w_.resize(nu);
    for (Eigen::Index i = 0; i < nu; ++i) w_(i) = weights[row(static_cast<std::size_t>(i))];
    root_w_ = w_.sqrt();
    sum_w_ = w_.sum();
    sum_log_w_ = w_.log().sum();
  } else {
    sum_w_ = static_cast<double>(n);
  }
  prepare(v);
}

LambdaProfile::LambdaProfile(const double* x, std::size_t n, Family family, const std::string& what,
                             const double* weights)
    : family_(family) {
  select_rows(x, n, weights, what);
  r_ = Eigen::MatrixXd::Constant(1, 1, std::sqrt(sum_w_));  // the mean's column, 1 or sqrt(w)
  make_binned(0);
}

LambdaProfile::LambdaProfile(const double* y, const LeastSquares& design, Family family,
                             const std::string& what)
    : family_(family), design_(&design), response_(true) {
  const std::size_t n = design.n();
  select_rows(y, n, nullptr, what);
  require(design.has_intercept(), "the response lambda needs a design with an intercept column");
  check_rank(n, design.rank(), what);
  kept_ = design.kept();
  aliased_ = design.aliased();
  r_ = design.r();
  make_binned(design.columns());
  if (!binned_) return;
  const auto D = design.design();  // a view, no copy
  for (Eigen::Index r0 = 0; r0 < D.rows(); r0 += static_cast<Eigen::Index>(kTallBlockRows)) {
    const Eigen::Index nr = std::min(static_cast<Eigen::Index>(kTallBlockRows), D.rows() - r0);
    binned_->add_rows(static_cast<std::size_t>(r0), D.middleRows(r0, nr));
  }
  binned_->set_design(kept_, design.r());
  if (!binned_->useful()) binned_.reset();
}

LambdaProfile::LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p,
                             Family family, const std::string& what, const double* weights)
    : family_(family), X_(X), p_(p), response_(true) {
  select_rows(y, n, weights, what);
  make_binned(p + 1);
  DesignBlockVisitor gather;
  if (binned_)
    gather = [this](std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
      binned_->add_rows(r0, block);
    };
  adopt_design(factor_design(gather), what);
}

LambdaProfile::LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p,
                             Family family, const std::string& what, const double* weights,
                             DeferDesign)
    : family_(family), X_(X), p_(p), response_(true) {
  select_rows(y, n, weights, what);
  make_binned(p + 1);
}

TallFactor LambdaProfile::factor_design(const DesignBlockVisitor& gather) const {
  const double* X = X_;
  const std::size_t n = n_all_, p = p_;
  require(X != nullptr || p == 0, "X is NULL but p > 0");
  TallFactor f;
  if (w_.size() > 0) {
    // Weighted: the used rows scaled by sqrt(w), the intercept column sqrt(w) itself (what a
    // weighted least-squares fit factors); the copy lives only while it is factored.
    const Eigen::Index nu = t_.size();
    Eigen::MatrixXd d(nu, static_cast<Eigen::Index>(p + 1));
    d.col(0) = root_w_.matrix();
    bool finite = true;
    for (std::size_t c = 0; c < p; ++c) {
      const double* xc = X + c * n;
      double* dc = d.col(static_cast<Eigen::Index>(c + 1)).data();
      for (Eigen::Index i = 0; i < nu; ++i) {
        const double x = xc[rows_.empty() ? static_cast<std::size_t>(i) : rows_[static_cast<std::size_t>(i)]];
        finite &= std::isfinite(x);
        dc[i] = root_w_(i) * x;
      }
    }
    if (!finite) describe_bad_predictors(X, n, p, rows_);
    f = factor_tall(d.data(), static_cast<std::size_t>(nu), p + 1, false, kRankTolerance, gather);
  } else {
    try {
      f = factor_tall(X, n, p, true, kRankTolerance, gather);
    } catch (const Error& e) {
      if (e.code() == ErrorCode::NonFinite) describe_bad_predictors(X, n, p, rows_);
      throw;
    }
  }
  return f;
}

void LambdaProfile::adopt_design(const TallFactor& f, const std::string& what) {
  check_rank(static_cast<std::size_t>(t_.size()), f.rank(), what);
  kept_ = f.kept;
  aliased_ = f.aliased;
  r_ = f.r;
  if (!binned_) return;
  binned_->set_design(kept_, r_);
  if (!binned_->useful()) binned_.reset();
}

LambdaProfile::~LambdaProfile() = default;

void LambdaProfile::check_rank(std::size_t n, std::size_t rank, const std::string& what) const {
  if (n <= rank + 1)
    throw Error(ErrorCode::Singular,
                what + " has " + std::to_string(n) + " observations but the design has rank " +
                    std::to_string(rank) +
                    " (intercept included): the profile needs n > rank + 1; use fewer predictors");
}

void LambdaProfile::prepare(const double* v) {
  const Eigen::Index nn = static_cast<Eigen::Index>(rows_.empty() ? n_all_ : rows_.size());
  const auto val = [&](Eigen::Index i) {
    return v[rows_.empty() ? static_cast<std::size_t>(i) : rows_[static_cast<std::size_t>(i)]];
  };
  t_.resize(nn);
  constexpr double inf = std::numeric_limits<double>::infinity();
  if (family_ == Family::BoxCox) {
    // The centred logs are the logs of v / (its geometric mean): the profile is computed on a
    // unit-free scale and the scale comes back exactly, in log space, through centre_.
    for (Eigen::Index i = 0; i < nn; ++i) t_(i) = std::log(val(i));
    centre_ = t_.mean();
    any_pos_ = true;
    pos_min_ = inf;
    pos_max_ = -inf;
    for (Eigen::Index i = 0; i < nn; ++i) {  // centre and range in one pass
      const double t = t_(i) - centre_;
      t_(i) = t;
      pos_min_ = std::min(pos_min_, t);
      pos_max_ = std::max(pos_max_, t);
    }
    jac_sum_ = t_.sum();
    return;
  }
  neg_.resize(nn);
  pos_min_ = neg_min_ = inf;
  pos_max_ = neg_max_ = -inf;
  for (Eigen::Index i = 0; i < nn; ++i) {
    const double vi = val(i);
    const bool ng = vi < 0.0;
    const double t = std::log1p(std::fabs(vi));
    neg_(i) = ng;
    t_(i) = t;
    if (ng) {
      any_neg_ = true;
      sum_neg_ += t;
      neg_min_ = std::min(neg_min_, t);
      neg_max_ = std::max(neg_max_, t);
    } else {
      any_pos_ = true;
      sum_pos_ += t;
      pos_min_ = std::min(pos_min_, t);
      pos_max_ = std::max(pos_max_, t);
    }
  }
  // One sign only: centre the logs as for Box-Cox. The constant -1/k then drops out of the RSS
  // (there is an intercept), so spreads far below 1/k (huge values, negative k) are not lost.
  jac_sum_ = sum_pos_ - sum_neg_;
  if (!any_neg_ || !any_pos_) {
    centre_ = t_.mean();
    t_ -= centre_;
    jac_sum_ = any_neg_ ? -t_.sum() : t_.sum();
    centre_on_second_ = any_neg_;
    if (any_neg_) {
      neg_min_ -= centre_;
      neg_max_ -= centre_;
    } else {
      pos_min_ -= centre_;
      pos_max_ -= centre_;
    }
  }
}

void LambdaProfile::make_binned(std::size_t columns) {
  if (static_cast<std::size_t>(t_.size()) < kBinnedMinimumN) return;
  const bool weighted = w_.size() > 0;
  binned_.reset(new BinnedProfile(t_, neg_, family_ == Family::YeoJohnson, kBinnedKValid, columns,
                                  weighted ? &w_ : nullptr, weighted ? &root_w_ : nullptr));
  if (!binned_->useful()) binned_.reset();
}

double LambdaProfile::loglik(double lambda, bool direct) const {
  double out;
  loglik_batch(&lambda, 1, &out, direct);
  return out;
}

void LambdaProfile::loglik_batch(const double* lambdas, std::size_t m, double* out,
                                 bool direct) const {
  poll_cancel();  // once per batch of lambda evaluations
  std::vector<double> pending;
  std::vector<std::size_t> where;
  for (std::size_t j = 0; j < m; ++j) {
    double fast;
    if (!direct && binned_ && binned_->log_rss(lambdas[j], &fast)) {
      out[j] = fast;
    } else {
      pending.push_back(lambdas[j]);
      where.push_back(j);
    }
  }
  if (!pending.empty()) {
    std::vector<double> lr(pending.size());
    log_rss_direct(pending.data(), pending.size(), lr.data());
    for (std::size_t q = 0; q < pending.size(); ++q) out[where[q]] = lr[q];
  }
  // With the logs centred at c, RSS(lambda) = exp(2 k c) RSS_c(lambda) (k = lambda, or 2 - lambda
  // for Yeo-Johnson's negatives) and the Jacobian is (k - 1) n c plus the centred part; the terms
  // in lambda c cancel exactly, leaving -n c. Adding them as that one constant keeps the profile's
  // shape free of the rounding of n lambda c, so the estimate does not depend on y's units.
  const double n = static_cast<double>(t_.size());
  for (std::size_t j = 0; j < m; ++j) {
    const double lambda = lambdas[j];
    const double jac = (lambda - 1.0) * jac_sum_;
    out[j] = 0.5 * sum_log_w_ - 0.5 * n * (kLog2PiPlus1 + out[j] - std::log(n)) + jac - n * centre_;
  }
}

}  // namespace detail
}  // namespace powerback
