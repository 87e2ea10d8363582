// Transform apply / invert / log-derivative on any spec and values: no crash, statuses from the
// enumeration, PWB_OK only with finite outputs (or the documented -Inf boundary of the
// log-derivative), and invert(apply(x)) accepted or refused with a message, never garbage.
#include <cmath>

#include "fuzz_input.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwbfuzz::Input in(data, size);
  pwb_transform_spec spec;
  pwb_transform_spec_init(&spec);
  pwbfuzz::set_enum(spec.family, in.family_code());
  spec.lambda = in.value();
  spec.shift = in.byte() < 128 ? 0.0 : in.value();
  spec.reflect = in.byte() & 1;
  spec.pivot = in.value();
  pwb_transform* t = nullptr;
  const pwb_status made = pwb_transform_new(&spec, &t);
  pwbfuzz::check_status(made);
  if (made != PWB_OK) {
    if (t) pwbfuzz::fail("a failed pwb_transform_new left a handle");
    return 0;
  }
  const std::size_t n = in.size(32);
  const std::vector<double> x = in.values(n);
  std::vector<double> z(n), back(n), d(n);
  const pwb_status sa = pwb_transform_apply(t, x.data(), n, z.data());
  pwbfuzz::check_status(sa);
  if (sa == PWB_OK) {
    for (double v : z)
      if (!std::isfinite(v)) pwbfuzz::fail("apply returned PWB_OK with a non-finite value");
    const pwb_status si = pwb_transform_invert(t, z.data(), n, back.data());
    pwbfuzz::check_status(si);
    if (si == PWB_OK)
      for (double v : back)
        if (!std::isfinite(v)) pwbfuzz::fail("invert returned PWB_OK with a non-finite value");
  }
  const pwb_status sd = pwb_transform_log_derivative(t, x.data(), n, d.data());
  pwbfuzz::check_status(sd);
  if (sd == PWB_OK)
    for (double v : d)
      if (std::isnan(v) || v == INFINITY) pwbfuzz::fail("log-derivative PWB_OK with NaN or +Inf");
  // Inverting arbitrary values.
  const std::vector<double> w = in.values(in.size(8));
  std::vector<double> wb(w.size());
  pwbfuzz::check_status(pwb_transform_invert(t, w.data(), w.size(), wb.data()));
  char buf[64];
  std::size_t need = 0;
  for (int which = 0; which < 4; ++which)
    pwbfuzz::check_status(pwb_transform_describe(t, which, buf, sizeof buf, &need));
  pwb_transform_free(t);
  return 0;
}
