// Reads a fuzzer's bytes as the arguments of C ABI calls. Every read succeeds: past the end of
// the data it returns zeros, so any byte string is a valid input.
#pragma once

#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <vector>

#include "powerback.h"

namespace pwbfuzz {

class Input {
 public:
  Input(const std::uint8_t* data, std::size_t size) : p_(data), end_(data + size) {}

  std::uint8_t byte() { return p_ < end_ ? *p_++ : 0; }
  std::size_t left() const { return static_cast<std::size_t>(end_ - p_); }

  // A size in [0, max].
  std::size_t size(std::size_t max) { return byte() % (max + 1); }

  // Any int, out-of-range enum values included.
  int any_int() {
    std::uint32_t u = 0;
    for (int i = 0; i < 4; ++i) u = (u << 8) | byte();
    int v;
    std::memcpy(&v, &u, sizeof v);
    return v;
  }

  // A double: mostly ordinary values (so that the computations go deep), sometimes any bit
  // pattern (NaN, infinities, subnormals, 1e308).
  double value() {
    const std::uint8_t tag = byte();
    if (tag < 200) return (static_cast<double>(tag) - 100.0) / 8.0 + static_cast<double>(byte()) / 256.0;
    if (tag < 240) return 1.0 + static_cast<double>(byte()) + static_cast<double>(byte()) / 64.0;
    return raw();
  }
  double raw() {
    std::uint64_t u = 0;
    for (int i = 0; i < 8; ++i) u = (u << 8) | byte();
    double d;
    std::memcpy(&d, &u, sizeof d);
    return d;
  }
  std::vector<double> values(std::size_t n) {
    std::vector<double> v(n);
    for (double& d : v) d = value();
    return v;
  }

  // A family code: usually a valid one, sometimes any int.
  int family_code() {
    const std::uint8_t tag = byte();
    return tag < 230 ? tag % 10 : any_int();
  }
  // A valid family, for parameters passed by value (loading an out-of-range value into an enum
  // variable is itself undefined in C++, so only struct fields get arbitrary codes).
  pwb_family family() { return static_cast<pwb_family>(byte() % 10); }

 private:
  const std::uint8_t* p_;
  const std::uint8_t* end_;
};

// A broken invariant: print it and abort, so the fuzzer records the input.
[[noreturn]] inline void fail(const char* what) {
  std::fprintf(stderr, "invariant broken: %s (last error: %s)\n", what, pwb_last_error());
  std::abort();
}

// Every status a call returns is one of the enumerators, and a failure has a message.
inline void check_status(pwb_status st) {
  int code;
  std::memcpy(&code, &st, sizeof code);
  if (code < PWB_OK || code > PWB_ERR_CANCELLED) fail("status outside the enumeration");
  if (st == PWB_ERR_INTERNAL) fail("PWB_ERR_INTERNAL (an exception the library did not expect)");
  if (st != PWB_OK && pwb_last_error()[0] == '\0') fail("a failure without a message");
}

// Writes any int into an enum field through its bytes, as a C caller may.
template <class E>
void set_enum(E& field, int code) {
  static_assert(sizeof(E) == sizeof(int), "C enums are int-sized");
  std::memcpy(&field, &code, sizeof code);
}

// A response transform from the input, or NULL (none, or a spec the library refused): one
// byte says whether, then a family code (any int) and a power. The caller frees it.
inline pwb_transform* maybe_transform(Input& in) {
  pwb_transform* t = nullptr;
  if (in.byte() & 1) {
    pwb_transform_spec s;
    pwb_transform_spec_init(&s);
    set_enum(s.family, in.family_code());
    s.lambda = in.value();
    if (pwb_transform_new(&s, &t) != PWB_OK) t = nullptr;
  }
  return t;
}

}  // namespace pwbfuzz
