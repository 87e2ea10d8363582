// Rcpp glue for summaries of chunked data: each call turns bytes (R raw vectors) into handles of
// powerback.h, works on them and returns bytes or results. No handle outlives a call, so the
// summaries R holds are plain raw vectors that saveRDS / serialize / a cluster can carry.
#include "glue_common.h"

#include <memory>
#include <vector>

namespace {

template <class H, void (*Free)(H*)>
struct Owned {
  H* h = nullptr;
  Owned() = default;
  ~Owned() { Free(h); }
  Owned(const Owned&) = delete;
  Owned& operator=(const Owned&) = delete;
};

using LambdaS = Owned<pwb_lambda_summary, pwb_lambda_summary_free>;
using LambdaP = Owned<pwb_lambda_pass, pwb_lambda_pass_free>;
using FitS = Owned<pwb_fit_summary, pwb_fit_summary_free>;
using FitC = Owned<pwb_fit_checks, pwb_fit_checks_free>;

const unsigned char* raw_ptr(const Rcpp::RawVector& r) { return r.size() ? &r[0] : nullptr; }

template <class H>
Rcpp::RawVector bytes_of(const H* h, pwb_status (*ser)(const H*, unsigned char*, size_t, size_t*)) {
  size_t need = 0;
  rpwb::check(ser(h, nullptr, 0, &need));
  Rcpp::RawVector out(need);
  rpwb::check(ser(h, need ? &out[0] : nullptr, need, &need));
  return out;
}

const double* x_ptr(const Rcpp::NumericMatrix& X, const Rcpp::NumericVector& y) {
  if (X.nrow() != y.size()) Rcpp::stop("the model matrix and the response differ in rows");
  return X.ncol() > 0 && X.nrow() > 0 ? X.begin() : nullptr;
}

Rcpp::List finish_list(const pwb_lambda_result& r, const std::vector<double>& grid, const std::vector<double>& ll,
                       const pwb_summary_pass_info& info) {
  Rcpp::List out = rpwb::lambda_result_list(r, grid, ll);
  out["needs_pass"] = info.needs_pass != 0;
  out["pass_lower"] = info.pass_lower;
  out["pass_upper"] = info.pass_upper;
  out["pass_points"] = static_cast<double>(info.pass_points);
  out["from_grid"] = info.from_grid != 0;
  return out;
}

}  // namespace

// One chunk's lambda summary as bytes. X: the model matrix without its intercept column.
// [[Rcpp::export]]
Rcpp::RawVector rpwb_lambda_summary_bytes(Rcpp::NumericVector y, Rcpp::NumericMatrix X, std::string family,
                                          Rcpp::Nullable<Rcpp::NumericVector> weights) {
  LambdaS s;
  rpwb::check(pwb_lambda_summary_create(static_cast<size_t>(X.ncol()), rpwb::family_of(family), &s.h));
  Rcpp::NumericVector wk;
  const std::size_t n = static_cast<std::size_t>(y.size());
  rpwb::check(pwb_lambda_summary_add(s.h, y.begin(), x_ptr(X, y), n, n, rpwb::weights_or_null(weights, y.size(), &wk)));
  return bytes_of(s.h, pwb_lambda_summary_serialize);
}

// Merges summaries of one kind ("lambda", "pass", "fit", "checks") given as bytes.
// [[Rcpp::export]]
Rcpp::RawVector rpwb_summary_merge(std::string kind, Rcpp::List parts) {
  if (parts.size() == 0) Rcpp::stop("nothing to merge");
  const auto at = [&](R_xlen_t i) { return Rcpp::RawVector(parts[i]); };
  if (kind == "lambda") {
    LambdaS all;
    Rcpp::RawVector b0 = at(0);
    rpwb::check(pwb_lambda_summary_deserialize(raw_ptr(b0), b0.size(), &all.h));
    for (R_xlen_t i = 1; i < parts.size(); ++i) {
      LambdaS one;
      Rcpp::RawVector b = at(i);
      rpwb::check(pwb_lambda_summary_deserialize(raw_ptr(b), b.size(), &one.h));
      rpwb::check(pwb_lambda_summary_merge(all.h, one.h));
    }
    return bytes_of(all.h, pwb_lambda_summary_serialize);
  }
  if (kind == "pass") {
    LambdaP all;
    Rcpp::RawVector b0 = at(0);
    rpwb::check(pwb_lambda_pass_deserialize(raw_ptr(b0), b0.size(), &all.h));
    for (R_xlen_t i = 1; i < parts.size(); ++i) {
      LambdaP one;
      Rcpp::RawVector b = at(i);
      rpwb::check(pwb_lambda_pass_deserialize(raw_ptr(b), b.size(), &one.h));
      rpwb::check(pwb_lambda_pass_merge(all.h, one.h));
    }
    return bytes_of(all.h, pwb_lambda_pass_serialize);
  }
  if (kind == "fit") {
    FitS all;
    Rcpp::RawVector b0 = at(0);
    rpwb::check(pwb_fit_summary_deserialize(raw_ptr(b0), b0.size(), &all.h));
    for (R_xlen_t i = 1; i < parts.size(); ++i) {
      FitS one;
      Rcpp::RawVector b = at(i);
      rpwb::check(pwb_fit_summary_deserialize(raw_ptr(b), b.size(), &one.h));
      rpwb::check(pwb_fit_summary_merge(all.h, one.h));
    }
    return bytes_of(all.h, pwb_fit_summary_serialize);
  }
  if (kind == "checks") {
    FitC all;
    Rcpp::RawVector b0 = at(0);
    rpwb::check(pwb_fit_checks_deserialize(raw_ptr(b0), b0.size(), &all.h));
    for (R_xlen_t i = 1; i < parts.size(); ++i) {
      FitC one;
      Rcpp::RawVector b = at(i);
      rpwb::check(pwb_fit_checks_deserialize(raw_ptr(b), b.size(), &one.h));
      rpwb::check(pwb_fit_checks_merge(all.h, one.h));
    }
    return bytes_of(all.h, pwb_fit_checks_serialize);
  }
  Rcpp::stop("unknown summary kind");
}

// [[Rcpp::export]]
Rcpp::List rpwb_lambda_summary_finish(Rcpp::RawVector bytes, double lower, double upper, double level,
                                      int n_grid) {
  LambdaS s;
  rpwb::check(pwb_lambda_summary_deserialize(raw_ptr(bytes), bytes.size(), &s.h));
  const pwb_lambda_options o = rpwb::lambda_options(lower, upper, level);
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  const std::size_t m = n_grid < 2 ? 2 : static_cast<std::size_t>(n_grid);
  std::vector<double> grid(m), ll(m);
  rpwb::check(pwb_lambda_summary_finish(s.h, &o, &r, m, grid.data(), ll.data(), &info));
  return finish_list(r, grid, ll, info);
}

// One chunk's grid pass as bytes, for the summary `summary` (bytes) and the lambdas `grid`.
// [[Rcpp::export]]
Rcpp::RawVector rpwb_lambda_pass_bytes(Rcpp::RawVector summary, Rcpp::NumericVector grid, Rcpp::NumericVector y,
                                       Rcpp::NumericMatrix X, Rcpp::Nullable<Rcpp::NumericVector> weights) {
  LambdaS s;
  rpwb::check(pwb_lambda_summary_deserialize(raw_ptr(summary), summary.size(), &s.h));
  LambdaP p;
  rpwb::check(pwb_lambda_pass_new(s.h, grid.begin(), static_cast<size_t>(grid.size()), &p.h));
  Rcpp::NumericVector wk;
  const std::size_t n = static_cast<std::size_t>(y.size());
  rpwb::check(pwb_lambda_pass_add(p.h, y.begin(), x_ptr(X, y), n, n, rpwb::weights_or_null(weights, y.size(), &wk)));
  return bytes_of(p.h, pwb_lambda_pass_serialize);
}

// [[Rcpp::export]]
Rcpp::List rpwb_lambda_pass_finish(Rcpp::RawVector pass, Rcpp::RawVector summary, double lower, double upper,
                                   double level) {
  LambdaS s;
  rpwb::check(pwb_lambda_summary_deserialize(raw_ptr(summary), summary.size(), &s.h));
  LambdaP p;
  rpwb::check(pwb_lambda_pass_deserialize(raw_ptr(pass), pass.size(), &p.h));
  size_t m = 0;
  rpwb::check(pwb_lambda_pass_grid_size(p.h, &m));
  const pwb_lambda_options o = rpwb::lambda_options(lower, upper, level);
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  std::vector<double> grid(m), ll(m);
  rpwb::check(pwb_lambda_pass_finish(p.h, s.h, &o, &r, m, grid.data(), ll.data(), &info));
  return finish_list(r, grid, ll, info);
}

// One chunk's fit summary as bytes; response: a transform spec list or NULL (none).
// [[Rcpp::export]]
Rcpp::RawVector rpwb_fit_summary_bytes(Rcpp::NumericVector y, Rcpp::NumericMatrix X,
                                       Rcpp::Nullable<Rcpp::List> response, int estimated,
                                       Rcpp::Nullable<Rcpp::NumericVector> weights) {
  std::unique_ptr<rpwb::Transform> t;
  if (response.isNotNull()) t.reset(new rpwb::Transform(Rcpp::List(response)));
  FitS s;
  rpwb::check(pwb_fit_summary_new(t ? t->get() : nullptr, static_cast<size_t>(X.ncol()),
                                  static_cast<size_t>(estimated), &s.h));
  Rcpp::NumericVector wk;
  const std::size_t n = static_cast<std::size_t>(y.size());
  rpwb::check(pwb_fit_summary_add(s.h, y.begin(), x_ptr(X, y), n, n, rpwb::weights_or_null(weights, y.size(), &wk)));
  return bytes_of(s.h, pwb_fit_summary_serialize);
}

// [[Rcpp::export]]
Rcpp::List rpwb_fit_summary_finish(Rcpp::RawVector bytes) {
  FitS s;
  rpwb::check(pwb_fit_summary_deserialize(raw_ptr(bytes), bytes.size(), &s.h));
  pwb_model_info info;
  info.struct_size = sizeof(pwb_model_info);
  rpwb::check(pwb_fit_summary_finish(s.h, &info, nullptr, nullptr, nullptr, nullptr, 0));
  const std::size_t c = info.columns;
  Rcpp::NumericVector coef(c), se(c);
  Rcpp::NumericMatrix cov(c, c);
  std::vector<int> al(c);
  rpwb::check(pwb_fit_summary_finish(s.h, nullptr, coef.begin(), se.begin(), al.data(), cov.begin(), c));
  for (R_xlen_t i = 0; i < coef.size(); ++i) {
    coef[i] = rpwb::nan_to_na(coef[i]);
    se[i] = rpwb::nan_to_na(se[i]);
  }
  for (R_xlen_t i = 0; i < cov.size(); ++i) cov[i] = rpwb::nan_to_na(cov[i]);
  Rcpp::LogicalVector aliased(al.begin(), al.end());
  return Rcpp::List::create(
      Rcpp::Named("coefficients") = coef, Rcpp::Named("se") = se, Rcpp::Named("aliased") = aliased,
      Rcpp::Named("covariance") = cov, Rcpp::Named("n") = static_cast<double>(info.n),
      Rcpp::Named("rank") = static_cast<double>(info.rank),
      Rcpp::Named("df_residual") = static_cast<double>(info.df_residual), Rcpp::Named("sigma") = info.sigma,
      Rcpp::Named("rss") = info.rss, Rcpp::Named("loglik") = info.loglik, Rcpp::Named("loglik_df") = info.loglik_df,
      Rcpp::Named("jacobian") = info.jacobian);
}

// One chunk's check pass as bytes, for the fit summary `fit` (bytes).
// [[Rcpp::export]]
Rcpp::RawVector rpwb_fit_checks_bytes(Rcpp::RawVector fit, Rcpp::NumericVector y, Rcpp::NumericMatrix X,
                                      Rcpp::Nullable<Rcpp::NumericVector> weights) {
  FitS s;
  rpwb::check(pwb_fit_summary_deserialize(raw_ptr(fit), fit.size(), &s.h));
  FitC c;
  rpwb::check(pwb_fit_checks_new(s.h, &c.h));
  Rcpp::NumericVector wk;
  const std::size_t n = static_cast<std::size_t>(y.size());
  rpwb::check(pwb_fit_checks_add(c.h, y.begin(), x_ptr(X, y), n, n, rpwb::weights_or_null(weights, y.size(), &wk)));
  return bytes_of(c.h, pwb_fit_checks_serialize);
}

// [[Rcpp::export]]
Rcpp::List rpwb_fit_checks_finish(Rcpp::RawVector bytes) {
  FitC c;
  rpwb::check(pwb_fit_checks_deserialize(raw_ptr(bytes), bytes.size(), &c.h));
  pwb_residual_checks r;
  pwb_residual_checks_init(&r);
  rpwb::check(pwb_fit_checks_finish(c.h, &r));
  using rpwb::nan_to_na;
  return Rcpp::List::create(
      Rcpp::Named("n") = static_cast<double>(r.n), Rcpp::Named("sw_statistic") = NA_REAL,
      Rcpp::Named("sw_p") = NA_REAL, Rcpp::Named("sw_computed") = false,
      Rcpp::Named("sw_note") = std::string("Shapiro-Wilk needs every residual at once; not computed from summaries"),
      Rcpp::Named("skewness") = nan_to_na(r.skewness), Rcpp::Named("bp_statistic") = nan_to_na(r.bp_statistic),
      Rcpp::Named("bp_df") = nan_to_na(r.bp_df), Rcpp::Named("bp_p") = nan_to_na(r.bp_p),
      Rcpp::Named("reset_f") = nan_to_na(r.reset_f), Rcpp::Named("reset_df1") = nan_to_na(r.reset_df1),
      Rcpp::Named("reset_df2") = nan_to_na(r.reset_df2), Rcpp::Named("reset_p") = nan_to_na(r.reset_p));
}

// [[Rcpp::export]]
Rcpp::NumericVector rpwb_fit_checks_smearing(Rcpp::RawVector bytes, Rcpp::NumericVector eta) {
  FitC c;
  rpwb::check(pwb_fit_checks_deserialize(raw_ptr(bytes), bytes.size(), &c.h));
  Rcpp::NumericVector out(eta.size());
  rpwb::check(pwb_fit_checks_smearing(c.h, eta.begin(), static_cast<size_t>(eta.size()), out.begin()));
  for (R_xlen_t i = 0; i < out.size(); ++i) out[i] = rpwb::nan_to_na(out[i]);
  return out;
}
