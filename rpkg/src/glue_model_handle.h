// The live pwb_model handle of a fitted R object: an external pointer whose finalizer releases
// the core model (shared by the model and diagnostics glue). Reaches the library only through
// powerback.h. A saved and reloaded object has a NULL pointer; the R side rebuilds it.
#pragma once

#include "glue_common.h"

namespace rpwb {

inline void model_finalizer(pwb_model* m) { pwb_model_free(m); }
typedef Rcpp::XPtr<pwb_model, Rcpp::PreserveStorage, model_finalizer, true> ModelPtr;

// Fits a core model. y: raw responses; X: the design without its intercept column; response:
// NULL or a transform spec list; estimated: transform parameters estimated from these data;
// weights: NULL or one precision weight per row.
inline ModelPtr fit_model(const Rcpp::NumericVector& y, const Rcpp::NumericMatrix& X,
                          bool intercept, const Rcpp::Nullable<Rcpp::List>& response,
                          int estimated, const Rcpp::Nullable<Rcpp::NumericVector>& weights) {
  if (X.nrow() != y.size()) Rcpp::stop("the design has %d rows but y has %d", X.nrow(), y.size());
  Rcpp::NumericVector w;
  if (weights.isNotNull()) {
    w = Rcpp::NumericVector(weights.get());
    if (w.size() != y.size()) Rcpp::stop("there are %d weights for %d rows", w.size(), y.size());
  }
  pwb_transform* t = nullptr;
  if (response.isNotNull()) {
    const pwb_transform_spec s = spec_from_list(Rcpp::List(response.get()));
    check(pwb_transform_new(&s, &t));
  }
  pwb_model_options o;
  pwb_model_options_init(&o);
  o.intercept = intercept ? 1 : 0;
  o.estimated_parameters = static_cast<size_t>(estimated < 0 ? 0 : estimated);
  o.weights = weights.isNotNull() ? w.begin() : nullptr;
  pwb_model* m = nullptr;
  const pwb_status st = pwb_model_fit(y.begin(), X.ncol() > 0 ? X.begin() : nullptr,
                                      static_cast<size_t>(y.size()),
                                      static_cast<size_t>(X.ncol()), t, &o, &m);
  pwb_transform_free(t);
  check(st);
  return ModelPtr(m, true);
}

// The model behind a handle; an R error when the pointer is empty (a reloaded object whose
// handle was not rebuilt).
inline const pwb_model* model_of(SEXP handle) {
  if (TYPEOF(handle) != EXTPTRSXP || R_ExternalPtrAddr(handle) == nullptr)
    Rcpp::stop("the model handle is empty (a saved object not yet rebuilt)");
  return static_cast<const pwb_model*>(R_ExternalPtrAddr(handle));
}

}  // namespace rpwb
