// The chunked parallel loop: same result for every thread count, serial-equivalent errors, and
// the calling thread's cancel check reaching the other threads.
#include <atomic>
#include <catch2/catch.hpp>
#include <stdexcept>
#include <thread>
#include <vector>

#include "powerback/cancel.hpp"
#include "powerback/errors.hpp"
#include "powerback/parallel.hpp"

using powerback::parallel_for;

TEST_CASE("parallel_for visits every index once for any thread count and grain", "[parallel]") {
  for (unsigned threads : {0u, 1u, 2u, 3u, 8u}) {
    for (std::size_t grain : {std::size_t(0), std::size_t(1), std::size_t(7), std::size_t(1000)}) {
      std::vector<int> hits(523, 0);
      std::atomic<int> empty{0};  // Catch2 assertions are not thread-safe: count, assert after
      parallel_for(hits.size(), threads, grain, [&](std::size_t b, std::size_t e) {
        if (b >= e) ++empty;
        for (std::size_t i = b; i < e; ++i) hits[i] += 1;
      });
      CHECK(empty.load() == 0);
      for (int h : hits) REQUIRE(h == 1);
    }
  }
  int calls = 0;
  parallel_for(0, 4, 0, [&](std::size_t, std::size_t) { ++calls; });
  CHECK(calls == 0);
}

TEST_CASE("parallel_for rethrows the lowest failing chunk's error, as a serial loop would",
          "[parallel]") {
  for (unsigned threads : {1u, 2u, 4u}) {
    std::string what;
    try {
      parallel_for(100, threads, 1, [&](std::size_t b, std::size_t) {
        if (b == 37 || b == 80) throw std::runtime_error("item " + std::to_string(b));
      });
    } catch (const std::runtime_error& e) {
      what = e.what();
    }
    CHECK(what == "item 37");
  }
}

TEST_CASE("parallel_for passes the caller's cancellation to the other threads", "[parallel]") {
  // The other thread's item never ends unless it is told to stop; the calling thread's first
  // item asks its own check to stop. So the call can only return through the cancellation
  // reaching the other thread (a hang here is the failure).
  const std::thread::id caller = std::this_thread::get_id();
  std::atomic<bool> flag{false};
  std::atomic<int> caller_items{0};
  powerback::CancelScope scope([&] { return flag.load(); });
  bool cancelled = false;
  try {
    parallel_for(1000, 2, 1, [&](std::size_t, std::size_t) {
      if (std::this_thread::get_id() == caller) {
        ++caller_items;
        flag.store(true);
        powerback::poll_cancel();
        return;
      }
      for (;;) {
        powerback::poll_cancel();
        std::this_thread::yield();
      }
    });
  } catch (const powerback::Error& e) {
    cancelled = e.code() == powerback::ErrorCode::Cancelled;
  }
  CHECK(cancelled);
  CHECK(caller_items.load() == 1);
}
