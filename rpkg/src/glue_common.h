// Shared pieces of the Rcpp glue. The glue reaches the core only through powerback.h.
#pragma once

#include <Rcpp.h>

#include <cmath>
#include <cstddef>
#include <string>
#include <vector>

#include "powerback.h"

namespace rpwb {

// Turns a failing status into an R error carrying the library's message. Rcpp raises the R
// error only after the C++ frames have unwound, so no longjmp crosses C++ code. A computation
// stopped by the user's interrupt (PWB_ERR_CANCELLED) becomes R's own interrupt, again raised
// by Rcpp after the unwinding.
inline void check(pwb_status st) {
  if (st == PWB_ERR_CANCELLED) throw Rcpp::internal::InterruptedException();
  if (st != PWB_OK) throw Rcpp::exception(pwb_last_error(), false);
}

// R_CheckUserInterrupt jumps (longjmp) to the top level when the user has pressed Ctrl-C or Esc;
// run inside R_ToplevelExec the jump ends there instead, and R_ToplevelExec returns FALSE. So this
// asks R about a pending interrupt without ever jumping over C++ frames. Main R thread only.
inline void interrupt_probe(void*) { R_CheckUserInterrupt(); }
inline int interrupt_pending(void*) {
  return R_ToplevelExec(interrupt_probe, nullptr) == FALSE ? 1 : 0;
}

inline double na_to_nan(SEXP v) {
  const double d = Rcpp::as<double>(v);
  return ISNAN(d) ? NAN : d;
}

// The family code of a name ("box-cox", ...); an R error naming the choices for an unknown one.
inline pwb_family family_of(const std::string& name) {
  pwb_family f;
  check(pwb_family_from_name(name.c_str(), &f));
  return f;
}

// A pwb_transform spec from the R list (family, lambda, shift, reflect, pivot).
inline pwb_transform_spec spec_from_list(const Rcpp::List& l) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  s.family = family_of(Rcpp::as<std::string>(l["family"]));
  s.lambda = na_to_nan(l["lambda"]);
  s.shift = na_to_nan(l["shift"]);
  s.reflect = Rcpp::as<bool>(l["reflect"]) ? 1 : 0;
  s.pivot = na_to_nan(l["pivot"]);
  return s;
}

// Owns a pwb_transform for the duration of one glue call.
class Transform {
 public:
  explicit Transform(const Rcpp::List& l) {
    const pwb_transform_spec s = spec_from_list(l);
    check(pwb_transform_new(&s, &t_));
  }
  ~Transform() { pwb_transform_free(t_); }
  Transform(const Transform&) = delete;
  Transform& operator=(const Transform&) = delete;
  const pwb_transform* get() const { return t_; }

 private:
  pwb_transform* t_ = nullptr;
};

inline double nan_to_na(double d) { return std::isnan(d) ? NA_REAL : d; }

// NULL when w is, else w's values (held alive in *keep), which must be as many as the n rows.
inline const double* weights_or_null(const Rcpp::Nullable<Rcpp::NumericVector>& w, R_xlen_t n,
                                     Rcpp::NumericVector* keep) {
  if (w.isNull()) return nullptr;
  *keep = Rcpp::NumericVector(w.get());
  if (keep->size() != n) Rcpp::stop("the weights and the response differ in length");
  return keep->begin();
}

// Lambda options with the given range and level (and weights, NULL for none).
inline pwb_lambda_options lambda_options(double lower, double upper, double level,
                                         const double* w = nullptr) {
  pwb_lambda_options o;
  pwb_lambda_options_init(&o);
  o.lower = lower;
  o.upper = upper;
  o.level = level;
  o.weights = w;
  return o;
}

// The first `count` entries of the aliased-column buffer (0-based design columns, 0 = the
// intercept) as an R numeric vector.
inline Rcpp::NumericVector aliased_indices(const std::vector<std::size_t>& buf, std::size_t count) {
  const std::size_t m = count < buf.size() ? count : buf.size();
  return Rcpp::NumericVector(buf.begin(), buf.begin() + static_cast<std::ptrdiff_t>(m));
}

// A lambda estimate and its profile curve as the R list the estimators return (Grid: any
// vector Rcpp can wrap, e.g. std::vector<double> or a column of a NumericMatrix).
template <class Grid>
inline Rcpp::List lambda_result_list(const pwb_lambda_result& r, const Grid& grid, const Grid& ll) {
  return Rcpp::List::create(
      Rcpp::Named("lambda") = r.lambda, Rcpp::Named("conf_low") = r.conf_low,
      Rcpp::Named("conf_high") = r.conf_high, Rcpp::Named("convenient") = r.convenient,
      Rcpp::Named("loglik") = r.loglik, Rcpp::Named("at_bound") = r.at_bound != 0,
      Rcpp::Named("converged") = r.converged != 0, Rcpp::Named("n") = static_cast<double>(r.n),
      Rcpp::Named("low_open") = r.low_open != 0, Rcpp::Named("high_open") = r.high_open != 0,
      Rcpp::Named("rank") = static_cast<double>(r.rank),
      Rcpp::Named("n_aliased") = static_cast<double>(r.n_aliased),
      Rcpp::Named("grid") = Rcpp::NumericVector(grid.begin(), grid.end()),
      Rcpp::Named("grid_loglik") = Rcpp::NumericVector(ll.begin(), ll.end()));
}

}  // namespace rpwb
