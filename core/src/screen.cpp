// The skewness screen of one variable; see powerback/screen.hpp.
#include "powerback/screen.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

#include "powerback/errors.hpp"

namespace powerback {

namespace {

AfterTransform after(const Transform& t, const double* x, std::size_t n) {
  std::vector<double> z(n);
  const MapReport r = t.apply(x, n, z.data());
  // Every recommended transform is built to accept every value it was learned from; one that
  // fails on them meets the ends of double precision (a reflection pivot - x that overflows or
  // rounds to 0 for values near 1e308): no figures after it, as for an overflowing result.
  AfterTransform a;
  if (!r.ok() || !std::all_of(z.begin(), z.end(), [](double v) { return std::isfinite(v); })) {
    a.skewness = math::kNaN;
    a.sw.w = a.sw.p_value = math::kNaN;
    a.sw.n = n;
    a.sw.skip = NormalitySkip::Overflow;
    a.sw.note = normality_skip_text(a.sw.skip);
    return a;
  }
  a.skewness = sample_moments(z.data(), n).skewness;
  a.sw = shapiro_wilk(z.data(), n);
  return a;
}

}  // namespace

VariableScreen screen_variable(const double* x, std::size_t n, const ScreenOptions& opt) {
  if (n > 0 && !x) throw Error(ErrorCode::Argument, "x is NULL but n > 0");
  require(opt.level > 0.0 && opt.level < 1.0, "level must lie strictly between 0 and 1");
  require(std::isfinite(opt.lower) && std::isfinite(opt.upper) && opt.lower < opt.upper,
          "the lambda range needs finite lower < upper");
  VariableScreen s;
  s.n = n;
  s.moments = sample_moments(x, n);  // also rejects non-finite values, naming them
  if (n < 3) {
    s.note = "fewer than 3 values: nothing to screen";
    return s;
  }
  const auto mm = std::minmax_element(x, x + n);
  const double lo = *mm.first, hi = *mm.second;
  if (!std::isfinite(s.moments.skewness) || !(hi > lo)) {
    s.note = "all values are identical: nothing to screen";
    return s;
  }
  s.usable = true;
  s.sw = shapiro_wilk(x, n);

  s.ladder = ladder_from_moments(s.moments, lo, hi);
  if (s.ladder.step == LadderStep::None) {
    s.after_ladder.skewness = s.moments.skewness;
    s.after_ladder.sw = s.sw;
  } else {
    s.after_ladder = after(Transform(s.ladder.spec), x, n);
  }

  LambdaOptions lo_opt;
  lo_opt.level = opt.level;
  lo_opt.lower = opt.lower;
  lo_opt.upper = opt.upper;
  const Family fam = lo > 0.0 ? Family::BoxCox : Family::YeoJohnson;
  try {
    s.ml = estimate_lambda(x, n, fam, lo_opt);
    s.ml_done = true;
  } catch (const Error& e) {
    if (e.code() == ErrorCode::Cancelled) throw;  // a stop request is not a failed estimate
    s.note = std::string("no ML alternative: ") + e.what();
    return s;
  }
  s.ml_spec.family = fam;
  s.ml_spec.lambda = s.ml.convenient;
  s.ml_spec = Transform(s.ml_spec).spec();
  s.after_ml = after(Transform(s.ml_spec), x, n);
  return s;
}

}  // namespace powerback
