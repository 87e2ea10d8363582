// The profile log-likelihood of a power-family lambda: input checks, the once-only preparation
// of the data and the overflow-free evaluation at one lambda.
#include "powerback/lambda.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

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

// NaN/Inf first, then the Box-Cox domain; each error names the count and first 0-based indices.
[[noreturn]] void describe_bad_values(const double* v, std::size_t n, Family family,
                                     const std::string& what) {
  std::size_t bad = 0;
  std::vector<std::size_t> first;
  for (std::size_t i = 0; i < n; ++i)
    if (!std::isfinite(v[i])) {
      ++bad;
      if (first.size() < kMaxReportedIndices) first.push_back(i);
    }
  if (bad)
    throw IndexedError(ErrorCode::NonFinite,
                       what + " has " + plural(bad, "non-finite value", "non-finite values") +
                           " (NaN or Inf) at " + (bad == 1 ? "index " : "indices ") +
                           format_indices(first, bad) + " (0-based): remove or impute them first",
                       bad, first);
  if (family == Family::BoxCox) {
    for (std::size_t i = 0; i < n; ++i)
      if (!(v[i] > 0.0)) {
        ++bad;
        if (first.size() < kMaxReportedIndices) first.push_back(i);
      }
    if (bad)
      throw IndexedError(ErrorCode::Domain,
                         "Box-Cox needs " + what + " > 0; " + plural(bad, "value", "values") +
                             " <= 0 at " + (bad == 1 ? "index " : "indices ") +
                             format_indices(first, bad) +
                             " (0-based): use Yeo-Johnson or a shift that makes every value > 0",
                         bad, first);
  }
  throw Error(ErrorCode::Argument, what + " has values that cannot be used");
}

// The family, then every value (finite; > 0 for Box-Cox), the count and constancy.
void check_values(const double* v, std::size_t n, Family family, const std::string& what) {
  require(family == Family::BoxCox || family == Family::YeoJohnson,
          std::string("lambda can be estimated for box-cox and yeo-johnson only, not ") +
              family_name(family));
  require(v != nullptr || n == 0, what + " is NULL");
  // One quick pass; describe_bad_values makes the detailed ones only to word an error.
  const bool box_cox = family == Family::BoxCox;
  bool all_ok = true;
  for (std::size_t i = 0; i < n; ++i) all_ok &= std::isfinite(v[i]) && (!box_cox || v[i] > 0.0);
  if (!all_ok) describe_bad_values(v, n, family, what);
  require(n >= 3, what + " has " + plural(n, "value", "values") +
                      "; estimating lambda needs at least 3 finite values");
  const double v0 = v[0];
  bool constant = true;
  for (std::size_t i = 1; i < n && constant; ++i) constant = (v[i] == v0);
  require(!constant, what + " is constant (every value is " + format_number(v0) +
                         "): no power can be estimated; leave it untransformed");
}

}  // namespace

LambdaProfile::LambdaProfile(const double* x, std::size_t n, Family family, const std::string& what)
    : family_(family) {
  check_values(x, n, family, what);
  prepare(x, n);
  make_binned(0);
}

LambdaProfile::LambdaProfile(const double* y, const LeastSquares& design, Family family,
                             const std::string& what)
    : family_(family), design_(&design), response_(true) {
  const std::size_t n = design.n();
  check_values(y, n, family, what);
  require(design.has_intercept(), "the response lambda needs a design with an intercept column");
  check_rank(n, design.rank(), what);
  kept_ = design.kept();
  aliased_ = design.aliased();
  prepare(y, n);
  make_binned(design.columns());
  if (!binned_) return;
  const Eigen::MatrixXd& D = design.design();
  for (Eigen::Index r0 = 0; r0 < D.rows(); r0 += static_cast<Eigen::Index>(kTallBlockRows)) {
    const Eigen::Index nr = std::min(static_cast<Eigen::Index>(kTallBlockRows), D.rows() - r0);
    binned_->add_rows(static_cast<std::size_t>(r0), D.middleRows(r0, nr));
  }
  binned_->set_design(kept_, design.r());
  if (!binned_->useful()) binned_.reset();
}

LambdaProfile::LambdaProfile(const double* y, const double* X, std::size_t n, std::size_t p,
                             Family family, const std::string& what)
    : family_(family), X_(X), response_(true) {
  check_values(y, n, family, what);
  prepare(y, n);
  make_binned(p + 1);
  DesignBlockVisitor gather;
  if (binned_)
    gather = [this](std::size_t r0, const Eigen::Ref<const Eigen::MatrixXd>& block) {
      binned_->add_rows(r0, block);
    };
  const TallFactor f = factor_tall(X, n, p, true, kRankTolerance, gather);
  check_rank(n, f.rank(), what);
  kept_ = f.kept;
  aliased_ = f.aliased;
  if (!binned_) return;
  binned_->set_design(kept_, f.r);
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

const LeastSquares& LambdaProfile::direct_design() const {
  if (design_) return *design_;
  if (!owned_) {
    // The kept columns only, so that the rank decision made on R stands (tolerance 0: nothing
    // more is dropped).
    const Eigen::Index n = t_.size(), k = static_cast<Eigen::Index>(kept_.size());
    Eigen::MatrixXd d(n, k);
    for (Eigen::Index c = 0; c < k; ++c) {
      const std::size_t col = kept_[static_cast<std::size_t>(c)];
      if (col == 0) d.col(c).setOnes();
      else d.col(c) = Eigen::Map<const Eigen::VectorXd>(X_ + (col - 1) * static_cast<std::size_t>(n), n);
    }
    owned_.reset(new LeastSquares(d, 0.0));
  }
  return *owned_;
}

void LambdaProfile::prepare(const double* v, std::size_t n) {
  const Eigen::Index nn = static_cast<Eigen::Index>(n);
  t_.resize(nn);
  constexpr double inf = std::numeric_limits<double>::infinity();
  if (family_ == Family::BoxCox) {
    for (Eigen::Index i = 0; i < nn; ++i) t_(i) = std::log(v[i]);
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
    return;
  }
  neg_.resize(nn);
  pos_min_ = neg_min_ = inf;
  pos_max_ = neg_max_ = -inf;
  for (Eigen::Index i = 0; i < nn; ++i) {
    const bool ng = v[i] < 0.0;
    const double t = std::log1p(std::fabs(v[i]));
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
  if (!any_neg_ || !any_pos_) {
    centre_ = t_.mean();
    t_ -= centre_;
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
  binned_.reset(new BinnedProfile(t_, neg_, family_ == Family::YeoJohnson, kBinnedKValid, columns));
  if (!binned_->useful()) binned_.reset();
}

namespace {
// s * expm1(k t) / k, divided by exp(m) when scaled (m > 0); k == 0 gives the log limit s * t.
inline double power_term(double t, double k, double m, bool scaled) {
  if (!scaled) return k == 0.0 ? t : std::expm1(k * t) / k;
  if (k == 0.0) return t * std::exp(-m);
  return (std::exp(k * t - m) - std::exp(-m)) / k;
}
}  // namespace

double LambdaProfile::log_rss(double lambda) const {
  double fast;
  const double shift = 2.0 * (centre_on_second_ ? 2.0 - lambda : lambda) * centre_;
  if (binned_ && binned_->log_rss(lambda, &fast)) return fast + shift;
  return log_rss_direct(lambda) + shift;
}

double LambdaProfile::log_rss_direct(double lambda) const {
  const double k1 = lambda, k2 = 2.0 - lambda;
  double m = -std::numeric_limits<double>::infinity();
  if (any_pos_) m = std::max({m, k1 * pos_min_, k1 * pos_max_});
  if (any_neg_) m = std::max({m, k2 * neg_min_, k2 * neg_max_});
  const bool scaled = m > kDirectLimit;
  const Eigen::Index n = t_.size();
  if (w_.size() != n) w_.resize(n);  // work space, only when evaluating directly
  double* w = w_.data();
  const double* t = t_.data();
  if (family_ == Family::BoxCox) {
    if (!scaled && k1 != 0.0) {
      for (Eigen::Index i = 0; i < n; ++i) w[i] = std::expm1(k1 * t[i]);
      w_ /= k1;
    } else {
      for (Eigen::Index i = 0; i < n; ++i) w[i] = power_term(t[i], k1, m, scaled);
    }
  } else {
    for (Eigen::Index i = 0; i < n; ++i)
      w[i] = neg_(i) ? -power_term(t[i], k2, m, scaled) : power_term(t[i], k1, m, scaled);
  }
  double rss;
  if (response_) {
    rss = direct_design().rss(w_);
  } else {
    const double mean = w_.mean();
    rss = (w_.array() - mean).square().sum();
  }
  double out = std::log(rss);
  if (scaled) out += 2.0 * m;
  return out;
}

double LambdaProfile::loglik(double lambda, bool direct) const {
  const double n = static_cast<double>(t_.size());
  const double jac = family_ == Family::BoxCox ? (lambda - 1.0) * n * centre_
                                               : (lambda - 1.0) * (sum_pos_ - sum_neg_);
  const double lr = direct ? log_rss_direct(lambda) + 2.0 * (centre_on_second_ ? 2.0 - lambda : lambda) * centre_
                           : log_rss(lambda);
  return -0.5 * n * (kLog2PiPlus1 + lr - std::log(n)) + jac;
}

}  // namespace detail
}  // namespace powerback
