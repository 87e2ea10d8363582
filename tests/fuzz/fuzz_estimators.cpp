// The estimators on any sample and options: lambda (univariate and response), its profile,
// moments, Shapiro-Wilk, the ladder and the screen. No crash and statuses from the enumeration;
// an accepted lambda lies in the search range.
#include <cmath>

#include "fuzz_input.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwbfuzz::Input in(data, size);
  const std::size_t n = in.size(48);
  const std::vector<double> x = in.values(n);
  const pwb_family fam = in.family();
  pwb_lambda_options opt;
  pwb_lambda_options_init(&opt);
  if (in.byte() & 1) {
    opt.lower = in.value();
    opt.upper = in.value();
    opt.level = in.byte() < 200 ? 0.5 + in.byte() / 520.0 : in.value();
  }
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  const pwb_status s1 = pwb_estimate_lambda(x.data(), n, fam, &opt, &r);
  pwbfuzz::check_status(s1);
  if (s1 == PWB_OK && !(r.lambda >= opt.lower && r.lambda <= opt.upper))
    pwbfuzz::fail("lambda outside the search range");

  const std::size_t p = in.size(3);
  const std::vector<double> X = in.values(n * p);
  pwb_lambda_result_init(&r);
  const pwb_status s2 = pwb_estimate_response_lambda(x.data(), p ? X.data() : nullptr, n, p, fam, &opt, &r);
  pwbfuzz::check_status(s2);
  if (s2 == PWB_OK && !(r.lambda >= opt.lower && r.lambda <= opt.upper))
    pwbfuzz::fail("response lambda outside the search range");

  const std::vector<double> grid = in.values(in.size(4));
  std::vector<double> ll(grid.size());
  pwbfuzz::check_status(pwb_lambda_profile(x.data(), n, fam, grid.data(), grid.size(), ll.data()));

  pwb_moments m;
  pwb_moments_init(&m);
  pwbfuzz::check_status(pwb_sample_moments(x.data(), n, &m));
  pwb_normality_result w;
  pwb_normality_result_init(&w);
  pwbfuzz::check_status(pwb_shapiro_wilk(x.data(), n, &w));
  pwb_transform_spec lspec;
  pwb_transform_spec_init(&lspec);
  pwb_ladder_info info;
  pwb_ladder_info_init(&info);
  pwbfuzz::check_status(pwb_ladder_recommend(x.data(), n, &lspec, &info));
  pwb_screen_options so;
  pwb_screen_options_init(&so);
  so.lower = opt.lower;
  so.upper = opt.upper;
  so.level = opt.level;
  pwb_screen_result sr;
  pwb_screen_result_init(&sr);
  pwbfuzz::check_status(pwb_screen_variable(x.data(), n, &so, &sr));
  return 0;
}
