// Chunked parallel loop with serial-equivalent errors and cancellation (see parallel.hpp).
#include "powerback/parallel.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"

namespace powerback {

unsigned hardware_threads() {
  const unsigned h = std::thread::hardware_concurrency();
  return h == 0 ? 1u : h;
}

void parallel_for(std::size_t n, unsigned threads, std::size_t grain,
                  const std::function<void(std::size_t, std::size_t)>& body) {
  if (n == 0) return;
  const unsigned want = std::max(1u, threads);
  if (grain == 0) grain = std::max<std::size_t>(1, n / (4 * static_cast<std::size_t>(want)));
  const std::size_t chunks = (n + grain - 1) / grain;
  const unsigned used = static_cast<unsigned>(std::min<std::size_t>(want, chunks));
  if (used <= 1) {
    for (std::size_t c = 0; c < chunks; ++c) {
      poll_cancel();
      body(c * grain, std::min(n, (c + 1) * grain));
    }
    return;
  }

  std::atomic<std::size_t> next{0};
  std::atomic<bool> stop{false};                  // cancellation seen by the calling thread
  std::atomic<std::size_t> first_fail{chunks};    // lowest failing chunk so far
  std::mutex mutex;
  std::exception_ptr fail_error;                  // the exception of chunk first_fail
  std::exception_ptr cancel_error;

  auto record = [&](std::size_t c, std::exception_ptr e) {
    std::lock_guard<std::mutex> lock(mutex);
    if (c < first_fail.load()) {
      first_fail.store(c);
      fail_error = std::move(e);
    }
  };
  // Runs chunks until none is left; `caller` is true on the calling thread, which alone asks the
  // installed cancel check.
  auto work = [&](bool caller) {
    for (;;) {
      if (stop.load()) return;
      const std::size_t c = next.fetch_add(1);
      if (c >= chunks || c > first_fail.load()) return;
      try {
        if (caller) poll_cancel();
        body(c * grain, std::min(n, (c + 1) * grain));
      } catch (const Error& e) {
        if (caller && e.code() == ErrorCode::Cancelled) {
          std::lock_guard<std::mutex> lock(mutex);
          if (!cancel_error) cancel_error = std::current_exception();
          stop.store(true);
          return;
        }
        if (stop.load() && e.code() == ErrorCode::Cancelled) return;
        record(c, std::current_exception());
      } catch (...) {
        record(c, std::current_exception());
      }
    }
  };

  std::vector<std::thread> pool;
  pool.reserve(used - 1);
  try {
    for (unsigned t = 1; t < used; ++t)
      pool.emplace_back([&] {
        // The other threads stop when the calling thread has been asked to.
        CancelScope scope([&] { return stop.load(); });
        work(false);
      });
  } catch (...) {
    // Could not start a thread: finish with the ones that did start (the caller works too).
  }
  work(true);
  for (auto& t : pool) t.join();
  if (cancel_error) std::rethrow_exception(cancel_error);
  if (fail_error) std::rethrow_exception(fail_error);
}

}  // namespace powerback
