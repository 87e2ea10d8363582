// powerback/parallel.hpp — splitting independent work items over a few threads.
//
// The core stays single-threaded unless a caller asks for more: every entry point that can use
// threads takes a thread count, and 0 or 1 means "run on the calling thread only". Work items
// must write to disjoint places chosen by their index, so the result never depends on the thread
// count or on the order in which items finish.
//
// Errors and cancellation behave as in a serial run:
// - when items throw, the exception of the lowest-numbered failing chunk is rethrown after every
//   thread has joined (a serial loop would have met that one first); chunks after it are skipped;
// - the calling thread's cancel check (cancel.hpp) is asked between chunks; when it asks to stop,
//   the other threads stop at their next poll_cancel() and Error(Cancelled) is rethrown.
#pragma once

#include <cstddef>
#include <functional>

namespace powerback {

// Runs body(begin, end) over [0, n) in contiguous chunks of `grain` items (the last may be
// shorter), on min(threads, chunk count) threads including the calling one. grain 0 picks
// about four chunks per thread. With threads <= 1 the chunks run in order on the calling thread.
void parallel_for(std::size_t n, unsigned threads, std::size_t grain,
                  const std::function<void(std::size_t begin, std::size_t end)>& body);

// The number of hardware threads, at least 1.
unsigned hardware_threads();

}  // namespace powerback
