// Shared by the spec tests of the core: the parse error a text raises.
#pragma once

#include <catch2/catch.hpp>

#include <string>

#include "powerback/errors.hpp"
#include "powerback/spec.hpp"

namespace pwbtest {

// The message of the parse error `text` raises; "" when it parses.
inline std::string parse_error(const std::string& text) {
  try {
    powerback::parse_spec(text.data(), text.size());
  } catch (const powerback::Error& e) {
    CHECK(e.code() == powerback::ErrorCode::Parse);
    return e.what();
  }
  return "";
}

}  // namespace pwbtest
