// The spec reader on any text: no crash, and what it accepts writes back, reads again and writes
// the same bytes (write -> read -> write is bit-identical).
#include <string>

#include "fuzz_input.hpp"

namespace {
std::string write(const pwb_spec* s) {
  std::size_t need = 0;
  pwbfuzz::check_status(pwb_spec_write(s, nullptr, 0, &need));
  std::string out(need + 1, '\0');
  if (pwb_spec_write(s, &out[0], out.size(), &need) != PWB_OK) pwbfuzz::fail("spec write");
  out.resize(need);
  return out;
}
}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwb_spec* s = nullptr;
  const pwb_status st = pwb_spec_read(reinterpret_cast<const char*>(data), size, &s);
  pwbfuzz::check_status(st);
  if (st != PWB_OK) {
    if (s) pwbfuzz::fail("a failed read left a handle");
    return 0;
  }
  const std::string first = write(s);
  pwb_spec* again = nullptr;
  if (pwb_spec_read(first.data(), first.size(), &again) != PWB_OK) pwbfuzz::fail("re-read of a written spec");
  const std::string second = write(again);
  if (first != second) pwbfuzz::fail("write -> read -> write changed the text");
  std::size_t count = 0;
  pwbfuzz::check_status(pwb_spec_count(again, &count));
  for (std::size_t i = 0; i < count; ++i) {
    pwb_transform* t = nullptr;
    pwbfuzz::check_status(pwb_spec_transform(again, i, &t));
    pwb_transform_free(t);
  }
  pwb_spec_free(again);
  pwb_spec_free(s);
  return 0;
}
