// powerback/cancel.hpp — stopping a long computation from outside.
//
// A front end installs a check for the calling thread; the core's long loops (rank detection
// over many columns, the lambda searches, the leave-one-out passes) call poll_cancel() between
// steps, and when the check answers true the computation unwinds with Error(Cancelled). The
// core neither knows nor cares what the check looks at (a flag, a signal, an interpreter's
// interrupt state). A check must not throw; one that does is treated as asking to stop.
#pragma once

#include <functional>

namespace powerback {

// True when the computation should stop.
using CancelCheck = std::function<bool()>;

// Installs check for the calling thread (an empty function removes it) and returns the one it
// replaces. Other threads are unaffected.
CancelCheck set_cancel_check(CancelCheck check);

// Asks the calling thread's check, if any; throws Error(ErrorCode::Cancelled) when it says stop.
// Costs one branch when no check is installed.
void poll_cancel();

// Installs a check for the lifetime of the scope and restores the previous one after.
class CancelScope {
 public:
  explicit CancelScope(CancelCheck check) : previous_(set_cancel_check(std::move(check))) {}
  ~CancelScope() { set_cancel_check(std::move(previous_)); }
  CancelScope(const CancelScope&) = delete;
  CancelScope& operator=(const CancelScope&) = delete;

 private:
  CancelCheck previous_;
};

}  // namespace powerback
