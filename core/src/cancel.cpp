// The per-thread cancellation check (see cancel.hpp).
#include "powerback/cancel.hpp"

#include <utility>

#include "powerback/errors.hpp"

namespace powerback {
namespace {
thread_local CancelCheck t_check;
}  // namespace

CancelCheck set_cancel_check(CancelCheck check) {
  CancelCheck previous = std::move(t_check);
  t_check = std::move(check);
  return previous;
}

void poll_cancel() {
  if (!t_check) return;
  bool stop = true;
  try {
    stop = t_check();
  } catch (...) {
    stop = true;
  }
  if (stop) throw Error(ErrorCode::Cancelled, "the computation was cancelled by the caller");
}

}  // namespace powerback
