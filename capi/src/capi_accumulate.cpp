// Summaries of chunked data through the C ABI: lambda summaries and their grid passes, fit
// summaries and their check passes.
#include <cmath>
#include <utility>
#include <vector>

#include "capi_internal.hpp"
#include "capi_lambda_guard.hpp"
#include "capi_lambda_result.hpp"
#include "capi_sizes.hpp"
#include "capi_transform_handle.hpp"
#include "powerback/accumulate.hpp"

using namespace powerback;

struct pwb_lambda_summary {
  LambdaSummary impl;
};
struct pwb_lambda_pass {
  LambdaGridPass impl;
};
struct pwb_fit_summary {
  FitSummary impl;
};
struct pwb_fit_checks {
  FitCheckPass impl;
};

namespace {

Family lambda_family(pwb_family f) {
  if (f != PWB_BOX_COX && f != PWB_YEO_JOHNSON)
    throw Error(ErrorCode::Argument, "a lambda summary takes PWB_BOX_COX or PWB_YEO_JOHNSON only; got family code " +
                                         std::to_string(static_cast<int>(f)));
  return static_cast<Family>(f);
}

// weights may be NULL (every row weighs 1).
void check_chunk(const double* y, const double* X, std::size_t rows, std::size_t ld, std::size_t p) {
  capi::need_array(y, rows, "y");
  if (rows > 0 && p > 0) {
    capi::need(X, "X");
    if (ld < rows) throw Error(ErrorCode::Argument, "ld (" + std::to_string(ld) + ") is smaller than rows (" +
                                                        std::to_string(rows) + ")");
    (void)capi::checked_matrix_size(ld, p, "X");
  }
}

void write_bytes(const std::vector<unsigned char>& b, unsigned char* buf, std::size_t cap, std::size_t* needed) {
  capi::need(needed, "needed");
  *needed = b.size();
  if (!buf && cap == 0) return;
  capi::need(buf, "buf");
  if (cap < b.size())
    throw Error(ErrorCode::Argument, "the buffer holds " + std::to_string(cap) + " bytes but the summary needs " +
                                         std::to_string(b.size()) + ": query the size first (buf NULL, cap 0)");
  for (std::size_t i = 0; i < b.size(); ++i) buf[i] = b[i];
}

void write_finish(const SummaryLambdaResult& r, pwb_lambda_result* out, std::size_t n_grid, double* grid_out,
                  double* loglik_out, pwb_summary_pass_info* info) {
  capi::write_lambda_result(r.estimate, out);
  for (std::size_t i = 0; i < n_grid; ++i) {
    grid_out[i] = i < r.grid.size() ? r.grid[i] : math::kNaN;
    loglik_out[i] = i < r.loglik.size() ? r.loglik[i] : math::kNaN;
  }
  if (info) {
    info->needs_pass = r.needs_pass ? 1 : 0;
    info->pass_lower = r.pass_lower;
    info->pass_upper = r.pass_upper;
    info->pass_points = r.pass_points;
    info->from_grid = r.from_grid ? 1 : 0;
  }
}

template <class H, class Make>
void make_handle(H** out, Make&& make) {
  capi::need(out, "out");
  *out = nullptr;
  *out = new H{make()};
}

// The merge, serialize and deserialize entry points, alike for the four kinds of handle.
template <class H>
pwb_status merge_handles(H* into, const H* from) {
  return capi::guarded([&] {
    capi::need(into, "into");
    capi::need(from, "from");
    into->impl.merge(from->impl);
  });
}

template <class H>
pwb_status serialize_handle(const H* h, const char* name, unsigned char* buf, std::size_t cap,
                            std::size_t* needed) {
  return capi::guarded([&] {
    capi::need(h, name);
    write_bytes(h->impl.serialize(), buf, cap, needed);
  });
}

template <class H>
pwb_status deserialize_handle(const unsigned char* buf, std::size_t len, H** out) {
  return capi::guarded([&] {
    make_handle(out, [&] { return decltype(H::impl)::deserialize(buf, len); });
  });
}

// Adds a chunk to a copy that replaces the summary only once the whole chunk is in: an add
// stopped midway (by the caller's interrupt check between blocks of rows, or by memory) leaves
// the summary as it was. The copy's size depends on p and the bins, never on the rows.
template <class Summary>
void add_whole(Summary& impl, const double* y, const double* X, size_t rows, size_t ld,
               const double* weights) {
  Summary next(impl);
  next.add(y, X, rows, ld, weights);
  impl = std::move(next);
}

}  // namespace

extern "C" {

void pwb_summary_pass_info_init(pwb_summary_pass_info* info) {
  if (!info) return;
  info->struct_size = sizeof(pwb_summary_pass_info);
  info->needs_pass = 0;
  info->pass_lower = info->pass_upper = math::kNaN;
  info->pass_points = 0;
  info->from_grid = 0;
}

// ---- lambda summaries ----

pwb_status pwb_lambda_summary_new(pwb_family family, size_t p, pwb_lambda_summary** out) {
  return capi::guarded([&] {
    make_handle(out, [&] { return LambdaSummary(lambda_family(family), p); });
  });
}

pwb_status pwb_lambda_summary_create(size_t p, pwb_family family, pwb_lambda_summary** out) {
  return pwb_lambda_summary_new(family, p, out);
}

void pwb_lambda_summary_free(pwb_lambda_summary* s) { delete s; }

pwb_status pwb_lambda_summary_add(pwb_lambda_summary* s, const double* y, const double* X, size_t rows,
                                  size_t ld, const double* weights) {
  return capi::guarded([&] {
    capi::need(s, "s");
    check_chunk(y, X, rows, ld, s->impl.predictors());
    add_whole(s->impl, y, X, rows, ld, weights);
  });
}

pwb_status pwb_lambda_summary_merge(pwb_lambda_summary* into, const pwb_lambda_summary* from) {
  return merge_handles(into, from);
}

pwb_status pwb_lambda_summary_serialize(const pwb_lambda_summary* s, unsigned char* buf, size_t cap,
                                        size_t* needed) {
  return serialize_handle(s, "s", buf, cap, needed);
}

pwb_status pwb_lambda_summary_deserialize(const unsigned char* buf, size_t len, pwb_lambda_summary** out) {
  return deserialize_handle(buf, len, out);
}

pwb_status pwb_lambda_summary_count(const pwb_lambda_summary* s, size_t* n, size_t* bins) {
  return capi::guarded([&] {
    capi::need(s, "s");
    if (n) *n = s->impl.n();
    if (bins) *bins = s->impl.bins();
  });
}

pwb_status pwb_lambda_summary_finish(const pwb_lambda_summary* s, const pwb_lambda_options* opt,
                                     pwb_lambda_result* out, size_t n_grid, double* grid_out,
                                     double* loglik_out, pwb_summary_pass_info* info) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need_sized(out, "out", "pwb_lambda_result");
    if (info) capi::need_struct(info->struct_size, sizeof(pwb_summary_pass_info), "pwb_summary_pass_info");
    if (n_grid == 1) throw Error(ErrorCode::Argument, "n_grid must be 0 or at least 2");
    capi::need_array(grid_out, n_grid, "grid_out");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const SummaryLambdaResult r = s->impl.finish(capi::lambda_options_of(opt), n_grid == 0 ? 2 : n_grid);
    write_finish(r, out, n_grid, grid_out, loglik_out, info);
  });
}

// ---- grid passes ----

pwb_status pwb_lambda_pass_new(const pwb_lambda_summary* s, const double* grid, size_t n_grid,
                               pwb_lambda_pass** out) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need_array(grid, n_grid, "grid");
    make_handle(out, [&] { return LambdaGridPass(s->impl, std::vector<double>(grid, grid + n_grid)); });
  });
}

void pwb_lambda_pass_free(pwb_lambda_pass* pass) { delete pass; }

pwb_status pwb_lambda_pass_add(pwb_lambda_pass* pass, const double* y, const double* X, size_t rows, size_t ld,
                               const double* weights) {
  return capi::guarded([&] {
    capi::need(pass, "pass");
    capi::need_array(y, rows, "y");
    if (rows > 0 && X) {
      if (ld < rows) throw Error(ErrorCode::Argument, "ld is smaller than rows");
    }
    add_whole(pass->impl, y, X, rows, ld, weights);
  });
}

pwb_status pwb_lambda_pass_merge(pwb_lambda_pass* into, const pwb_lambda_pass* from) {
  return merge_handles(into, from);
}

pwb_status pwb_lambda_pass_serialize(const pwb_lambda_pass* pass, unsigned char* buf, size_t cap,
                                     size_t* needed) {
  return serialize_handle(pass, "pass", buf, cap, needed);
}

pwb_status pwb_lambda_pass_deserialize(const unsigned char* buf, size_t len, pwb_lambda_pass** out) {
  return deserialize_handle(buf, len, out);
}

pwb_status pwb_lambda_pass_grid_size(const pwb_lambda_pass* pass, size_t* n_grid) {
  return capi::guarded([&] {
    capi::need(pass, "pass");
    capi::need(n_grid, "n_grid");
    *n_grid = pass->impl.grid().size();
  });
}

pwb_status pwb_lambda_pass_finish(const pwb_lambda_pass* pass, const pwb_lambda_summary* s,
                                  const pwb_lambda_options* opt, pwb_lambda_result* out, size_t n_grid,
                                  double* grid_out, double* loglik_out, pwb_summary_pass_info* info) {
  return capi::guarded([&] {
    capi::need(pass, "pass");
    capi::need(s, "s");
    capi::need_sized(out, "out", "pwb_lambda_result");
    if (info) capi::need_struct(info->struct_size, sizeof(pwb_summary_pass_info), "pwb_summary_pass_info");
    if (n_grid != pass->impl.grid().size())
      throw Error(ErrorCode::Argument, "n_grid must be the pass's grid size, " +
                                           std::to_string(pass->impl.grid().size()));
    capi::need_array(grid_out, n_grid, "grid_out");
    capi::need_array(loglik_out, n_grid, "loglik_out");
    const SummaryLambdaResult r = pass->impl.finish(s->impl, capi::lambda_options_of(opt));
    write_finish(r, out, n_grid, grid_out, loglik_out, info);
  });
}

// ---- fit summaries ----

pwb_status pwb_fit_summary_new(const pwb_transform* response, size_t p, size_t estimated_parameters,
                               pwb_fit_summary** out) {
  return capi::guarded([&] {
    const Transform t = response ? response->impl : Transform();
    make_handle(out, [&] { return FitSummary(t, p, estimated_parameters); });
  });
}

void pwb_fit_summary_free(pwb_fit_summary* s) { delete s; }

pwb_status pwb_fit_summary_add(pwb_fit_summary* s, const double* y, const double* X, size_t rows, size_t ld,
                               const double* weights) {
  return capi::guarded([&] {
    capi::need(s, "s");
    check_chunk(y, X, rows, ld, s->impl.predictors());
    add_whole(s->impl, y, X, rows, ld, weights);
  });
}

pwb_status pwb_fit_summary_merge(pwb_fit_summary* into, const pwb_fit_summary* from) {
  return merge_handles(into, from);
}

pwb_status pwb_fit_summary_serialize(const pwb_fit_summary* s, unsigned char* buf, size_t cap, size_t* needed) {
  return serialize_handle(s, "s", buf, cap, needed);
}

pwb_status pwb_fit_summary_deserialize(const unsigned char* buf, size_t len, pwb_fit_summary** out) {
  return deserialize_handle(buf, len, out);
}

pwb_status pwb_fit_summary_finish(const pwb_fit_summary* s, pwb_model_info* info, double* coef, double* se,
                                  int* aliased, double* covariance, size_t columns) {
  return capi::guarded([&] {
    capi::need(s, "s");
    if (info) capi::need_struct(info->struct_size, sizeof(pwb_model_info), "pwb_model_info");
    const std::size_t c = s->impl.predictors() + 1;
    if ((coef || se || aliased || covariance) && columns != c)
      throw Error(ErrorCode::Argument, "columns is " + std::to_string(columns) + " but the fit has " +
                                           std::to_string(c) + " coefficients");
    const SummaryFit f = s->impl.finish();
    if (info) {
      info->n = f.n;
      info->columns = f.columns;
      info->rank = f.rank;
      info->df_residual = f.df_residual;
      info->intercept = 1;
      info->sigma = f.sigma;
      info->rss = f.rss;
      info->loglik = f.loglik;
      info->loglik_df = f.loglik_df;
      info->jacobian = f.jacobian;
    }
    for (std::size_t j = 0; j < c; ++j) {
      const Eigen::Index jj = static_cast<Eigen::Index>(j);
      if (coef) coef[j] = f.coef(jj);
      if (se) se[j] = f.se(jj);
      if (aliased) aliased[j] = f.aliased[j] ? 1 : 0;
      if (covariance)
        for (std::size_t i = 0; i < c; ++i) covariance[j * c + i] = f.covariance(static_cast<Eigen::Index>(i), jj);
    }
  });
}

// ---- check passes ----

pwb_status pwb_fit_checks_new(const pwb_fit_summary* s, pwb_fit_checks** out) {
  return capi::guarded([&] {
    capi::need(s, "s");
    make_handle(out, [&] { return FitCheckPass(s->impl); });
  });
}

void pwb_fit_checks_free(pwb_fit_checks* c) { delete c; }

pwb_status pwb_fit_checks_add(pwb_fit_checks* c, const double* y, const double* X, size_t rows, size_t ld,
                              const double* weights) {
  return capi::guarded([&] {
    capi::need(c, "c");
    capi::need_array(y, rows, "y");
    if (rows > 0 && X && ld < rows) throw Error(ErrorCode::Argument, "ld is smaller than rows");
    add_whole(c->impl, y, X, rows, ld, weights);
  });
}

pwb_status pwb_fit_checks_merge(pwb_fit_checks* into, const pwb_fit_checks* from) {
  return merge_handles(into, from);
}

pwb_status pwb_fit_checks_serialize(const pwb_fit_checks* c, unsigned char* buf, size_t cap, size_t* needed) {
  return serialize_handle(c, "c", buf, cap, needed);
}

pwb_status pwb_fit_checks_deserialize(const unsigned char* buf, size_t len, pwb_fit_checks** out) {
  return deserialize_handle(buf, len, out);
}

pwb_status pwb_fit_checks_finish(const pwb_fit_checks* c, pwb_residual_checks* out) {
  return capi::guarded([&] {
    capi::need(c, "c");
    capi::need_sized(out, "out", "pwb_residual_checks");
    const SummaryChecks k = c->impl.finish();
    out->n = k.n;
    out->sw_statistic = out->sw_p = math::kNaN;
    out->sw_computed = 0;
    out->skewness = k.skewness;
    out->bp_statistic = k.bp_statistic;
    out->bp_df = k.bp_df;
    out->bp_p = k.bp_p;
    out->reset_f = k.reset_f;
    out->reset_df1 = k.reset_df1;
    out->reset_df2 = k.reset_df2;
    out->reset_p = k.reset_p;
  });
}

pwb_status pwb_fit_checks_smearing(const pwb_fit_checks* c, const double* eta, size_t m, double* mean_out) {
  return capi::guarded([&] {
    capi::need(c, "c");
    capi::need_array(eta, m, "eta");
    capi::need_array(mean_out, m, "mean_out");
    const std::vector<double> v = c->impl.smearing_mean(eta, m);
    for (std::size_t i = 0; i < m; ++i) mean_out[i] = v[i];
  });
}

}  // extern "C"
