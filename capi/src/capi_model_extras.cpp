// Model handle entry points beyond fit and predict: the coefficient covariance, standard errors
// of new fitted values, and the residual checks with their note from one computation.
#include <string>
#include <vector>

#include "capi_internal.hpp"
#include "capi_model_handle.hpp"
#include "capi_sizes.hpp"
#include "powerback/diagnostics.hpp"
#include "powerback/model.hpp"

using namespace powerback;

extern "C" {

pwb_status pwb_model_covariance(const pwb_model* m, double* cov, size_t columns) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need(cov, "cov");
    const Model& f = m->impl;
    require(columns == f.columns(), "columns is " + std::to_string(columns) +
                                        " but the model has " + std::to_string(f.columns()) +
                                        " coefficients");
    const Eigen::MatrixXd v = f.covariance();
    for (std::size_t j = 0; j < columns; ++j)
      for (std::size_t i = 0; i < columns; ++i)
        cov[j * columns + i] = v(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j));
  });
}

pwb_status pwb_model_predict_se(const pwb_model* m, const double* Xnew, size_t rows, size_t p,
                                double* se) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_array(se, rows, "se");
    capi::need_array(Xnew, capi::checked_matrix_size(rows, p, "Xnew"), "Xnew");
    const std::vector<double> s = m->impl.fit_standard_errors(Xnew, rows, p);
    for (std::size_t i = 0; i < rows; ++i) se[i] = s[i];
  });
}

pwb_status pwb_model_residual_checks_with_note(const pwb_model* m, pwb_residual_checks* out,
                                               char* buf, size_t cap, size_t* needed) {
  return capi::guarded([&] {
    capi::need(m, "m");
    capi::need_sized(out, "out", "pwb_residual_checks");
    const ResidualChecks c = residual_checks(m->impl);
    out->n = c.n;
    out->sw_statistic = c.sw_statistic;
    out->sw_p = c.sw_p;
    out->sw_computed = c.sw_computed ? 1 : 0;
    out->skewness = c.skewness;
    out->bp_statistic = c.bp_statistic;
    out->bp_df = c.bp_df;
    out->bp_p = c.bp_p;
    out->reset_f = c.reset_f;
    out->reset_df1 = c.reset_df1;
    out->reset_df2 = c.reset_df2;
    out->reset_p = c.reset_p;
    capi::copy_text(c.sw_note, buf, cap, needed);
  });
}

}  // extern "C"
