// The maximum and likelihood-ratio interval of a profile log-likelihood given as a function:
// Boost's Brent minimiser on its negation, then on each side a geometric bracket search for the
// chi-square cut and Boost's TOMS 748 root finder on the bracket.
#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/tools/minima.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <cstdint>

#include "powerback/accumulate_detail.hpp"
#include "powerback/cancel.hpp"
#include "powerback/transform.hpp"

namespace powerback {
namespace summary_detail {
namespace {

constexpr std::uintmax_t kIterations = 200;
constexpr int kMaxBits = std::numeric_limits<double>::digits / 2;  // a maximum's attainable accuracy
constexpr int kEndBits = 40;                                       // simple roots: far tighter

struct End {
  double at;
  bool open, ok;
};

// Walks from lhat towards edge in steps growing from `first` until g <= 0 (then solves) or the
// edge is reached with g still > 0 (an open side).
End find_end(const std::function<double(double)>& g, double lhat, double first, double edge, double dir) {
  if (dir * (edge - lhat) <= 0.0) return {edge, true, true};
  double inside = lhat, g_inside = g(lhat);
  double step = first;
  for (int k = 0; k < 200; ++k) {
    double x = lhat + dir * step;
    const bool last = dir * (x - edge) >= 0.0;
    if (last) x = edge;
    const double gx = g(x);
    if (!(gx > 0.0)) {
      if (gx == 0.0) return {x, false, true};
      std::uintmax_t it = kIterations;
      const auto tol = boost::math::tools::eps_tolerance<double>(kEndBits);
      const auto r = dir < 0 ? boost::math::tools::toms748_solve(g, x, inside, gx, g_inside, tol, it)
                             : boost::math::tools::toms748_solve(g, inside, x, g_inside, gx, tol, it);
      return {0.5 * (r.first + r.second), false, it < kIterations};
    }
    if (last) return {edge, true, true};
    inside = x;
    g_inside = gx;
    step *= 1.6;
  }
  return {inside, false, false};
}

// A first step for the bracket search: where a quadratic through three values near lhat puts the
// cut (only a starting point; the search does not rely on it).
double first_step(const std::function<double(double)>& g, double lhat, double half_q, double lo, double hi) {
  const double width = hi - lo;
  const double d = 1e-3 * width;
  const double a = std::max(lo, lhat - d), b = std::min(hi, lhat + d);
  const double ga = g(a), gb = g(b);
  const double da = lhat - a, db = b - lhat;
  double curv = 0.0;
  if (da > 0 && db > 0) curv = -2.0 * (ga * db + gb * da - half_q * (da + db)) / (da * db * (da + db));
  else if (da > 0) curv = -2.0 * (ga - half_q) / (da * da);
  else if (db > 0) curv = -2.0 * (gb - half_q) / (db * db);
  if (!(curv > 0.0) || !std::isfinite(curv)) return 0.05 * width;
  return std::min(0.9 * std::sqrt(2.0 * half_q / curv), width);
}

}  // namespace

void check_lambda_options(const LambdaOptions& opt) {
  require(std::isfinite(opt.lower) && std::isfinite(opt.upper) && opt.lower < opt.upper,
          "the lambda search range needs finite lower < upper; got [" + format_number(opt.lower) +
              ", " + format_number(opt.upper) + "]");
  require(opt.level > 0.0 && opt.level < 1.0,
          "the confidence level must lie strictly between 0 and 1; got " + format_number(opt.level));
}

LambdaEstimate search_profile(const std::function<double(double)>& f, const LambdaOptions& opt) {
  LambdaEstimate est;
  est.level = opt.level;
  est.lower = opt.lower;
  est.upper = opt.upper;
  std::uintmax_t it = kIterations;
  const auto neg = [&](double l) { poll_cancel(); return -f(l); };
  const auto best = boost::math::tools::brent_find_minima(neg, opt.lower, opt.upper, kMaxBits, it);
  bool ok = it < kIterations;
  double lhat = best.first, lmax = -best.second;
  const double near = 1e-4 * (opt.upper - opt.lower);
  for (double edge : {opt.lower, opt.upper}) {
    if (std::fabs(lhat - edge) < near) {
      const double le = f(edge);
      if (le >= lmax) {
        lhat = edge;
        lmax = le;
      }
      est.at_bound = true;
    }
  }
  est.lambda = lhat;
  est.loglik = lmax;
  const double half_q = 0.5 * boost::math::quantile(boost::math::chi_squared(1.0), opt.level);
  const double cut = lmax - half_q;
  const std::function<double(double)> g = [&](double l) { return f(l) - cut; };
  const double step = first_step(g, lhat, half_q, opt.lower, opt.upper);
  const End low = find_end(g, lhat, step, opt.lower, -1.0);
  const End high = find_end(g, lhat, step, opt.upper, +1.0);
  est.conf_low = low.at;
  est.low_open = low.open;
  est.conf_high = high.at;
  est.high_open = high.open;
  est.converged = ok && low.ok && high.ok && std::isfinite(lmax);
  est.convenient = convenient_lambda(est.lambda, est.conf_low, est.conf_high);
  return est;
}

}  // namespace summary_detail
}  // namespace powerback
