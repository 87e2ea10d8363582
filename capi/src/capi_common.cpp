// Version, status names, per-thread error text, family names.
#include "capi_internal.hpp"
#include "powerback/cancel.hpp"
#include "powerback/transform.hpp"

#define PWB_STR2(x) #x
#define PWB_STR(x) PWB_STR2(x)

namespace powerback {
namespace capi {
namespace {
thread_local std::string g_last_error;
}

void set_error(const std::string& message) noexcept {
  try {
    g_last_error = message;
  } catch (...) {
    g_last_error.clear();  // an allocation failure leaves the text empty rather than throwing
  }
}

void clear_error() noexcept { g_last_error.clear(); }

pwb_status status_of(ErrorCode code) noexcept {
  switch (code) {
    case ErrorCode::Argument: return PWB_ERR_ARGUMENT;
    case ErrorCode::Domain: return PWB_ERR_DOMAIN;
    case ErrorCode::NonFinite: return PWB_ERR_NONFINITE;
    case ErrorCode::Singular: return PWB_ERR_SINGULAR;
    case ErrorCode::Convergence: return PWB_ERR_CONVERGENCE;
    case ErrorCode::Parse: return PWB_ERR_PARSE;
    case ErrorCode::Memory: return PWB_ERR_MEMORY;
    case ErrorCode::Internal: return PWB_ERR_INTERNAL;
    case ErrorCode::Cancelled: return PWB_ERR_CANCELLED;
  }
  return PWB_ERR_INTERNAL;
}

void copy_text(const std::string& text, char* buf, std::size_t cap, std::size_t* needed) {
  if (buf == nullptr && cap > 0)
    throw Error(ErrorCode::Argument, "buf is NULL but cap is " + std::to_string(cap) +
                                         "; pass cap = 0 with a NULL buf to ask the length");
  if (needed) *needed = text.size();
  if (buf && cap > 0) {
    const std::size_t k = text.size() < cap - 1 ? text.size() : cap - 1;
    std::memcpy(buf, text.data(), k);
    buf[k] = '\0';
  }
}

}  // namespace capi
}  // namespace powerback

using namespace powerback;

extern "C" {

unsigned pwb_version_number(void) { return PWB_VERSION_NUMBER; }

const char* pwb_version_string(void) {
  return PWB_STR(PWB_VERSION_MAJOR) "." PWB_STR(PWB_VERSION_MINOR) "." PWB_STR(PWB_VERSION_PATCH);
}

const char* pwb_status_name(pwb_status s) {
  switch (s) {
    case PWB_OK: return "PWB_OK";
    case PWB_ERR_ARGUMENT: return "PWB_ERR_ARGUMENT";
    case PWB_ERR_DOMAIN: return "PWB_ERR_DOMAIN";
    case PWB_ERR_NONFINITE: return "PWB_ERR_NONFINITE";
    case PWB_ERR_SINGULAR: return "PWB_ERR_SINGULAR";
    case PWB_ERR_CONVERGENCE: return "PWB_ERR_CONVERGENCE";
    case PWB_ERR_PARSE: return "PWB_ERR_PARSE";
    case PWB_ERR_MEMORY: return "PWB_ERR_MEMORY";
    case PWB_ERR_INTERNAL: return "PWB_ERR_INTERNAL";
    case PWB_ERR_CANCELLED: return "PWB_ERR_CANCELLED";
  }
  return "PWB_UNKNOWN_STATUS";
}

const char* pwb_last_error(void) { return capi::g_last_error.c_str(); }

void pwb_set_interrupt_check(pwb_interrupt_check check, void* user) {
  // Installing cannot fail short of memory for a small closure; then the thread keeps no check.
  try {
    if (check)
      set_cancel_check([check, user]() { return check(user) != 0; });
    else
      set_cancel_check(CancelCheck());
  } catch (...) {
    set_cancel_check(CancelCheck());
  }
}

const char* pwb_family_name(pwb_family f) {
  const int code = capi::enum_value(f);
  return family_is_valid(code) ? family_name(static_cast<Family>(code)) : "unknown";
}

pwb_status pwb_family_from_name(const char* name, pwb_family* out) {
  return capi::guarded([&] {
    capi::need(name, "name");
    capi::need(out, "out");
    *out = static_cast<pwb_family>(family_from_name(name));
  });
}

}  // extern "C"
