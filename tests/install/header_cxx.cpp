// The C header compiled as C++ (C++11 and C++17, -Wall -Wextra -pedantic -Werror): its
// declarations get C linkage, so a C++ program links against the C library directly.
#include "powerback.h"

#include <cstdio>
#include <cstring>
#include <string>

int main() {
  const std::string want = std::to_string(PWB_VERSION_MAJOR) + "." +
                           std::to_string(PWB_VERSION_MINOR) + "." +
                           std::to_string(PWB_VERSION_PATCH);
  if (pwb_version_number() != static_cast<unsigned>(PWB_VERSION_NUMBER) ||
      want != pwb_version_string()) {
    std::fprintf(stderr, "header %s, library %s\n", want.c_str(), pwb_version_string());
    return 1;
  }
  pwb_spec* s = nullptr;
  const char text[] = "powerback-spec 1\ntransform name=\"x\" family=log shift=0 reflect=false\nend\n";
  if (pwb_spec_read(text, std::strlen(text), &s) != PWB_OK) return 2;
  pwb_transform* t = nullptr;
  if (pwb_spec_transform(s, 0, &t) != PWB_OK) return 3;
  const double x = 1.0;
  double z = -1.0;
  if (pwb_transform_apply(t, &x, 1, &z) != PWB_OK || z != 0.0) return 4;  // log 1 = 0
  pwb_transform_free(t);
  pwb_spec_free(s);
  std::printf("c++ header program ok: %s\n", pwb_version_string());
  return 0;
}
