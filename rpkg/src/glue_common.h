// Shared pieces of the Rcpp glue. The glue reaches the core only through powerback.h.
#pragma once

#include <Rcpp.h>

#include <cmath>
#include <string>

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

// A pwb_transform spec from the R list (family, lambda, shift, reflect, pivot).
inline pwb_transform_spec spec_from_list(const Rcpp::List& l) {
  pwb_transform_spec s;
  pwb_transform_spec_init(&s);
  pwb_family f;
  check(pwb_family_from_name(Rcpp::as<std::string>(l["family"]).c_str(), &f));
  s.family = f;
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

}  // namespace rpwb
