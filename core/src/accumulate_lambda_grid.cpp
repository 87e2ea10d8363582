// LambdaGridPass: the profile log-likelihood at every lambda of a grid in one pass over the rows,
// from the R factor of sqrt(w) [X_kept z_1 ... z_m] (RSS of z_g = the squared tail of its column:
// no subtraction), and the estimate from a cubic B-spline through the grid values.
#include <algorithm>
#include <boost/math/interpolators/cardinal_cubic_b_spline.hpp>
#include <cmath>
#include <limits>

#include "powerback/accumulate_detail.hpp"
#include "powerback/cancel.hpp"

namespace powerback {

using summary_detail::ByteReader;
using summary_detail::ByteWriter;
using summary_detail::Kind;

struct LambdaGridPass::State {
  Family family = Family::BoxCox;
  std::size_t p = 0;
  std::vector<std::size_t> kept;  // design columns (0 = intercept)
  double centre = 0.0;
  int centred = -1;
  std::vector<double> grid, scale;  // scale: the exponent divided out of each lambda's values (0: none)
  std::uint64_t n = 0;
  Eigen::MatrixXd r;  // (k + m) x (k + m)
};

namespace {

constexpr std::size_t kGridBlockRows = 1024;

void check_grid(const std::vector<double>& grid) {
  require(grid.size() >= 4, "a grid pass needs at least 4 lambdas");
  require(grid.size() <= 1000, "a grid pass takes at most 1000 lambdas");
  const double h = (grid.back() - grid.front()) / static_cast<double>(grid.size() - 1);
  require(std::isfinite(h) && h > 0.0, "the grid must be finite and increasing");
  for (std::size_t i = 0; i < grid.size(); ++i)
    require(std::fabs(grid[i] - (grid.front() + h * static_cast<double>(i))) <= 1e-9 * (1.0 + std::fabs(h)),
            "the grid must be equally spaced (value " + std::to_string(i) + " is not)");
}

// s * expm1(k t) / k, divided by exp(m) when m > 0 (k = 0: the log limit).
inline double power_value(double t, double k, double m) {
  if (m <= 0.0) return k == 0.0 ? t : std::expm1(k * t) / k;
  if (k == 0.0) return t * std::exp(-m);
  return (std::exp(k * t - m) - std::exp(-m)) / k;
}

}  // namespace

LambdaGridPass::LambdaGridPass(const LambdaSummary& summary, const std::vector<double>& grid)
    : s_(new State) {
  check_grid(grid);
  const LambdaSummary::State& ss = *summary.s_;
  const summary_detail::Finished f = summary_detail::prepare_finish(ss);
  State& s = *s_;
  s.family = ss.family;
  s.p = ss.p;
  s.kept = f.kept;
  s.centre = f.centre;
  s.centred = f.centred;
  s.grid = grid;
  s.scale.resize(grid.size());
  for (std::size_t i = 0; i < grid.size(); ++i) {
    const double k[2] = {grid[i], 2.0 - grid[i]};
    double m = -std::numeric_limits<double>::infinity();
    for (int g = 0; g < 2; ++g)
      if (ss.count[g] > 0) m = std::max({m, k[g] * f.t_min[g], k[g] * f.t_max[g]});
    s.scale[i] = m > summary_detail::kScaleLimit ? m : 0.0;
  }
  const Eigen::Index w = static_cast<Eigen::Index>(s.kept.size() + grid.size());
  s.r = Eigen::MatrixXd::Zero(w, w);
}
LambdaGridPass::LambdaGridPass(std::unique_ptr<State> s) : s_(std::move(s)) {}
LambdaGridPass::~LambdaGridPass() = default;
LambdaGridPass::LambdaGridPass(const LambdaGridPass& o) : s_(new State(*o.s_)) {}
LambdaGridPass& LambdaGridPass::operator=(const LambdaGridPass& o) {
  if (this != &o) s_.reset(new State(*o.s_));
  return *this;
}
LambdaGridPass::LambdaGridPass(LambdaGridPass&&) noexcept = default;
LambdaGridPass& LambdaGridPass::operator=(LambdaGridPass&&) noexcept = default;
const std::vector<double>& LambdaGridPass::grid() const { return s_->grid; }

void LambdaGridPass::add(const double* y, const double* X, std::size_t rows, std::size_t ld,
                         const double* w) {
  State& s = *s_;
  if (rows == 0) return;
  summary_detail::check_chunk(y, X, rows, ld, s.p, w, &s.family);
  const std::size_t k = s.kept.size(), m = s.grid.size();
  const Eigen::Index width = static_cast<Eigen::Index>(k + m);
  const bool yj = s.family == Family::YeoJohnson;
  Eigen::MatrixXd work(width + static_cast<Eigen::Index>(kGridBlockRows), width);
  for (std::size_t r0 = 0; r0 < rows; r0 += kGridBlockRows) {
    poll_cancel();
    const std::size_t r1 = std::min(rows, r0 + kGridBlockRows);
    Eigen::Index nr = 0;
    for (std::size_t i = r0; i < r1; ++i) {
      const double wi = w ? w[i] : 1.0;
      if (wi == 0.0) continue;
      const double sw = std::sqrt(wi);
      const Eigen::Index row = width + nr;
      for (std::size_t c = 0; c < k; ++c)
        work(row, static_cast<Eigen::Index>(c)) = s.kept[c] == 0 ? sw : sw * X[(s.kept[c] - 1) * ld + i];
      const double v = y[i];
      const int g = (yj && v < 0.0) ? 1 : 0;
      double t = yj ? std::log1p(std::fabs(v)) : std::log(v);
      if (s.centred == g) t -= s.centre;
      for (std::size_t j = 0; j < m; ++j) {
        const double kk = g ? 2.0 - s.grid[j] : s.grid[j];
        const double z = power_value(t, kk, s.scale[j]);
        work(row, static_cast<Eigen::Index>(k + j)) = sw * (g ? -z : z);
      }
      ++nr;
      ++s.n;
    }
    if (nr > 0) summary_detail::stack_r(s.r, work, nr);
  }
}

void LambdaGridPass::merge(const LambdaGridPass& other) {
  State& s = *s_;
  const State& o = *other.s_;
  require(s.family == o.family && s.p == o.p && s.kept == o.kept && s.grid == o.grid &&
              s.centre == o.centre && s.centred == o.centred,
          "grid passes merge only when made from the same summary and grid");
  s.n += o.n;
  s.r = summary_detail::merge_r(s.r, o.r);
}

std::vector<double> LambdaGridPass::profile(const LambdaSummary& summary) const {
  const State& s = *s_;
  const LambdaSummary::State& ss = *summary.s_;
  const summary_detail::Finished f = summary_detail::prepare_finish(ss);
  require(ss.family == s.family && ss.p == s.p && f.kept == s.kept && f.centre == s.centre,
          "this grid pass was made from another summary");
  require(ss.n == s.n, "the grid pass saw " + std::to_string(s.n) + " rows but the summary has " +
                           std::to_string(ss.n) + ": both passes must read the same rows");
  const std::size_t k = s.kept.size();
  std::vector<double> out(s.grid.size());
  for (std::size_t j = 0; j < s.grid.size(); ++j) {
    const Eigen::Index col = static_cast<Eigen::Index>(k + j);
    const double rss = s.r.col(col).segment(static_cast<Eigen::Index>(k), static_cast<Eigen::Index>(j + 1)).squaredNorm();
    out[j] = rss > 0.0 ? summary_detail::loglik_from(ss, f, s.grid[j], std::log(rss) + 2.0 * s.scale[j])
                       : math::kNaN;
  }
  return out;
}

SummaryLambdaResult LambdaGridPass::finish(const LambdaSummary& summary, const LambdaOptions& opt,
                                           std::size_t curve_points) const {
  summary_detail::check_lambda_options(opt);
  (void)curve_points;
  const State& s = *s_;
  const std::vector<double> ll = profile(summary);
  for (std::size_t j = 0; j < ll.size(); ++j)
    if (!std::isfinite(ll[j]))
      throw Error(ErrorCode::Singular, "the profile is not finite at lambda = " + format_number(s.grid[j]) +
                                           ": the transformed response is fitted exactly");
  const double g0 = s.grid.front(), g1 = s.grid.back();
  const double h = (g1 - g0) / static_cast<double>(s.grid.size() - 1);
  const boost::math::interpolators::cardinal_cubic_b_spline<double> spline(ll.begin(), ll.end(), g0, h);
  LambdaOptions inner = opt;
  inner.lower = std::max(opt.lower, g0);
  inner.upper = std::min(opt.upper, g1);
  require(inner.lower < inner.upper, "the grid does not overlap the search range");
  const auto f = [&](double l) { return spline(l); };
  LambdaEstimate est = summary_detail::search_profile(f, inner);
  est.lower = opt.lower;
  est.upper = opt.upper;
  const double tiny = 1e-9 * (opt.upper - opt.lower);
  const bool cut_low = inner.lower > opt.lower + tiny, cut_high = inner.upper < opt.upper - tiny;
  SummaryLambdaResult res;
  res.from_grid = true;
  const double width = est.conf_high - est.conf_low;
  // The grid must reach the interval's ends (or the range's), and be fine next to the interval.
  if ((est.low_open && cut_low) || (est.high_open && cut_high) ||
      (est.at_bound && (cut_low || cut_high))) {
    res.needs_pass = true;
    res.pass_lower = opt.lower;
    res.pass_upper = opt.upper;
    res.pass_points = 2 * s.grid.size();
    res.note = "the grid did not reach the interval's ends: evaluate the whole range";
  } else if (h > width / 16.0) {
    res.needs_pass = true;
    res.pass_lower = std::max(opt.lower, est.conf_low - 0.5 * width);
    res.pass_upper = std::min(opt.upper, est.conf_high + 0.5 * width);
    res.pass_points = 41;
    res.note = "the grid is coarse next to the interval: one more pass over a narrower grid refines it";
  }
  est.family = s.family;
  est.n = static_cast<std::size_t>(s.n);
  const summary_detail::Finished fin = summary_detail::prepare_finish(*summary.s_);
  est.rank = fin.kept.size();
  est.aliased = fin.aliased;
  est.at_bound = est.at_bound && !cut_low && !cut_high;
  res.estimate = est;
  res.grid = s.grid;
  res.loglik = ll;
  return res;
}

std::vector<unsigned char> LambdaGridPass::serialize() const {
  const State& s = *s_;
  ByteWriter out(Kind::LambdaGrid);
  out.u32(static_cast<std::uint32_t>(s.family));
  out.u64(s.p);
  out.u64(s.kept.size());
  for (std::size_t c : s.kept) out.u64(c);
  out.f64(s.centre);
  out.u32(static_cast<std::uint32_t>(s.centred + 1));
  out.u64(s.grid.size());
  out.f64s(s.grid.data(), s.grid.size());
  out.f64s(s.scale.data(), s.scale.size());
  out.u64(s.n);
  out.matrix(s.r);
  return out.finish();
}

LambdaGridPass LambdaGridPass::deserialize(const unsigned char* bytes, std::size_t len) {
  ByteReader in(bytes, len, Kind::LambdaGrid, "a lambda grid pass");
  std::unique_ptr<State> s(new State);
  const std::uint32_t fam = in.u32("the family");
  if (fam != static_cast<std::uint32_t>(Family::BoxCox) && fam != static_cast<std::uint32_t>(Family::YeoJohnson))
    in.fail("the family code is not box-cox or yeo-johnson");
  s->family = static_cast<Family>(fam);
  s->p = in.count("the number of predictors", 99999);
  const std::size_t k = in.count("the kept columns", s->p + 1);
  if (k == 0) in.fail("no kept columns");
  for (std::size_t i = 0; i < k; ++i) {
    const std::size_t c = in.count("a kept column", s->p);
    if (i == 0 ? c != 0 : c <= s->kept.back()) in.fail("the kept columns are not increasing from the intercept");
    s->kept.push_back(c);
  }
  s->centre = in.finite("the centre");
  const std::uint32_t centred = in.u32("the centred group");
  if (centred > 2) in.fail("the centred group is out of range");
  s->centred = static_cast<int>(centred) - 1;
  const std::size_t m = in.count("the grid size", 1000);
  if (m < 4) in.fail("the grid has fewer than 4 lambdas");
  s->grid.resize(m);
  s->scale.resize(m);
  for (double& v : s->grid) v = in.finite("a grid lambda");
  for (double& v : s->scale) v = in.finite("a grid scale");
  try {
    check_grid(s->grid);
  } catch (const Error& e) {
    in.fail(e.what());
  }
  s->n = in.u64("the row count");
  s->r = in.matrix(k + m, k + m, "the R factor");
  if (!s->r.isUpperTriangular(0.0)) in.fail("the R factor is not upper triangular");
  in.done();
  return LambdaGridPass(std::move(s));
}

}  // namespace powerback
