// Rcpp glue for transforms: thin wrappers over pwb_transform_* of powerback.h.
#include "glue_common.h"

#include <vector>

// [[Rcpp::export]]
Rcpp::List rpwb_transform_normalise(Rcpp::List spec) {
  rpwb::Transform t(spec);
  pwb_transform_spec s;
  s.struct_size = sizeof s;
  rpwb::check(pwb_transform_get_spec(t.get(), &s));
  return Rcpp::List::create(Rcpp::Named("family") = std::string(pwb_family_name(s.family)),
                            Rcpp::Named("lambda") = rpwb::nan_to_na(s.lambda),
                            Rcpp::Named("shift") = s.shift,
                            Rcpp::Named("reflect") = s.reflect != 0,
                            Rcpp::Named("pivot") = rpwb::nan_to_na(s.pivot));
}

// which: 0 apply, 1 invert, 2 log |derivative|. Elements that cannot be mapped come back NA and
// the status says why; the R caller phrases the rows.
// [[Rcpp::export]]
Rcpp::List rpwb_transform_map(Rcpp::List spec, Rcpp::NumericVector x, int which) {
  rpwb::Transform t(spec);
  Rcpp::NumericVector out(x.size());
  const std::size_t n = static_cast<std::size_t>(x.size());
  pwb_status st;
  if (which == 0) st = pwb_transform_apply(t.get(), x.begin(), n, out.begin());
  else if (which == 1) st = pwb_transform_invert(t.get(), x.begin(), n, out.begin());
  else st = pwb_transform_log_derivative(t.get(), x.begin(), n, out.begin());
  if (st != PWB_OK && st != PWB_ERR_DOMAIN && st != PWB_ERR_NONFINITE) rpwb::check(st);
  for (auto& v : out) v = rpwb::nan_to_na(v);
  return Rcpp::List::create(Rcpp::Named("value") = out, Rcpp::Named("status") = static_cast<int>(st),
                            Rcpp::Named("message") = std::string(pwb_last_error()));
}

// [[Rcpp::export]]
std::string rpwb_transform_describe(Rcpp::List spec, int which) {
  rpwb::Transform t(spec);
  std::size_t needed = 0;
  rpwb::check(pwb_transform_describe(t.get(), which, nullptr, 0, &needed));
  std::vector<char> buf(needed + 1);
  rpwb::check(pwb_transform_describe(t.get(), which, buf.data(), buf.size(), nullptr));
  return std::string(buf.data());
}

