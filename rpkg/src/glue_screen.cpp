// Rcpp glue for the normality statistics, the ladder of powers and the variable screen: thin
// wrappers over pwb_shapiro_wilk, pwb_sample_moments, pwb_ladder_recommend and
// pwb_screen_variable_with_note of powerback.h. Callers pass finite values only (R removes NA
// first).
#include "glue_common.h"

#include <string>
#include <vector>

namespace {

Rcpp::List spec_to_list(const pwb_transform_spec& s) {
  return Rcpp::List::create(Rcpp::Named("family") = std::string(pwb_family_name(s.family)),
                            Rcpp::Named("lambda") = rpwb::nan_to_na(s.lambda),
                            Rcpp::Named("shift") = s.shift,
                            Rcpp::Named("reflect") = s.reflect != 0,
                            Rcpp::Named("pivot") = rpwb::nan_to_na(s.pivot));
}

const char* step_name(pwb_ladder_step s) {
  switch (s) {
    case PWB_LADDER_SQRT: return "sqrt";
    case PWB_LADDER_LOG10: return "log10";
    case PWB_LADDER_RECIPROCAL: return "reciprocal";
    default: return "none";
  }
}

}  // namespace


// The screen of one variable, flattened into a list of scalars plus the two transform specs
// (NULL when absent).
// [[Rcpp::export]]
Rcpp::List rpwb_screen_variable(Rcpp::NumericVector x, double level, double lower, double upper) {
  pwb_screen_options opt;
  pwb_screen_options_init(&opt);
  opt.level = level;
  opt.lower = lower;
  opt.upper = upper;
  pwb_screen_result r;
  pwb_screen_result_init(&r);
  // The note by the header's text rule: a buffer that holds every usual note, and a second call
  // only for a longer one.
  std::vector<char> note(512);
  std::size_t need = 0;
  const std::size_t n = static_cast<std::size_t>(x.size());
  rpwb::check(pwb_screen_variable_with_note(x.begin(), n, &opt, &r, note.data(), note.size(), &need));
  if (need >= note.size()) {
    note.resize(need + 1);
    rpwb::check(pwb_screen_variable_with_note(x.begin(), n, &opt, &r, note.data(), note.size(), &need));
  }
  using rpwb::nan_to_na;
  Rcpp::List moments = Rcpp::List::create(
      Rcpp::Named("n") = static_cast<double>(r.n), Rcpp::Named("mean") = nan_to_na(r.mean),
      Rcpp::Named("sd") = nan_to_na(r.sd), Rcpp::Named("skewness") = nan_to_na(r.skewness),
      Rcpp::Named("skewness_se") = nan_to_na(r.skewness_se),
      Rcpp::Named("skewness_z") = nan_to_na(r.skewness_z),
      Rcpp::Named("kurtosis") = nan_to_na(r.kurtosis),
      Rcpp::Named("kurtosis_se") = nan_to_na(r.kurtosis_se),
      Rcpp::Named("kurtosis_z") = nan_to_na(r.kurtosis_z));
  Rcpp::List sw = Rcpp::List::create(
      Rcpp::Named("w") = nan_to_na(r.sw_w), Rcpp::Named("p") = nan_to_na(r.sw_p),
      Rcpp::Named("note") = std::string(r.sw_note),
      Rcpp::Named("ladder_w") = nan_to_na(r.ladder_sw_w),
      Rcpp::Named("ladder_p") = nan_to_na(r.ladder_sw_p),
      Rcpp::Named("ladder_note") = std::string(r.ladder_sw_note),
      Rcpp::Named("ml_w") = nan_to_na(r.ml_sw_w), Rcpp::Named("ml_p") = nan_to_na(r.ml_sw_p),
      Rcpp::Named("ml_note") = std::string(r.ml_sw_note));
  Rcpp::List ladder = Rcpp::List::create(
      Rcpp::Named("spec") = r.usable ? Rcpp::RObject(spec_to_list(r.ladder)) : Rcpp::RObject(R_NilValue),
      Rcpp::Named("step") = r.usable ? std::string(step_name(r.ladder_step)) : std::string(""),
      Rcpp::Named("by_size") = r.ladder_by_size != 0,
      Rcpp::Named("skewness") = nan_to_na(r.ladder_skewness));
  Rcpp::List ml = Rcpp::List::create(
      Rcpp::Named("done") = r.ml_done != 0,
      Rcpp::Named("spec") = r.ml_done ? Rcpp::RObject(spec_to_list(r.ml)) : Rcpp::RObject(R_NilValue),
      Rcpp::Named("lambda") = nan_to_na(r.ml_lambda),
      Rcpp::Named("conf_low") = nan_to_na(r.ml_conf_low),
      Rcpp::Named("conf_high") = nan_to_na(r.ml_conf_high),
      Rcpp::Named("convenient") = nan_to_na(r.ml_convenient),
      Rcpp::Named("loglik") = nan_to_na(r.ml_loglik),
      Rcpp::Named("at_bound") = r.ml_at_bound != 0, Rcpp::Named("converged") = r.ml_converged != 0,
      Rcpp::Named("low_open") = r.ml_low_open != 0, Rcpp::Named("high_open") = r.ml_high_open != 0,
      Rcpp::Named("skewness") = nan_to_na(r.ml_skewness));
  return Rcpp::List::create(Rcpp::Named("usable") = r.usable != 0,
                            Rcpp::Named("note") = std::string(note.data()),
                            Rcpp::Named("moments") = moments, Rcpp::Named("sw") = sw,
                            Rcpp::Named("ladder") = ladder, Rcpp::Named("ml") = ml);
}

// The ladder rule's thresholds, as the library holds them.
// [[Rcpp::export]]
Rcpp::List rpwb_ladder_rule() {
  pwb_ladder_rule r;
  r.struct_size = sizeof(r);
  rpwb::check(pwb_ladder_rule_get(&r));
  return Rcpp::List::create(Rcpp::Named("large_n") = static_cast<double>(r.large_n),
                            Rcpp::Named("z_cut") = r.z_cut, Rcpp::Named("size_cut") = r.size_cut,
                            Rcpp::Named("log10_cut") = r.log10_cut,
                            Rcpp::Named("reciprocal_cut") = r.reciprocal_cut);
}
