// Shared machinery of the C ABI implementation: the per-thread error text and the guard that
// turns every C++ exception into a pwb_status. Nothing here is exported.
#pragma once

#include <cstring>
#include <exception>
#include <new>
#include <string>

#include "powerback.h"
#include "powerback/errors.hpp"

namespace powerback {
namespace capi {

void set_error(const std::string& message) noexcept;
void clear_error() noexcept;
pwb_status status_of(ErrorCode code) noexcept;

// Runs body (returning void); any exception becomes a status and this thread's error text.
template <class Body>
pwb_status guarded(Body&& body) noexcept {
  try {
    body();
    clear_error();
    return PWB_OK;
  } catch (const Error& e) {
    set_error(e.what());
    return status_of(e.code());
  } catch (const std::bad_alloc&) {
    set_error("out of memory");
    return PWB_ERR_MEMORY;
  } catch (const std::exception& e) {
    set_error(std::string("internal error: ") + e.what());
    return PWB_ERR_INTERNAL;
  } catch (...) {
    set_error("internal error: unknown exception");
    return PWB_ERR_INTERNAL;
  }
}

// Throws Error(Argument) when p is NULL.
inline void need(const void* p, const char* name) {
  if (!p) throw Error(ErrorCode::Argument, std::string(name) + " is NULL");
}
// NULL is allowed only for an empty array.
inline void need_array(const void* p, std::size_t n, const char* name) {
  if (!p && n > 0) throw Error(ErrorCode::Argument, std::string(name) + " is NULL but n > 0");
}
// A caller's struct must be at least as large as this version's.
inline void need_struct(std::size_t got, std::size_t want, const char* name) {
  if (got < want)
    throw Error(ErrorCode::Argument, std::string(name) + ".struct_size is " + std::to_string(got) +
                                         ", smaller than " + std::to_string(want) +
                                         ": set it to sizeof(" + name + ")");
}
// A caller's struct of type T (one with struct_size first): not NULL, and at least this
// version's size.
template <class T>
void need_sized(const T* p, const char* arg, const char* type) {
  need(p, arg);
  need_struct(p->struct_size, sizeof(T), type);
}

// A C caller may pass any int where an enum is declared; reading it as the C++ enum type would
// be undefined for values outside the enumerators, so its bytes are read as an int.
template <class E>
int enum_value(const E& e) noexcept {
  static_assert(sizeof(E) == sizeof(int), "C enums are int-sized");
  int v;
  std::memcpy(&v, &e, sizeof v);
  return v;
}

// The header's text convention: the full length (without NUL) to *needed when not NULL; at most
// cap bytes, NUL included, to buf (truncated text is still NUL-terminated). buf NULL asks only
// the length and needs cap 0: a NULL buf with cap > 0 throws Error(Argument).
void copy_text(const std::string& text, char* buf, std::size_t cap, std::size_t* needed);

}  // namespace capi
}  // namespace powerback
