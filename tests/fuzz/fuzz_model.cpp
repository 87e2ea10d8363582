// Model fit and predict on any data, response transform and options: no crash, statuses from
// the enumeration, a fitted model's getters work, and predictions with PWB_OK are written for
// every row (NaN only for rows flagged missing, bounded or overflowed).
#include <cmath>
#include <cstring>

#include "fuzz_input.hpp"

namespace {
template <class E>
E valid_enum(int code) {
  return static_cast<E>(code);  // code within the enumerators
}
}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwbfuzz::Input in(data, size);
  const std::size_t n = in.size(40), p = in.size(3);
  const std::vector<double> y = in.values(n), X = in.values(n * p);
  pwb_transform* t = pwbfuzz::maybe_transform(in);
  pwb_model_options mo;
  pwb_model_options_init(&mo);
  mo.intercept = in.byte() < 200 ? 1 : 0;
  mo.estimated_parameters = in.size(2);
  pwb_model* m = nullptr;
  const pwb_status st = pwb_model_fit(y.data(), p ? X.data() : nullptr, n, p, t, &mo, &m);
  pwbfuzz::check_status(st);
  pwb_transform_free(t);
  if (st != PWB_OK) {
    if (m) pwbfuzz::fail("a failed fit left a handle");
    return 0;
  }
  pwb_model_info info;
  info.struct_size = sizeof info;
  pwbfuzz::check_status(pwb_model_get_info(m, &info));
  if (info.rank == 0 || info.rank > info.columns || info.df_residual + info.rank != info.n)
    pwbfuzz::fail("inconsistent model info");
  std::vector<double> coef(info.columns), se(info.columns), v(n);
  std::vector<int> aliased(info.columns);
  pwbfuzz::check_status(pwb_model_coefficients(m, coef.data(), se.data(), aliased.data(), info.columns));
  for (int which = 0; which < 4; ++which)
    pwbfuzz::check_status(pwb_model_vector_get(m, valid_enum<pwb_model_vector>(which), v.data(), n));

  const std::size_t rows = in.size(8);
  const std::vector<double> Xnew = in.values(rows * p);
  pwb_predict_options po;
  pwb_predict_options_init(&po);
  po.level = in.byte() < 220 ? 0.5 + in.byte() / 520.0 : in.value();
  pwbfuzz::set_enum(po.interval, in.byte() < 240 ? in.byte() % 3 : in.any_int());
  pwbfuzz::set_enum(po.center, in.byte() < 240 ? in.byte() % 2 : in.any_int());
  pwbfuzz::set_enum(po.mean_method, in.byte() < 240 ? in.byte() % 2 : in.any_int());
  po.transformed_scale = in.byte() & 1;
  std::vector<double> fit(rows), lwr(rows), upr(rows);
  std::vector<unsigned> flags(rows);
  const pwb_status sp = pwb_model_predict(m, rows && p ? Xnew.data() : nullptr, rows, p, &po, fit.data(),
                                          lwr.data(), upr.data(), flags.data());
  pwbfuzz::check_status(sp);
  if (sp == PWB_OK)
    for (std::size_t i = 0; i < rows; ++i)
      if (std::isnan(fit[i]) && !(flags[i] & (PWB_PRED_MISSING | PWB_PRED_BOUNDED | PWB_PRED_OVERFLOW)) &&
          std::isfinite(info.sigma))
        pwbfuzz::fail("a prediction is NaN without a flag");
  pwb_residual_checks rc;
  pwb_residual_checks_init(&rc);
  pwbfuzz::check_status(pwb_model_residual_checks(m, &rc));
  pwb_model_free(m);
  return 0;
}
