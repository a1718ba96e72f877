#include "core/parallel_items.h"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <system_error>
#include <thread>
#include <vector>

#include "core/worker_start.h"

namespace manicule {

unsigned resolve_thread_count(unsigned requested) {
  if (requested > 0) return requested;
  return std::max(1u, std::thread::hardware_concurrency());
}

void parallel_items(std::size_t count, unsigned threads,
                    const std::function<void(std::size_t)>& work) {
  const std::size_t helpers =
      std::min<std::size_t>(resolve_thread_count(threads), std::max<std::size_t>(count, 1)) - 1;
  std::atomic<std::size_t> next{0};
  std::exception_ptr first_error;
  std::mutex error_mutex;
  auto run = [&] {
    for (std::size_t item = next++; item < count; item = next++) {
      try {
        work(item);
      } catch (...) {
        std::lock_guard<std::mutex> lock(error_mutex);
        if (!first_error) first_error = std::current_exception();
        next = count;  // stop handing out work
      }
    }
  };
  std::vector<std::thread> pool;
  pool.reserve(helpers);
  for (std::size_t t = 0; t < helpers; ++t) {
    try {
      pool.emplace_back([&] {
        on_worker_start();
        run();
      });
    } catch (const std::system_error&) {
      break;  // the system grants no more threads: the ones running, and this one, do the work
    }
  }
  run();
  for (std::thread& thread : pool) thread.join();
  if (first_error) std::rethrow_exception(first_error);
}

}  // namespace manicule
