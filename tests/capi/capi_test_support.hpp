// Helpers shared by the C ABI tests: handles freed at scope exit, the small model data set and
// a spec's written text.
#pragma once

#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "powerback.h"

namespace capitest {

// A response transform and a model fitted with it, both freed at scope exit.
struct ModelHandles {
  pwb_transform* t = nullptr;
  pwb_model* m = nullptr;
  ~ModelHandles() {
    pwb_model_free(m);
    pwb_transform_free(t);
  }
};

// A spec handle freed at scope exit.
struct SpecHandle {
  pwb_spec* s = nullptr;
  ~SpecHandle() { pwb_spec_free(s); }
};

// Ten invented rows: y grows roughly geometrically in x (a log model fits them well).
inline const std::vector<double> kX = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
inline const std::vector<double> kY = {2.7, 3.1, 4.9, 5.2, 8.8, 9.1, 15.2, 14.8, 25.0, 27.5};

// The text pwb_spec_write gives for s (size queried first).
inline std::string written(const pwb_spec* s) {
  size_t need = 0;
  REQUIRE(pwb_spec_write(s, nullptr, 0, &need) == PWB_OK);
  std::vector<char> buf(need + 1);
  REQUIRE(pwb_spec_write(s, buf.data(), buf.size(), nullptr) == PWB_OK);
  return std::string(buf.data());
}

}  // namespace capitest
