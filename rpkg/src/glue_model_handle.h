// A pwb_model handle owned for the duration of one glue call (shared by the model and
// diagnostics glue). Reaches the library only through powerback.h.
#pragma once

#include "glue_common.h"

namespace rpwb {

class Model {
 public:
  // y: raw responses; X: the design without its intercept column; response: NULL or a
  // transform spec list; estimated: transform parameters estimated from these data.
  Model(const Rcpp::NumericVector& y, const Rcpp::NumericMatrix& X, bool intercept,
        const Rcpp::Nullable<Rcpp::List>& response, int estimated) {
    if (X.nrow() != y.size()) Rcpp::stop("the design has %d rows but y has %d", X.nrow(), y.size());
    pwb_transform* t = nullptr;
    if (response.isNotNull()) {
      const pwb_transform_spec s = spec_from_list(Rcpp::List(response.get()));
      check(pwb_transform_new(&s, &t));
    }
    pwb_model_options o;
    pwb_model_options_init(&o);
    o.intercept = intercept ? 1 : 0;
    o.estimated_parameters = static_cast<size_t>(estimated < 0 ? 0 : estimated);
    const pwb_status st = pwb_model_fit(y.begin(), X.ncol() > 0 ? X.begin() : nullptr,
                                        static_cast<size_t>(y.size()), static_cast<size_t>(X.ncol()),
                                        t, &o, &m_);
    pwb_transform_free(t);
    check(st);
  }
  ~Model() { pwb_model_free(m_); }
  Model(const Model&) = delete;
  Model& operator=(const Model&) = delete;
  const pwb_model* get() const { return m_; }

 private:
  pwb_model* m_ = nullptr;
};

}  // namespace rpwb
