// FitSummary: the R factor of sqrt(w) [1 X T(y)], the Jacobian and the weights' log-sum, merged
// and finished into the fit of Model (model.hpp) at a fixed response transform.
#include <cmath>
#include <limits>

#include "powerback/accumulate_detail.hpp"
#include "powerback/cancel.hpp"
#include "powerback/least_squares.hpp"

namespace powerback {

using summary_detail::ByteReader;
using summary_detail::ByteWriter;
using summary_detail::Kind;

namespace {
constexpr double kLog2Pi = 1.837877066409345483560659472811235279;
constexpr std::size_t kBlockRows = 4096;
}  // namespace

FitSummary::State::State(const Transform& t, std::size_t predictors, std::size_t est)
    : response(t), p(predictors), estimated(est) {
  require(p < 100000, "a fit summary takes fewer than 100000 predictors");
  r = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(p + 2), static_cast<Eigen::Index>(p + 2));
}

FitSummary::FitSummary(const Transform& response, std::size_t p, std::size_t estimated_parameters)
    : s_(new State(response, p, estimated_parameters)) {}
FitSummary::FitSummary(std::unique_ptr<State> s) : s_(std::move(s)) {}
FitSummary::~FitSummary() = default;
FitSummary::FitSummary(const FitSummary& o) : s_(new State(*o.s_)) {}
FitSummary& FitSummary::operator=(const FitSummary& o) {
  if (this != &o) s_.reset(new State(*o.s_));
  return *this;
}
FitSummary::FitSummary(FitSummary&&) noexcept = default;
FitSummary& FitSummary::operator=(FitSummary&&) noexcept = default;
std::size_t FitSummary::predictors() const { return s_->p; }
std::size_t FitSummary::n() const { return static_cast<std::size_t>(s_->n); }
const Transform& FitSummary::response() const { return s_->response; }

void FitSummary::add(const double* y, const double* X, std::size_t rows, std::size_t ld, const double* w) {
  State& s = *s_;
  if (rows == 0) return;
  summary_detail::check_chunk(y, X, rows, ld, s.p, w);
  std::vector<double> z(rows), jac(rows);
  s.response.throw_if_failed(s.response.apply(y, rows, z.data()), rows, "y", false);
  s.response.throw_if_failed(s.response.log_abs_derivative(y, rows, jac.data()), rows, "y", false);
  const Eigen::Index c = static_cast<Eigen::Index>(s.p + 2);
  Eigen::MatrixXd work(c + static_cast<Eigen::Index>(kBlockRows), c);
  for (std::size_t r0 = 0; r0 < rows; r0 += kBlockRows) {
    poll_cancel();
    const std::size_t r1 = std::min(rows, r0 + kBlockRows);
    Eigen::Index nr = 0;
    for (std::size_t i = r0; i < r1; ++i) {
      const double wi = w ? w[i] : 1.0;
      if (wi == 0.0) continue;
      const double sw = std::sqrt(wi);
      work(c + nr, 0) = sw;
      for (std::size_t j = 0; j < s.p; ++j) work(c + nr, static_cast<Eigen::Index>(j) + 1) = sw * X[j * ld + i];
      work(c + nr, c - 1) = sw * z[i];
      s.jacobian.add(jac[i]);
      if (w) s.log_w.add(std::log(wi));
      s.weight.add(wi);
      ++s.n;
      ++nr;
    }
    if (nr > 0) summary_detail::stack_r(s.r, work, nr);
  }
}

void FitSummary::merge(const FitSummary& other) {
  State& s = *s_;
  const State& o = *other.s_;
  const TransformSpec& a = s.response.spec();
  const TransformSpec& b = o.response.spec();
  const auto same = [](double u, double v) { return u == v || (std::isnan(u) && std::isnan(v)); };
  require(s.p == o.p && s.estimated == o.estimated && a.family == b.family && same(a.lambda, b.lambda) &&
              a.shift == b.shift && a.reflect == b.reflect && same(a.pivot, b.pivot),
          "fit summaries merge only with the same response transform, predictors and estimated parameters");
  if (summary_detail::merged_self(*this, other)) return;
  s.n += o.n;
  s.jacobian.add(o.jacobian);
  s.log_w.add(o.log_w);
  s.weight.add(o.weight);
  s.r = summary_detail::merge_r(s.r, o.r);
}

summary_detail::FitParts summary_detail::fit_parts(const FitSummary::State& s) {
  require(s.n > 0, "the fit summary has no rows: add chunks with rows first");
  FitParts f;
  const Eigen::Index c = static_cast<Eigen::Index>(s.p + 1);
  const Eigen::MatrixXd design = s.r.leftCols(c);
  const Eigen::VectorXd norms = design.colwise().norm().transpose();
  detail::RankedQR rq = detail::apply_rank_rule(design, norms, kRankTolerance);
  f.kept = std::move(rq.kept);
  f.aliased = std::move(rq.aliased);
  const Eigen::Index k = static_cast<Eigen::Index>(f.kept.size());
  if (static_cast<std::uint64_t>(k) >= s.n)
    throw Error(ErrorCode::Singular,
                "the model has " + std::to_string(k) + " estimable coefficients and " + std::to_string(s.n) +
                    " rows, which leaves no residual degrees of freedom: use fewer predictors or more rows");
  Eigen::MatrixXd m(s.r.rows(), k + 1);
  for (Eigen::Index i = 0; i < k; ++i) m.col(i) = s.r.col(static_cast<Eigen::Index>(f.kept[static_cast<std::size_t>(i)]));
  m.col(k) = s.r.col(c);
  const Eigen::HouseholderQR<Eigen::MatrixXd> q2(m);
  f.rz = q2.matrixQR().topLeftCorner(k + 1, k + 1).triangularView<Eigen::Upper>();
  const Eigen::MatrixXd rk = f.rz.topLeftCorner(k, k);
  f.coef = rk.triangularView<Eigen::Upper>().solve(f.rz.col(k).head(k));
  f.rss = f.rz(k, k) * f.rz(k, k);
  // Weighted mean and spread of the fitted values, from the z column's coordinates (the
  // intercept is the first kept column).
  f.fitted_centre = f.rz(0, k) / f.rz(0, 0);
  const double w = s.weight.value();
  f.fitted_scale = k > 1 ? std::sqrt(f.rz.col(k).segment(1, k - 1).squaredNorm() / w) : 0.0;
  return f;
}

SummaryFit FitSummary::finish() const {
  const State& s = *s_;
  const summary_detail::FitParts f = summary_detail::fit_parts(s);
  SummaryFit out;
  const std::size_t c = s.p + 1;
  const Eigen::Index k = static_cast<Eigen::Index>(f.kept.size());
  out.n = static_cast<std::size_t>(s.n);
  out.columns = c;
  out.rank = f.kept.size();
  out.df_residual = out.n - out.rank;
  out.rss = f.rss;
  out.sigma = std::sqrt(f.rss / static_cast<double>(out.df_residual));
  const Eigen::MatrixXd rinv =
      f.rz.topLeftCorner(k, k).triangularView<Eigen::Upper>().solve(Eigen::MatrixXd::Identity(k, k));
  const Eigen::MatrixXd cov = out.sigma * out.sigma * rinv * rinv.transpose();
  out.coef = Eigen::VectorXd::Constant(static_cast<Eigen::Index>(c), math::kNaN);
  out.se = out.coef;
  out.covariance = Eigen::MatrixXd::Constant(static_cast<Eigen::Index>(c), static_cast<Eigen::Index>(c), math::kNaN);
  out.aliased.assign(c, true);
  for (Eigen::Index i = 0; i < k; ++i) {
    const Eigen::Index ci = static_cast<Eigen::Index>(f.kept[static_cast<std::size_t>(i)]);
    out.aliased[static_cast<std::size_t>(ci)] = false;
    out.coef(ci) = f.coef(i);
    out.se(ci) = std::sqrt(cov(i, i));
    for (Eigen::Index j = 0; j < k; ++j) out.covariance(ci, static_cast<Eigen::Index>(f.kept[static_cast<std::size_t>(j)])) = cov(i, j);
  }
  const double nd = static_cast<double>(s.n);
  out.jacobian = s.jacobian.value();
  out.sum_log_weights = s.log_w.value();
  // As logLik of a (weighted) lm on z, plus the Jacobian of T.
  out.loglik = -0.5 * nd * (kLog2Pi + std::log(f.rss / nd) + 1.0) + 0.5 * out.sum_log_weights + out.jacobian;
  out.loglik_df = static_cast<double>(out.rank + 1 + s.estimated);
  return out;
}

void summary_detail::write_spec(ByteWriter& out, const TransformSpec& t) {
  out.u32(static_cast<std::uint32_t>(t.family));
  out.f64(t.lambda);
  out.f64(t.shift);
  out.u8(t.reflect ? 1 : 0);
  out.f64(t.pivot);
}

Transform summary_detail::read_spec(ByteReader& in) {
  TransformSpec t;
  const std::uint32_t fam = in.u32("the transform family");
  if (!family_is_valid(static_cast<int>(fam))) in.fail("the transform family code is unknown");
  t.family = static_cast<Family>(fam);
  t.lambda = in.f64("the transform's lambda");
  t.shift = in.f64("the transform's shift");
  const std::uint8_t reflect = in.u8("the transform's reflection");
  if (reflect > 1) in.fail("the reflection flag is not 0 or 1");
  t.reflect = reflect == 1;
  t.pivot = in.f64("the transform's pivot");
  try {
    return Transform(t);
  } catch (const Error& e) {
    in.fail(std::string("the transform is invalid: ") + e.what());
  }
}

std::vector<unsigned char> FitSummary::serialize() const {
  const State& s = *s_;
  ByteWriter out(Kind::Fit);
  summary_detail::write_spec(out, s.response.spec());
  out.u64(s.p);
  out.u64(s.estimated);
  out.u64(s.n);
  out.sum(s.jacobian);
  out.sum(s.log_w);
  out.sum(s.weight);
  out.matrix(s.r);
  return out.finish();
}

FitSummary FitSummary::deserialize(const unsigned char* bytes, std::size_t len) {
  ByteReader in(bytes, len, Kind::Fit, "a fit summary");
  const Transform t = summary_detail::read_spec(in);
  const std::size_t p = in.count("the number of predictors", 99999);
  if ((p + 2) * (p + 2) > in.remaining() / 8) in.fail("the number of predictors does not fit the buffer");
  const std::size_t est = in.count("the estimated parameters", 1000);
  std::unique_ptr<State> s(new State(t, p, est));
  s->n = in.u64("the row count");
  s->jacobian = in.sum("the Jacobian sum");
  s->log_w = in.sum("the sum of log weights");
  s->weight = in.sum("the sum of weights");
  s->r = in.matrix(p + 2, p + 2, "the R factor");
  if (!s->r.isUpperTriangular(0.0)) in.fail("the R factor is not upper triangular");
  in.done();
  return FitSummary(std::move(s));
}

}  // namespace powerback
