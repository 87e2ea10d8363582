// Leave-one-out response lambda for every row in O(n) from the shared full-data profile (see
// influence.hpp).
#include "powerback/influence.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <boost/math/constants/constants.hpp>
#include <boost/math/special_functions/chebyshev.hpp>
#include <cmath>
#include <functional>
#include <memory>
#include <string>
#include <type_traits>
#include <utility>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/family_math.hpp"
#include "powerback/lambda_maximise.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {
namespace {

using Index = Eigen::Index;
using RowMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
using ProfileFn = std::function<std::vector<double>(const std::vector<double>&)>;

// The window spans lambda-hat +- this many interval half-widths.
constexpr double kWindowHalfWidths = 1.5;
// Panels are narrow enough that rho = width * T / 4 <= 1 (T the largest |log magnitude|), and
// hold the fewest nodes K (between the bounds) with 2 rho^K / K! below the target.
constexpr double kPanelRho = 1.0;
constexpr int kMinNodes = 4, kMaxNodes = 24;
constexpr double kInterpolationTarget = 1e-17;
// Largest exponent k t evaluated without rescaling (exp(300)^2 times 1e12 rows stays finite).
constexpr double kDirectLimit = 300.0;
// A leverage this close to 1 means the row is fitted exactly: its residual is 0 at every lambda.
constexpr double kUnitLeverage = 1e-10;
// Rows of the leave-one-out loop between two polls of the caller's cancel check.
constexpr Index kRowsPerPoll = 256;

// The rows used (weight > 0) in the form the residuals need: every power of the family is
// s_i expm1(k_i t_i) / k_i with k_i = lambda, or 2 - lambda for Yeo-Johnson's negatives (s = -1).
struct Rows {
  Eigen::VectorXd sqrt_w;           // sqrt of the weights (empty: unweighted)
  Eigen::ArrayXd t;                 // log y - mean (Box-Cox); log1p |y| (Yeo-Johnson)
  Eigen::Array<bool, Eigen::Dynamic, 1> neg;  // Yeo-Johnson: y < 0
  Eigen::ArrayXd d;                 // Jacobian slope: log psi'(y; lambda) = (lambda - 1) d
  double t_max = 0.0;               // max |t|
};

void check_weights(const double* w, std::size_t n) {
  std::size_t bad = 0, neg = 0, used = 0;
  std::vector<std::size_t> first_bad, first_neg;
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(w[i])) {
      if (++bad <= kMaxReportedIndices) first_bad.push_back(i);
    } else if (w[i] < 0.0) {
      if (++neg <= kMaxReportedIndices) first_neg.push_back(i);
    } else if (w[i] > 0.0) {
      ++used;
    }
  }
  if (bad)
    throw IndexedError(ErrorCode::NonFinite,
                       "the weights have " + std::to_string(bad) + " non-finite values at indices " +
                           format_indices(first_bad, bad) + " (0-based): give every row a finite weight",
                       bad, first_bad);
  if (neg)
    throw IndexedError(ErrorCode::Domain,
                       "the weights must be >= 0; " + std::to_string(neg) + " are negative at indices " +
                           format_indices(first_neg, neg) + " (0-based): fix or drop those rows",
                       neg, first_neg);
  require(used > 0, "every weight is 0: no row is left to estimate lambda");
}

// The used rows of a column-major n-by-cols array.
std::vector<double> pick(const double* v, std::size_t n, std::size_t cols,
                         const std::vector<std::size_t>& rows) {
  std::vector<double> out(rows.size() * cols);
  for (std::size_t c = 0; c < cols; ++c)
    for (std::size_t r = 0; r < rows.size(); ++r) out[c * rows.size() + r] = v[c * n + rows[r]];
  return out;
}

Rows prepare(const double* y, std::size_t count, const double* w,
             const std::vector<std::size_t>& index, Family family) {
  Rows r;
  const Index n = static_cast<Index>(count);
  if (w) {
    r.sqrt_w.resize(n);
    for (Index i = 0; i < n; ++i) r.sqrt_w(i) = std::sqrt(w[index[static_cast<std::size_t>(i)]]);
  }
  r.t.resize(n);
  r.neg.resize(n);
  r.d.resize(n);
  for (Index i = 0; i < n; ++i) {
    const double v = y[i];
    r.neg(i) = family == Family::YeoJohnson && v < 0.0;
    r.t(i) = family == Family::BoxCox ? std::log(v) : std::log1p(std::fabs(v));
    r.d(i) = math::log_deriv(family, v, 2.0);  // (2 - 1) d_i
  }
  if (family == Family::BoxCox) r.t -= r.t.mean();  // a scale factor: residuals only rescale
  r.t_max = r.t.abs().maxCoeff();
  return r;
}

// The transformed responses at lambda, divided by exp(M) when the largest exponent M would
// overflow (normalised residuals do not change under a common factor; the constant e^-M / k
// that the rescaling leaves differs between Yeo-Johnson's groups by less than e^-300).
Eigen::VectorXd transformed(const Rows& r, double lambda) {
  const Index n = r.t.size();
  double big = 0.0;
  for (Index i = 0; i < n; ++i) big = std::max(big, (r.neg(i) ? 2.0 - lambda : lambda) * r.t(i));
  Eigen::VectorXd z(n);
  for (Index i = 0; i < n; ++i) {
    const double k = r.neg(i) ? 2.0 - lambda : lambda, s = r.neg(i) ? -1.0 : 1.0;
    if (big <= kDirectLimit) z(i) = k == 0.0 ? s * r.t(i) : s * std::expm1(k * r.t(i)) / k;
    else z(i) = s * (std::exp(k * r.t(i) - big) - std::exp(-big)) / k;
  }
  if (r.sqrt_w.size()) z.array() *= r.sqrt_w.array();
  return z;
}

// e / ||e|| of the (weighted) fit at lambda.
Eigen::VectorXd normalised_residuals(const Rows& r, const LeastSquares& ls, double lambda) {
  Eigen::VectorXd e = ls.residuals(transformed(r, lambda));
  const double norm = e.norm();
  if (norm > 0.0) e /= norm;
  return e;
}

// The full-data profile and every row's normalised residual on [a, b], interpolated on panels of
// Chebyshev nodes.
class SharedWindow {
 public:
  SharedWindow(const Rows& r, const LeastSquares& ls, const ProfileFn& profile, double a, double b)
      : a_(a) {
    const double span = b - a;
    panels_ = std::max(1, static_cast<int>(std::ceil(span * r.t_max / (4.0 * kPanelRho))));
    width_ = span / panels_;
    const double rho = width_ * r.t_max / 4.0;
    double term = 2.0;  // 2 rho^K / K!
    nodes_ = 0;
    while (nodes_ < kMaxNodes && (nodes_ < kMinNodes || term >= kInterpolationTarget)) {
      ++nodes_;
      term *= rho / nodes_;
    }
    const Index K = nodes_, P = panels_, n = r.t.size();
    // Chebyshev coefficients from values at the nodes x_k = cos(pi (k + 1/2) / K):
    // c_j = (2 / K) sum_k f(x_k) cos(pi j (k + 1/2) / K).
    const double pi = boost::math::constants::pi<double>();
    Eigen::MatrixXd to_coef(K, K);
    Eigen::VectorXd x(K);
    for (Index k = 0; k < K; ++k) {
      x(k) = std::cos(pi * (k + 0.5) / K);
      for (Index j = 0; j < K; ++j) to_coef(k, j) = 2.0 / K * std::cos(pi * j * (k + 0.5) / K);
    }
    std::vector<double> grid(static_cast<std::size_t>(K * P));
    for (Index p = 0; p < P; ++p)
      for (Index k = 0; k < K; ++k)
        grid[static_cast<std::size_t>(p * K + k)] = a + width_ * (p + 0.5 * (x(k) + 1.0));
    const std::vector<double> l = profile(grid);
    Eigen::Map<const Eigen::MatrixXd> lv(l.data(), K, P);
    profile_coef_ = to_coef.transpose() * lv;  // K x P
    coef_.resize(n, K * P);
    Eigen::MatrixXd values(n, K);
    for (Index p = 0; p < P; ++p) {
      poll_cancel();  // each panel costs K least-squares passes
      for (Index k = 0; k < K; ++k)
        values.col(k) = normalised_residuals(r, ls, grid[static_cast<std::size_t>(p * K + k)]);
      coef_.middleCols(p * K, K).noalias() = values * to_coef;
    }
  }

  double loglik(double lambda) const {
    double x;
    const Index p = locate(lambda, &x);
    return boost::math::chebyshev_clenshaw_recurrence(profile_coef_.col(p).data(),
                                                      static_cast<std::size_t>(nodes_), x);
  }
  double u(Index i, double lambda) const {
    double x;
    const Index p = locate(lambda, &x);
    return boost::math::chebyshev_clenshaw_recurrence(coef_.row(i).data() + p * nodes_,
                                                      static_cast<std::size_t>(nodes_), x);
  }

 private:
  Index locate(double lambda, double* x) const {
    const double s = (lambda - a_) / width_;
    const Index p = std::min<Index>(panels_ - 1, std::max<Index>(0, static_cast<Index>(std::floor(s))));
    *x = std::min(1.0, std::max(-1.0, 2.0 * (s - static_cast<double>(p)) - 1.0));
    return p;
  }

  double a_, width_ = 0.0;
  int panels_ = 1, nodes_ = kMinNodes;
  Eigen::MatrixXd profile_coef_;
  RowMatrix coef_;
};

// Row i's leave-one-out profile, up to a constant (see influence.hpp).
struct RowProfile {
  double ratio, d_over_n, half_m;
  double operator()(double l_full, double u, double lambda, double d_i, double h_i) const {
    double v = ratio * l_full + (lambda - 1.0) * (d_over_n - d_i);
    if (1.0 - h_i > kUnitLeverage) {
      const double q = std::min(u * u / (1.0 - h_i), 1.0 - 1e-15);
      v -= half_m * std::log1p(-q);
    }
    return v;
  }
};

// The weighted full-data estimate and profile come from the lambda search's weighted forms
// (LambdaOptions::weights and the weighted response_lambda_profile), resolved at compile time so
// that this file builds against a core without them; such a core refuses weights here.
template <class O, class = void>
struct HasWeights : std::false_type {};
template <class O>
struct HasWeights<O, decltype(void(std::declval<O&>().weights))> : std::true_type {};

// Weights carried by the options themselves, and the options without them.
template <class O>
const double* weights_of(const O& opt) {
  if constexpr (HasWeights<O>::value) return opt.weights;
  else return nullptr;
}
template <class O>
O without_weights(O opt) {
  if constexpr (HasWeights<O>::value) opt.weights = nullptr;
  return opt;
}

template <class O>
LambdaEstimate weighted_estimate(const double* y, const double* X, std::size_t n, std::size_t p,
                                 Family family, O opt, const double* w) {
  if constexpr (HasWeights<O>::value) {
    opt.weights = w;
    return estimate_response_lambda(y, X, n, p, family, opt);
  } else {
    throw Error(ErrorCode::Argument, "this build's lambda search has no weights");
  }
}

template <class O>
std::vector<double> weighted_profile(const O& opt, const double* y, const double* X, std::size_t n,
                                     std::size_t p, Family family, const double* w,
                                     const std::vector<double>& g) {
  if constexpr (HasWeights<O>::value) {
    const decltype(opt.weights) wd = w;
    return response_lambda_profile(y, X, n, p, family, wd, g.data(), g.size());
  } else {
    throw Error(ErrorCode::Argument, "this build's lambda search has no weights");
  }
}

}  // namespace

LambdaInfluence lambda_influence(const double* y, const double* X, std::size_t n, std::size_t p,
                                 Family family, const LambdaOptions& options,
                                 const double* weights) {
  if (!weights) weights = weights_of(options);
  const LambdaOptions opt = without_weights(options);
  require(family == Family::BoxCox || family == Family::YeoJohnson,
          "lambda influence needs the box-cox or yeo-johnson family");
  require(y != nullptr && (X != nullptr || p == 0), "y or X is NULL");
  std::vector<std::size_t> used;
  if (weights) {
    check_weights(weights, n);
    for (std::size_t i = 0; i < n; ++i)
      if (weights[i] > 0.0) used.push_back(i);
  } else {
    used.resize(n);
    for (std::size_t i = 0; i < n; ++i) used[i] = i;
  }
  const std::size_t N = used.size();
  // The used rows: the caller's arrays themselves when every row is used.
  std::vector<double> y_pick, X_pick;
  if (N < n) {
    y_pick = pick(y, n, 1, used);
    X_pick = pick(X, n, p, used);
  }
  const double* yu = N < n ? y_pick.data() : y;
  const double* Xu = N < n ? X_pick.data() : X;

  LambdaInfluence out;
  std::unique_ptr<LeastSquares> ls;
  ProfileFn profile;
  if (!weights) {
    ls.reset(new LeastSquares(Xu, N, p));
    // Validates y, the options and the family's domain, and gives the interval.
    out.full = estimate_response_lambda(yu, *ls, family, opt);
    profile = [&](const std::vector<double>& g) {
      return response_lambda_profile(yu, *ls, family, g.data(), g.size());
    };
  } else {
    std::vector<double> wu(N), design(N * (p + 1));
    for (std::size_t r = 0; r < N; ++r) {
      wu[r] = weights[used[r]];
      const double s = std::sqrt(wu[r]);
      design[r] = s;
      for (std::size_t c = 0; c < p; ++c) design[(c + 1) * N + r] = s * Xu[c * N + r];
    }
    ls.reset(new LeastSquares(design.data(), N, p + 1, false));
    out.full = weighted_estimate(yu, Xu, N, p, family, opt, wu.data());
    profile = [&, wu](const std::vector<double>& g) {
      return weighted_profile(opt, yu, Xu, N, p, family, wu.data(), g);
    };
  }
  const std::size_t rank = ls->rank();
  if (N < rank + 3)
    throw Error(ErrorCode::Singular,
                "leaving one row out of " + std::to_string(N) + " rows leaves no residual degrees of "
                "freedom for a design of rank " + std::to_string(rank) + ": more rows are needed");
  const Rows rows = prepare(yu, N, weights, used, family);
  const Eigen::VectorXd h = ls->leverages();
  const double Nd = static_cast<double>(N), m = Nd - 1.0;
  const RowProfile row_profile{m / Nd, rows.d.sum() / Nd, 0.5 * m};

  const double lhat = out.full.lambda;
  double half = std::max(out.full.conf_high - lhat, lhat - out.full.conf_low);
  if (!(half > 0.0) || !std::isfinite(half)) half = 0.05 * (opt.upper - opt.lower);
  const double a = std::max(opt.lower, lhat - kWindowHalfWidths * half);
  const double b = std::min(opt.upper, lhat + kWindowHalfWidths * half);
  const SharedWindow window(rows, *ls, profile, a, b);

  // The exact profile of one row, for rows whose maximum leaves the window.
  double exact_at = math::kNaN, exact_l = math::kNaN;
  Eigen::VectorXd exact_u;
  const auto exact = [&](double lambda) {
    if (lambda != exact_at) {
      poll_cancel();  // an exact evaluation is a full least-squares pass
      exact_u = normalised_residuals(rows, *ls, lambda);
      exact_l = profile({lambda})[0];
      exact_at = lambda;
    }
  };

  out.loo_lambda.assign(n, lhat);
  out.leverage.assign(n, 0.0);
  out.outside.assign(n, 0);
  out.at_bound.assign(n, out.full.at_bound ? 1 : 0);
  out.converged.assign(n, out.full.converged ? 1 : 0);
  for (Index i = 0; i < static_cast<Index>(N); ++i) {
    if (i % kRowsPerPoll == 0) poll_cancel();  // a row's maximisation alone is too cheap to poll
    const double d_i = rows.d(i), h_i = h(i);
    ProfileMaximum best = maximise_profile(
        [&](double l) { return row_profile(window.loglik(l), window.u(i, l), l, d_i, h_i); }, a, b);
    // At an inner edge of the window: the row's maximum lies beyond it.
    const bool low_side = best.lambda - a < b - best.lambda;
    if (best.at_bound && (low_side ? a > opt.lower : b < opt.upper)) {
      best = maximise_profile(
          [&](double l) {
            exact(l);
            return row_profile(exact_l, exact_u(i), l, d_i, h_i);
          },
          opt.lower, opt.upper);
      ++out.n_exact;
    }
    const std::size_t r = used[static_cast<std::size_t>(i)];
    out.loo_lambda[r] = best.lambda;
    out.leverage[r] = h_i;
    out.at_bound[r] = best.at_bound ? 1 : 0;
    out.converged[r] = best.converged ? 1 : 0;
  }
  for (std::size_t r = 0; r < n; ++r) {
    const double l = out.loo_lambda[r];
    out.outside[r] = (l < out.full.conf_low || l > out.full.conf_high) ? 1 : 0;
    out.n_outside += out.outside[r];
    out.n_at_bound += out.at_bound[r];
  }
  return out;
}

}  // namespace powerback
