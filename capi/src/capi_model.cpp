// The model handle of the C ABI: fit, accessors, predictions in original units.
#include <algorithm>
#include <cstddef>
#include <cstring>
#include <memory>

#include "capi_internal.hpp"
#include "capi_transform_handle.hpp"
#include "capi_sizes.hpp"
#include "capi_model_handle.hpp"
#include "powerback/model.hpp"
#include "powerback/transform.hpp"


using namespace powerback;

namespace {

// A C caller may pass any int where an enum is declared; reading it as the C++ enum type would
// be undefined for values outside the enumerators, so read its bytes as an int.
template <class E>
int enum_value(const E& e) {
  static_assert(sizeof(E) == sizeof(int), "C enums are int-sized");
  int v;
  std::memcpy(&v, &e, sizeof v);
  return v;
}

// The caller's options; fields appended later (tail_mass) are absent from a smaller struct.
pwb_predict_options caller_options(const pwb_predict_options* opt) {
  pwb_predict_options o;
  pwb_predict_options_init(&o);
  if (opt) {
    capi::need_struct(opt->struct_size, offsetof(pwb_predict_options, tail_mass),
                      "pwb_predict_options");
    std::memcpy(&o, opt, std::min(opt->struct_size, sizeof(pwb_predict_options)));
    o.struct_size = sizeof(pwb_predict_options);
  }
  return o;
}

PredictOptions predict_options_of(const pwb_predict_options* opt) {
  const pwb_predict_options o = caller_options(opt);
  PredictOptions po;
  po.level = o.level;
  switch (enum_value(o.interval)) {
    case PWB_INTERVAL_NONE: po.interval = IntervalKind::None; break;
    case PWB_INTERVAL_CONFIDENCE: po.interval = IntervalKind::Confidence; break;
    case PWB_INTERVAL_PREDICTION: po.interval = IntervalKind::Prediction; break;
    default: throw Error(ErrorCode::Argument, "unknown interval kind " + std::to_string(enum_value(o.interval)));
  }
  switch (enum_value(o.center)) {
    case PWB_CENTER_MEDIAN: po.center = Center::Median; break;
    case PWB_CENTER_MEAN: po.center = Center::Mean; break;
    default: throw Error(ErrorCode::Argument, "unknown center " + std::to_string(enum_value(o.center)));
  }
  switch (enum_value(o.mean_method)) {
    case PWB_MEAN_SMEARING: po.mean_method = MeanMethod::Smearing; break;
    case PWB_MEAN_NORMAL: po.mean_method = MeanMethod::Normal; break;
    default: throw Error(ErrorCode::Argument, "unknown mean method " + std::to_string(enum_value(o.mean_method)));
  }
  po.transformed_scale = o.transformed_scale != 0;
  return po;
}

void copy_prediction(const Prediction& pr, std::size_t rows, double* fit, double* lwr, double* upr,
                     unsigned* flags, double* tail_mass) {
  for (std::size_t i = 0; i < rows; ++i) {
    if (tail_mass) tail_mass[i] = pr.cut_mass[i];
    fit[i] = pr.fit[i];
    if (lwr) lwr[i] = pr.lower[i];
    if (upr) upr[i] = pr.upper[i];
    if (flags) flags[i] = pr.flags[i];
  }
}

}  // namespace

extern "C" {

void pwb_model_options_init(pwb_model_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_model_options);
  opt->intercept = 1;
  opt->estimated_parameters = 0;
  opt->weights = nullptr;
  opt->borrow_design = 0;
}

pwb_status pwb_model_fit(const double* y, const double* X, size_t n, size_t p,
                         const pwb_transform* response, const pwb_model_options* opt,
                         pwb_model** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need(out, "out");
    capi::need(y, "y");
    capi::need_array(X, capi::checked_matrix_size(n, p, "X"), "X");
    pwb_model_options o;
    pwb_model_options_init(&o);
    if (opt) {
      // The first version of the struct ended before `weights`; a caller built against it
      // gets no weights.
      capi::need_struct(opt->struct_size, offsetof(pwb_model_options, weights),
                        "pwb_model_options");
      std::memcpy(&o, opt, std::min(opt->struct_size, sizeof o));
      o.struct_size = sizeof o;
    }
    std::unique_ptr<Transform> tr;
    if (response) tr.reset(new Transform(capi::transform_of(response, "response")));
    // A borrowed design holds the intercept column too.
    const bool borrow = o.borrow_design != 0;
    const std::size_t cols = p + (borrow && o.intercept != 0 ? 1 : 0);
    capi::need_array(X, capi::checked_matrix_size(n, cols, "X"), "X");
    *out = new pwb_model{Model(y, X, n, p, o.intercept != 0, tr.get(), o.estimated_parameters,
                               o.weights, borrow)};
  });
}

void pwb_model_free(pwb_model* m) { delete m; }

pwb_status pwb_model_get_info(const pwb_model* m, pwb_model_info* info) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need(info, "info");
    capi::need_struct(info->struct_size, offsetof(pwb_model_info, nobs), "pwb_model_info");
    const Model& f = m->impl;
    info->n = f.n();
    info->columns = f.columns();
    info->rank = f.rank();
    info->df_residual = f.df_residual();
    info->intercept = f.intercept() ? 1 : 0;
    info->sigma = f.sigma();
    info->rss = f.rss();
    info->loglik = f.loglik();
    info->loglik_df = f.loglik_df();
    info->jacobian = f.jacobian();
    if (info->struct_size >= offsetof(pwb_model_info, nobs) + sizeof info->nobs)
      info->nobs = f.nobs();
    if (info->struct_size >= offsetof(pwb_model_info, weighted) + sizeof info->weighted)
      info->weighted = f.weighted() ? 1 : 0;
  });
}

pwb_status pwb_model_coefficients(const pwb_model* m, double* coef, double* se, int* aliased,
                                  size_t columns) {
  return capi::guarded([&] {
    capi::need(m, "m");
    const Model& f = m->impl;
    require(columns == f.columns(), "columns is " + std::to_string(columns) +
                                        " but the model has " + std::to_string(f.columns()) +
                                        " coefficients");
    const std::vector<bool> al = f.aliased();
    for (std::size_t j = 0; j < columns; ++j) {
      const Eigen::Index jj = static_cast<Eigen::Index>(j);
      if (coef) coef[j] = f.coefficients()(jj);
      if (se) se[j] = f.standard_errors()(jj);
      if (aliased) aliased[j] = al[j] ? 1 : 0;
    }
  });
}

pwb_status pwb_model_vector_get(const pwb_model* m, pwb_model_vector which, double* out,
                                size_t n) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need(out, "out");
    const Model& f = m->impl;
    require(n == f.n(), "n is " + std::to_string(n) + " but the model has " +
                            std::to_string(f.n()) + " rows");
    Eigen::VectorXd v;
    switch (enum_value(which)) {
      case PWB_MODEL_RESIDUALS: v = f.residuals(); break;
      case PWB_MODEL_FITTED: v = f.fitted(); break;
      case PWB_MODEL_LEVERAGES: v = f.leverages(); break;
      case PWB_MODEL_TRANSFORMED_RESPONSE: v = f.transformed_response(); break;
      default:
        throw Error(ErrorCode::Argument,
                    "unknown model vector " + std::to_string(enum_value(which)));
    }
    for (std::size_t i = 0; i < n; ++i) out[i] = v(static_cast<Eigen::Index>(i));
  });
}

void pwb_predict_options_init(pwb_predict_options* opt) {
  if (!opt) return;
  opt->struct_size = sizeof(pwb_predict_options);
  opt->level = 0.95;
  opt->interval = PWB_INTERVAL_NONE;
  opt->center = PWB_CENTER_MEDIAN;
  opt->mean_method = PWB_MEAN_SMEARING;
  opt->transformed_scale = 0;
  opt->tail_mass = nullptr;
}

pwb_status pwb_model_predict(const pwb_model* m, const double* Xnew, size_t rows, size_t p,
                             const pwb_predict_options* opt, double* fit, double* lwr,
                             double* upr, unsigned* flags) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_array(fit, rows, "fit");
    capi::need_array(Xnew, capi::checked_matrix_size(rows, p, "Xnew"), "Xnew");
    const PredictOptions po = predict_options_of(opt);
    copy_prediction(m->impl.predict(Xnew, rows, p, po), rows, fit, lwr, upr, flags,
                    caller_options(opt).tail_mass);
  });
}

pwb_status pwb_model_predict_fitted(const pwb_model* m, const pwb_predict_options* opt,
                                    double* fit, double* lwr, double* upr, unsigned* flags,
                                    size_t rows) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_array(fit, rows, "fit");
    require(rows == m->impl.n(), "rows is " + std::to_string(rows) + " but the model has " +
                                     std::to_string(m->impl.n()) + " rows");
    const PredictOptions po = predict_options_of(opt);
    copy_prediction(m->impl.predict_fitted(po), rows, fit, lwr, upr, flags,
                    caller_options(opt).tail_mass);
  });
}

}  // extern "C"
