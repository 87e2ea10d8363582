// Rcpp glue for intervals of the original-scale mean: a thin wrapper over
// pwb_model_predict_mean_interval of powerback.h. The R side validates and builds the design and
// the group ids.
#include "glue_model_handle.h"

#include <cstddef>
#include <vector>

// Xnew: the design without its intercept column; group: NULL or 1-based group ids (one per row,
// every id in 1..n_groups used); mean_method: 0 smearing, 1 normal; method: 0 delta,
// 1 bootstrap; seed: a whole number in [0, 2^53). Returns fit, se, lwr, upr and flags, one per
// output (group or row).
// [[Rcpp::export]]
Rcpp::List rpwb_model_mean_interval(SEXP handle, Rcpp::NumericMatrix Xnew,
                                    Rcpp::Nullable<Rcpp::IntegerVector> group, int n_groups,
                                    double level, int mean_method, int method, int replicates,
                                    double seed) {
  const pwb_model* m = rpwb::model_of(handle);
  const std::size_t rows = static_cast<std::size_t>(Xnew.nrow());
  const std::size_t p = static_cast<std::size_t>(Xnew.ncol());
  pwb_mean_interval_options o;
  pwb_mean_interval_options_init(&o);
  o.level = level;
  o.mean_method = static_cast<pwb_mean_method>(mean_method);
  o.method = static_cast<pwb_mean_interval_method>(method);
  o.replicates = static_cast<size_t>(replicates < 0 ? 0 : replicates);
  o.seed = static_cast<unsigned long long>(seed);
  std::vector<size_t> ids;
  std::size_t outputs = rows;
  if (group.isNotNull()) {
    Rcpp::IntegerVector g(group.get());
    if (static_cast<std::size_t>(g.size()) != rows) Rcpp::stop("there are %d group ids for %d rows", g.size(), static_cast<int>(rows));
    ids.resize(rows);
    for (std::size_t i = 0; i < rows; ++i) {
      if (g[i] == NA_INTEGER || g[i] < 1) Rcpp::stop("group id of row %d is not a positive integer", static_cast<int>(i + 1));
      ids[i] = static_cast<size_t>(g[i] - 1);
    }
    o.group = ids.data();
    o.n_groups = static_cast<size_t>(n_groups);
    outputs = o.n_groups;
  }
  std::vector<double> fit(outputs), se(outputs), lwr(outputs), upr(outputs);
  std::vector<unsigned> flags(outputs);
  const double* x = p > 0 && rows > 0 ? Xnew.begin() : nullptr;
  rpwb::check(pwb_model_predict_mean_interval(m, x, rows, p, &o, fit.data(), se.data(), lwr.data(),
                                              upr.data(), flags.data(), outputs));
  auto vec = [](const std::vector<double>& v) {
    Rcpp::NumericVector out(v.size());
    for (std::size_t i = 0; i < v.size(); ++i) out[i] = rpwb::nan_to_na(v[i]);
    return out;
  };
  Rcpp::IntegerVector fl(outputs);
  for (std::size_t i = 0; i < outputs; ++i) fl[i] = static_cast<int>(flags[i]);
  return Rcpp::List::create(Rcpp::Named("fit") = vec(fit), Rcpp::Named("se") = vec(se),
                            Rcpp::Named("lwr") = vec(lwr), Rcpp::Named("upr") = vec(upr),
                            Rcpp::Named("flags") = fl);
}
