// The live pwb_model handle of a fitted R object: an external pointer whose finalizer releases
// the core model (shared by the model and diagnostics glue). Reaches the library only through
// powerback.h. A saved and reloaded object has a NULL pointer; the R side rebuilds it.
#pragma once

#include "glue_common.h"

namespace rpwb {

// What the external pointer holds: the core model and, when the model reads its design in place
// (pwb_model_options.borrow_design), the R matrix holding that design. The matrix is kept alive
// through R's precious list rather than as the pointer's `prot`, because serialize() writes a
// pointer's prot (a saved model would carry its whole design); a reloaded pointer is NULL and
// the R side refits (model_frame.R).
struct ModelHolder {
  pwb_model* model = nullptr;
  SEXP design = R_NilValue;  // preserved while the model lives, or R_NilValue
  ModelHolder(pwb_model* m, SEXP d) : model(m), design(d) {
    if (design != R_NilValue) R_PreserveObject(design);
  }
  ~ModelHolder() {
    pwb_model_free(model);  // first the model, which reads the design until freed
    if (design != R_NilValue) R_ReleaseObject(design);
  }
  ModelHolder(const ModelHolder&) = delete;
  ModelHolder& operator=(const ModelHolder&) = delete;
};
typedef Rcpp::XPtr<ModelHolder, Rcpp::PreserveStorage,
                   Rcpp::standard_delete_finalizer<ModelHolder>, true>
    ModelPtr;

// Fits a core model. y: raw responses; X: the design without its intercept column, or with it
// (first column all ones) when `borrow`, in which case the model reads X in place and the
// returned pointer keeps X alive (X is marked not mutable, so R copies before any change);
// response: NULL or a transform spec list; estimated: transform parameters estimated from these
// data; weights: NULL or one precision weight per row.
inline ModelPtr fit_model(const Rcpp::NumericVector& y, const Rcpp::NumericMatrix& X,
                          bool intercept, const Rcpp::Nullable<Rcpp::List>& response,
                          int estimated, const Rcpp::Nullable<Rcpp::NumericVector>& weights,
                          bool borrow = false) {
  if (X.nrow() != y.size()) Rcpp::stop("the design has %d rows but y has %d", X.nrow(), y.size());
  if (borrow && intercept && X.ncol() < 1) Rcpp::stop("the design has no intercept column");
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
  o.borrow_design = borrow ? 1 : 0;
  const int predictors = X.ncol() - (borrow && intercept ? 1 : 0);
  pwb_model* m = nullptr;
  const pwb_status st = pwb_model_fit(y.begin(), X.ncol() > 0 ? X.begin() : nullptr,
                                      static_cast<size_t>(y.size()),
                                      static_cast<size_t>(predictors), t, &o, &m);
  pwb_transform_free(t);
  check(st);
  SEXP keep = R_NilValue;
  if (borrow) {
    keep = X;
    MARK_NOT_MUTABLE(keep);
  }
  return ModelPtr(new ModelHolder(m, keep), true);
}

// The model behind a handle; an R error when the pointer is empty (a reloaded object whose
// handle was not rebuilt).
inline const pwb_model* model_of(SEXP handle) {
  if (TYPEOF(handle) != EXTPTRSXP || R_ExternalPtrAddr(handle) == nullptr)
    Rcpp::stop("the model handle is empty (a saved object not yet rebuilt)");
  return static_cast<const ModelHolder*>(R_ExternalPtrAddr(handle))->model;
}

}  // namespace rpwb
