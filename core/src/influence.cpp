// Leave-one-out response lambda by the deletion identity (see influence.hpp).
#include "powerback/influence.hpp"

#include <Eigen/Dense>
#include <boost/math/tools/minima.hpp>
#include <cmath>
#include <cstdint>
#include <limits>
#include <string>

#include "powerback/errors.hpp"
#include "powerback/family_math.hpp"

namespace powerback {

namespace {

constexpr double kLog2Pi = 1.8378770664093454835606594728112353;
// The same search settings as the full-data estimate (lambda_search.cpp).
constexpr int kMinimiserBits = std::numeric_limits<double>::digits / 2;
constexpr std::uintmax_t kMaxIter = 200;

// Transformed, residualised responses at one lambda, reused by every row.
class DeletionProfile {
 public:
  DeletionProfile(const double* y, const LeastSquares& ls, Family family)
      : ls_(ls), family_(family), y_(Eigen::Map<const Eigen::VectorXd>(y, static_cast<Eigen::Index>(ls.n()))) {
    const Eigen::Index n = y_.size();
    h_ = ls.leverages();
    if (family_ == Family::BoxCox) {
      log_gm_ = y_.array().log().mean();
      scaled_ = (y_.array().log() - log_gm_).exp().matrix();
    } else {
      scaled_ = y_;
    }
    logd1_.resize(n);  // log |psi'| at lambda = 1 pieces: (lambda - 1) * logd1_ for both families
    for (Eigen::Index i = 0; i < n; ++i)
      logd1_(i) = family_ == Family::BoxCox ? std::log(y_(i))
                  : (y_(i) >= 0 ? std::log1p(y_(i)) : -std::log1p(-y_(i)));
    sum_logd1_ = logd1_.sum();
  }

  // Residuals of the transformed (scaled) response at lambda; RSS for all rows.
  void at(double lambda) {
    if (lambda == cached_) return;
    Eigen::VectorXd z(scaled_.size());
    for (Eigen::Index i = 0; i < z.size(); ++i) z(i) = math::forward(family_, scaled_(i), lambda);
    e_ = ls_.residuals(z);
    rss_ = e_.squaredNorm();
    cached_ = lambda;
  }

  // Profile log-likelihood of the data without row i (i = n: no row left out).
  double loglik(double lambda, std::size_t i) {
    at(lambda);
    const Eigen::Index ii = static_cast<Eigen::Index>(i);
    const bool drop = ii < scaled_.size();
    double rss = rss_;
    double jac = sum_logd1_;
    if (drop) {
      const double one_minus_h = 1.0 - h_(ii);
      if (one_minus_h > 1e-10) rss -= e_(ii) * e_(ii) / one_minus_h;
      jac -= logd1_(ii);
    }
    const double m = static_cast<double>(scaled_.size() - (drop ? 1 : 0));
    // Undo the geometric-mean scaling: RSS(y) = RSS(y / g) * g^(2 lambda).
    const double log_rss = std::log(std::fmax(rss, 0.0)) + 2.0 * lambda * log_gm_;
    return -0.5 * m * (kLog2Pi + 1.0 + log_rss - std::log(m)) + (lambda - 1.0) * jac;
  }

  const Eigen::VectorXd& leverages() const { return h_; }

 private:
  const LeastSquares& ls_;
  Family family_;
  Eigen::VectorXd y_, scaled_, h_, logd1_, e_;
  double log_gm_ = 0.0, sum_logd1_ = 0.0, rss_ = 0.0;
  double cached_ = std::numeric_limits<double>::quiet_NaN();
};

}  // namespace

LambdaInfluence lambda_influence(const double* y, const double* X, std::size_t n, std::size_t p,
                                 Family family, const LambdaOptions& opt) {
  require(family == Family::BoxCox || family == Family::YeoJohnson,
          "lambda influence needs the box-cox or yeo-johnson family");
  const LeastSquares ls(X, n, p);
  LambdaInfluence out;
  // Validates y, the options and the family's domain, and gives the interval.
  out.full = estimate_response_lambda(y, ls, family, opt);
  if (n < ls.rank() + 3)
    throw Error(ErrorCode::Singular,
                "leaving one row out of " + std::to_string(n) + " rows leaves no residual degrees of "
                "freedom for a design of rank " + std::to_string(ls.rank()) + ": more rows are needed");
  DeletionProfile prof(y, ls, family);
  const Eigen::VectorXd& h = prof.leverages();
  out.loo_lambda.resize(n);
  out.leverage.resize(n);
  out.outside.resize(n);
  out.at_bound.resize(n);
  out.converged.resize(n);
  const double near = 1e-4 * (opt.upper - opt.lower);
  for (std::size_t i = 0; i < n; ++i) {
    const auto neg = [&](double l) { return -prof.loglik(l, i); };
    std::uintmax_t it = kMaxIter;
    const auto best =
        boost::math::tools::brent_find_minima(neg, opt.lower, opt.upper, kMinimiserBits, it);
    double lhat = best.first, lmax = -best.second;
    bool bound = false;
    for (double edge : {opt.lower, opt.upper}) {
      if (std::fabs(lhat - edge) < near) {
        const double le = prof.loglik(edge, i);
        if (le >= lmax) {
          lhat = edge;
          lmax = le;
        }
        bound = true;
      }
    }
    out.loo_lambda[i] = lhat;
    out.leverage[i] = h(static_cast<Eigen::Index>(i));
    out.at_bound[i] = bound ? 1 : 0;
    out.converged[i] = it < kMaxIter ? 1 : 0;
    out.outside[i] = (lhat < out.full.conf_low || lhat > out.full.conf_high) ? 1 : 0;
  }
  return out;
}

}  // namespace powerback
