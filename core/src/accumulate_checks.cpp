// FitCheckPass: the residual checks of a fitted summary in a second pass over the rows, and the
// binned residual sums behind the smearing mean of new predictions.
#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/fisher_f.hpp>
#include <cmath>
#include <unordered_map>

#include "powerback/accumulate_detail.hpp"
#include "powerback/backtransform.hpp"
#include "powerback/cancel.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

using summary_detail::ByteReader;
using summary_detail::ByteWriter;
using summary_detail::Kind;

struct FitCheckPass::State {
  Transform response;
  std::size_t p = 0;
  std::vector<std::size_t> kept;
  Eigen::VectorXd coef;        // kept columns
  double centre = 0.0, scale = 0.0;  // of the fitted values (RESET's powers use (f - centre) / scale)
  double rss0 = 0.0, sigma = 0.0, h = 1.0;  // the fit's RSS and sigma; the residual bins' width
  std::uint64_t n_fit = 0, n = 0;
  CompensatedSum e1, e2, e3;   // sums of r, r^2, r^3 (r = sqrt(w) e)
  Eigen::MatrixXd r_bp;        // (k + 1)^2: R of [X_kept r^2]
  Eigen::MatrixXd r_reset;     // (k + 3)^2: R of sqrt(w) [X_kept g^2 g^3 z]
  std::vector<std::int64_t> key;  // residual bins: centre (j + 1/2) h
  std::vector<double> cnt, s1, s2;  // rows, sum delta, sum delta^2
  std::unordered_map<std::int64_t, std::size_t> index;
  std::size_t bin(std::int64_t j) {
    const auto it = index.find(j);
    if (it != index.end()) return it->second;
    const std::size_t b = key.size();
    index.emplace(j, b);
    key.push_back(j);
    cnt.push_back(0.0);
    s1.push_back(0.0);
    s2.push_back(0.0);
    return b;
  }
};

namespace {
constexpr std::size_t kBlockRows = 2048;
constexpr double kBinsPerSigma = 128.0;
// Bin indices stay far inside int64 (residuals beyond 1e12 sigma are grouped at the ends).
constexpr double kMaxBin = 1e15;
}  // namespace

FitCheckPass::FitCheckPass(const FitSummary& summary) : s_(new State) {
  const FitSummary::State& fs = *summary.s_;
  const summary_detail::FitParts f = summary_detail::fit_parts(fs);
  State& s = *s_;
  s.response = fs.response;
  s.p = fs.p;
  s.kept = f.kept;
  s.coef = f.coef;
  s.centre = f.fitted_centre;
  s.scale = f.fitted_scale;
  s.rss0 = f.rss;
  s.n_fit = fs.n;
  s.sigma = std::sqrt(f.rss / static_cast<double>(fs.n - f.kept.size()));
  s.h = s.sigma > 0.0 ? s.sigma / kBinsPerSigma : 1.0;
  const Eigen::Index k = static_cast<Eigen::Index>(f.kept.size());
  s.r_bp = Eigen::MatrixXd::Zero(k + 1, k + 1);
  s.r_reset = Eigen::MatrixXd::Zero(k + 3, k + 3);
}
FitCheckPass::FitCheckPass(std::unique_ptr<State> s) : s_(std::move(s)) {}
FitCheckPass::~FitCheckPass() = default;
FitCheckPass::FitCheckPass(const FitCheckPass& o) : s_(new State(*o.s_)) {}
FitCheckPass& FitCheckPass::operator=(const FitCheckPass& o) {
  if (this != &o) s_.reset(new State(*o.s_));
  return *this;
}
FitCheckPass::FitCheckPass(FitCheckPass&&) noexcept = default;
FitCheckPass& FitCheckPass::operator=(FitCheckPass&&) noexcept = default;
std::size_t FitCheckPass::n() const { return static_cast<std::size_t>(s_->n); }

void FitCheckPass::add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w) {
  State& s = *s_;
  if (rows == 0) return;
  summary_detail::check_chunk(y, X, rows, ld, s.p, w);
  std::vector<double> z(rows);
  s.response.throw_if_failed(s.response.apply(y, rows, z.data()), rows, "y", false);
  const std::size_t k = s.kept.size();
  const Eigen::Index kb = static_cast<Eigen::Index>(k + 1), kr = static_cast<Eigen::Index>(k + 3);
  Eigen::MatrixXd wb(kb + static_cast<Eigen::Index>(kBlockRows), kb);
  Eigen::MatrixXd wr(kr + static_cast<Eigen::Index>(kBlockRows), kr);
  std::vector<double> x(k);
  for (std::size_t r0 = 0; r0 < rows; r0 += kBlockRows) {
    poll_cancel();
    const std::size_t r1 = std::min(rows, r0 + kBlockRows);
    Eigen::Index nr = 0;
    for (std::size_t i = r0; i < r1; ++i) {
      const double wi = w ? w[i] : 1.0;
      if (wi == 0.0) continue;
      const double sw = std::sqrt(wi);
      double fit = 0.0;
      for (std::size_t c = 0; c < k; ++c) {
        x[c] = s.kept[c] == 0 ? 1.0 : X[(s.kept[c] - 1) * ld + i];
        fit += x[c] * s.coef(static_cast<Eigen::Index>(c));
      }
      const double e = z[i] - fit, r = sw * e;
      s.e1.add(r);
      s.e2.add(r * r);
      s.e3.add(r * r * r);
      const double g = s.scale > 0.0 ? (fit - s.centre) / s.scale : 0.0;
      for (std::size_t c = 0; c < k; ++c) {
        wb(kb + nr, static_cast<Eigen::Index>(c)) = x[c];
        wr(kr + nr, static_cast<Eigen::Index>(c)) = sw * x[c];
      }
      wb(kb + nr, kb - 1) = r * r;
      wr(kr + nr, kr - 3) = sw * g * g;
      wr(kr + nr, kr - 2) = sw * g * g * g;
      wr(kr + nr, kr - 1) = sw * z[i];
      const double jd = std::max(-kMaxBin, std::min(kMaxBin, std::floor(e / s.h)));
      const std::int64_t j = static_cast<std::int64_t>(jd);
      const std::size_t b = s.bin(j);
      const double d = e - (jd + 0.5) * s.h;
      s.cnt[b] += 1.0;
      s.s1[b] += d;
      s.s2[b] += d * d;
      ++s.n;
      ++nr;
    }
    if (nr > 0) {
      summary_detail::stack_r(s.r_bp, wb, nr);
      summary_detail::stack_r(s.r_reset, wr, nr);
    }
  }
}

void FitCheckPass::merge(const FitCheckPass& other) {
  State& s = *s_;
  const State& o = *other.s_;
  require(s.p == o.p && s.kept == o.kept && s.coef == o.coef && s.h == o.h,
          "check passes merge only when made from the same fitted summary");
  if (summary_detail::merged_self(*this, other)) return;
  s.n += o.n;
  s.e1.add(o.e1);
  s.e2.add(o.e2);
  s.e3.add(o.e3);
  s.r_bp = summary_detail::merge_r(s.r_bp, o.r_bp);
  s.r_reset = summary_detail::merge_r(s.r_reset, o.r_reset);
  for (std::size_t b = 0; b < o.key.size(); ++b) {
    const std::size_t nb = s.bin(o.key[b]);
    s.cnt[nb] += o.cnt[b];
    s.s1[nb] += o.s1[b];
    s.s2[nb] += o.s2[b];
  }
}

SummaryChecks FitCheckPass::finish() const {
  const State& s = *s_;
  require(s.n == s.n_fit, "the check pass saw " + std::to_string(s.n) + " rows but the fit has " +
                              std::to_string(s.n_fit) + ": both passes must read the same rows");
  SummaryChecks out;
  out.n = static_cast<std::size_t>(s.n);
  const double n = static_cast<double>(s.n);
  const std::size_t k = s.kept.size();
  // Adjusted sample skewness G1 = g1 sqrt(n (n - 1)) / (n - 2) from the central moments.
  if (s.n > 2) {
    const double m = s.e1.value() / n, a2 = s.e2.value() / n, a3 = s.e3.value() / n;
    const double m2 = a2 - m * m, m3 = a3 - 3.0 * m * a2 + 2.0 * m * m * m;
    if (m2 > 0.0) out.skewness = m3 / std::pow(m2, 1.5) * std::sqrt(n * (n - 1.0)) / (n - 2.0);
  }
  // Koenker's Breusch-Pagan: n R^2 of r^2 on the kept columns (the intercept first).
  const Eigen::Index kb = static_cast<Eigen::Index>(k);
  const double tss = s.r_bp.col(kb).segment(1, kb).squaredNorm();
  if (k >= 2 && tss > 0.0) {
    const double rss = s.r_bp(kb, kb) * s.r_bp(kb, kb);
    out.bp_df = static_cast<double>(k) - 1.0;
    out.bp_statistic = n * (1.0 - rss / tss);
    if (std::isfinite(out.bp_statistic)) {  // else p stays NaN (sums that overflowed)
      const boost::math::chi_squared cs(out.bp_df);
      out.bp_p = boost::math::cdf(boost::math::complement(cs, std::max(out.bp_statistic, 0.0)));
    }
  }
  // RESET: the rank of [X_kept g^2 g^3] by lm's rule, then the RSS of z on it.
  if (s.scale > 1e-10 * std::max(1.0, std::fabs(s.centre))) {
    const Eigen::MatrixXd a = s.r_reset.leftCols(kb + 2);
    const Eigen::VectorXd norms = a.colwise().norm().transpose();
    const std::vector<std::size_t> kept = detail::apply_rank_rule(a, norms, kRankTolerance).kept;
    const double q = static_cast<double>(kept.size()) - static_cast<double>(k);
    const double df2 = n - static_cast<double>(kept.size());
    if (q >= 1.0 && df2 >= 1.0) {
      const Eigen::Index k1 = static_cast<Eigen::Index>(kept.size());
      Eigen::MatrixXd m(s.r_reset.rows(), k1 + 1);
      for (Eigen::Index i = 0; i < k1; ++i) m.col(i) = s.r_reset.col(static_cast<Eigen::Index>(kept[static_cast<std::size_t>(i)]));
      m.col(k1) = s.r_reset.col(kb + 2);
      const Eigen::HouseholderQR<Eigen::MatrixXd> q2(m);
      const double rss1 = q2.matrixQR()(k1, k1) * q2.matrixQR()(k1, k1);
      out.reset_df1 = q;
      out.reset_df2 = df2;
      if (rss1 > 0.0 && std::isfinite(s.rss0 - rss1)) {
        out.reset_f = ((s.rss0 - rss1) / q) / (rss1 / df2);
        const boost::math::fisher_f fd(q, df2);
        out.reset_p = boost::math::cdf(boost::math::complement(fd, std::max(out.reset_f, 0.0)));
      }
    }
  }
  return out;
}

std::vector<double> FitCheckPass::smearing_mean(const double* eta, std::size_t m) const {
  const State& s = *s_;
  require(s.n > 0, "the check pass has no rows: smearing needs the training residuals' sums");
  require(eta != nullptr || m == 0, "eta is NULL");
  std::vector<double> out(m, math::kNaN);
  const double h = s.h, n = static_cast<double>(s.n);
  for (std::size_t i = 0; i < m; ++i) {
    if (!std::isfinite(eta[i])) continue;
    // Within a bin T^-1(eta + c + d) is replaced by the quadratic through d = -h/2, 0, h/2, and
    // summed against the bin's count, sum d and sum d^2.
    CompensatedSum sum;
    for (std::size_t b = 0; b < s.key.size(); ++b) {
      const double c = eta[i] + (static_cast<double>(s.key[b]) + 0.5) * h;
      const double f0 = invert_bounded(s.response, c).value;
      const double fm = invert_bounded(s.response, c - 0.5 * h).value;
      const double fp = invert_bounded(s.response, c + 0.5 * h).value;
      const double d1 = (fp - fm) / h, d2 = 2.0 * (fp - 2.0 * f0 + fm) / (h * h);
      sum.add(s.cnt[b] * f0 + s.s1[b] * d1 + s.s2[b] * d2);
    }
    out[i] = sum.value() / n;
  }
  return out;
}

std::vector<unsigned char> FitCheckPass::serialize() const {
  const State& s = *s_;
  ByteWriter out(Kind::FitChecks);
  summary_detail::write_spec(out, s.response.spec());
  out.u64(s.p);
  out.u64(s.kept.size());
  for (std::size_t c : s.kept) out.u64(c);
  out.f64s(s.coef.data(), static_cast<std::size_t>(s.coef.size()));
  for (double v : {s.centre, s.scale, s.rss0, s.sigma, s.h}) out.f64(v);
  out.u64(s.n_fit);
  out.u64(s.n);
  out.sum(s.e1);
  out.sum(s.e2);
  out.sum(s.e3);
  out.matrix(s.r_bp);
  out.matrix(s.r_reset);
  out.u64(s.key.size());
  for (std::size_t b = 0; b < s.key.size(); ++b) {
    out.u64(static_cast<std::uint64_t>(s.key[b]));
    out.f64(s.cnt[b]);
    out.f64(s.s1[b]);
    out.f64(s.s2[b]);
  }
  return out.finish();
}

FitCheckPass FitCheckPass::deserialize(const unsigned char* bytes, std::size_t len) {
  ByteReader in(bytes, len, Kind::FitChecks, "a fit check pass");
  std::unique_ptr<State> s(new State);
  s->response = summary_detail::read_spec(in);
  s->p = in.count("the number of predictors", 99999);
  const std::size_t k = in.count("the kept columns", s->p + 1);
  if (k == 0) in.fail("no kept columns");
  for (std::size_t i = 0; i < k; ++i) {
    const std::size_t c = in.count("a kept column", s->p);
    if (i == 0 ? c != 0 : c <= s->kept.back()) in.fail("the kept columns are not increasing from the intercept");
    s->kept.push_back(c);
  }
  s->coef = in.matrix(k, 1, "the coefficients");
  s->centre = in.finite("the fitted centre");
  s->scale = in.finite("the fitted scale");
  s->rss0 = in.finite("the residual sum of squares");
  s->sigma = in.finite("sigma");
  s->h = in.finite("the bin width");
  if (!(s->h > 0.0) || s->scale < 0.0 || s->rss0 < 0.0) in.fail("a width, scale or sum of squares is negative");
  s->n_fit = in.u64("the fit's row count");
  s->n = in.u64("the row count");
  s->e1 = in.sum("a residual sum");
  s->e2 = in.sum("a residual sum");
  s->e3 = in.sum("a residual sum");
  s->r_bp = in.matrix(k + 1, k + 1, "an R factor");
  s->r_reset = in.matrix(k + 3, k + 3, "an R factor");
  if (!s->r_bp.isUpperTriangular(0.0) || !s->r_reset.isUpperTriangular(0.0)) in.fail("an R factor is not upper triangular");
  const std::size_t bins = in.count("the number of bins", in.remaining() / 32);
  for (std::size_t b = 0; b < bins; ++b) {
    const std::int64_t j = static_cast<std::int64_t>(in.u64("a bin index"));
    if (static_cast<double>(j) > kMaxBin || static_cast<double>(j) < -kMaxBin - 1.0) in.fail("a bin index is out of range");
    if (s->index.count(j)) in.fail("a bin appears twice");
    const std::size_t nb = s->bin(j);
    s->cnt[nb] = in.finite("a bin count");
    s->s1[nb] = in.finite("a bin sum");
    s->s2[nb] = in.finite("a bin sum");
  }
  in.done();
  return FitCheckPass(std::move(s));
}

}  // namespace powerback
