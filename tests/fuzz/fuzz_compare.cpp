// The comparison entry points on any data: Box-Tidwell, the leave-one-out lambda influence, the
// cross-validation folds, the hold-out scores and the fold predictions of fixed transforms. No
// crash, statuses from the enumeration, folds in 1..k, fold statuses from their enumeration.
#include <cmath>
#include <cstring>

#include "fuzz_input.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwbfuzz::Input in(data, size);
  // Lead bytes below 250 keep the first four branches' meaning for the stored corpus.
  const int lead = in.byte();
  const int which = lead >= 250 ? 4 : lead % 4;
  if (which == 0) {  // Box-Tidwell
    const std::size_t n = in.size(30), q = in.size(2), m = 1 + in.size(1);
    const std::vector<double> y = in.values(n), Z = in.values(n * q), X = in.values(n * m);
    pwb_box_tidwell_options opt;
    pwb_box_tidwell_options_init(&opt);
    opt.max_iter = in.byte() < 200 ? 1 + in.byte() % 20 : in.any_int();
    opt.tol = in.byte() < 200 ? 1e-6 : in.value();
    opt.max_abs_power = in.byte() < 200 ? 20 : in.value();
    std::vector<double> alpha(m), se(m), t(m), pv(m), hist(m * 64);
    pwb_box_tidwell_result r;
    r.struct_size = sizeof r;
    pwbfuzz::check_status(pwb_box_tidwell(y.data(), q ? Z.data() : nullptr, n, q, X.data(), m, &opt,
                                          alpha.data(), se.data(), t.data(), pv.data(), nullptr, &r));
  } else if (which == 1) {  // influence
    const std::size_t n = in.size(24), p = in.size(2);
    const std::vector<double> y = in.values(n), X = in.values(n * p);
    pwb_influence_options opt;
    pwb_influence_options_init(&opt);
    pwbfuzz::set_enum(opt.family, in.family_code());
    if (in.byte() & 1) {
      opt.lower = in.value();
      opt.upper = in.value();
    }
    pwb_influence_summary s;
    s.struct_size = sizeof s;
    std::vector<double> loo(n), lev(n);
    std::vector<int> outside(n), at(n);
    const pwb_status st = pwb_lambda_influence(y.data(), p ? X.data() : nullptr, n, p, &opt, &s,
                                               loo.data(), lev.data(), outside.data(), at.data());
    pwbfuzz::check_status(st);
    if (st == PWB_OK && s.n_outside > s.n) pwbfuzz::fail("more rows outside than rows");
  } else if (which == 2) {  // folds
    const std::size_t n = in.size(200);
    const int folds = in.byte() < 220 ? in.byte() % 12 : in.any_int();
    const int repeats = in.byte() < 220 ? in.byte() % 4 : in.any_int();
    unsigned long long seed = 0;
    for (int i = 0; i < 8; ++i) seed = (seed << 8) | in.byte();
    const std::size_t cap = n * (repeats > 0 && repeats < 4 ? static_cast<std::size_t>(repeats) : 1);
    std::vector<int> fold(cap + 1);
    const pwb_status st = pwb_cv_folds(n, folds, repeats > 0 && repeats < 4 ? repeats : 1, seed, fold.data());
    pwbfuzz::check_status(st);
    if (st == PWB_OK)
      for (std::size_t i = 0; i < cap; ++i)
        if (fold[i] < 1 || fold[i] > folds) pwbfuzz::fail("a fold outside 1..k");
  } else if (which == 4) {  // fold predictions of a fixed transform
    const std::size_t n = in.size(40), p = in.size(3);
    const std::vector<double> y = in.values(n), X = in.values(n * p), w = in.values(n);
    const int folds = in.byte() < 220 ? in.byte() % 6 : in.any_int();
    std::vector<int> fold(n);
    for (std::size_t i = 0; i < n; ++i)
      fold[i] = in.byte() < 240 ? 1 + static_cast<int>(i % (folds > 0 && folds < 6 ? folds : 1))
                                : in.any_int();
    pwb_transform* t = pwbfuzz::maybe_transform(in);
    pwb_cv_fixed_options opt;
    pwb_cv_fixed_options_init(&opt);
    opt.intercept = in.byte() < 200 ? 1 : 0;
    if (in.byte() < 40) opt.level = in.value();
    if (in.byte() & 1) opt.weights = w.data();
    const std::size_t k = folds > 0 && folds < 6 ? static_cast<std::size_t>(folds) : 1;
    std::vector<double> med(n), mean(n), lo(n), hi(n), sigma(k), coef(k * (p + 1));
    std::vector<unsigned> flags(n);
    std::vector<int> status(k, -1);
    std::vector<std::size_t> df(k);
    pwb_cv_fixed_result r;
    r.struct_size = sizeof r;
    r.median = med.data();
    r.mean = mean.data();
    r.lower = lo.data();
    r.upper = hi.data();
    r.flags = flags.data();
    // Per-fold outputs only where their length is known to fit.
    const bool per_fold = folds > 0 && folds < 6;
    r.fold_status = per_fold ? status.data() : nullptr;
    r.sigma = per_fold ? sigma.data() : nullptr;
    r.df_residual = per_fold ? df.data() : nullptr;
    r.coefficients = per_fold ? coef.data() : nullptr;
    const pwb_status st = pwb_cv_fixed_predict(y.data(), p ? X.data() : nullptr, n, p, t,
                                               fold.data(), folds, &opt, &r);
    pwb_transform_free(t);
    pwbfuzz::check_status(st);
    if (st == PWB_OK && per_fold)
      for (int v : status)
        if (v < PWB_CV_FOLD_OK || v > PWB_CV_FOLD_INVALID_TRAINING)
          pwbfuzz::fail("a fold status outside its enumeration");
  } else {  // hold-out scores
    const std::size_t n = in.size(40);
    const std::vector<double> y = in.values(n), fit = in.values(n), lo = in.values(n), hi = in.values(n);
    const bool interval = in.byte() & 1;
    pwb_holdout_scores s;
    s.struct_size = sizeof s;
    const pwb_status st = pwb_holdout_score(y.data(), fit.data(), interval ? lo.data() : nullptr,
                                            interval ? hi.data() : nullptr, n, &s);
    pwbfuzz::check_status(st);
    if (st == PWB_OK && s.n != n) pwbfuzz::fail("scored rows differ from the rows given");
  }
  return 0;
}
