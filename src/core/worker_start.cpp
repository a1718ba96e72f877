#include "core/worker_start.h"

#include <atomic>

namespace manicule {

namespace {
std::atomic<WorkerStart> worker_start{nullptr};
}  // namespace

void set_worker_start(WorkerStart start) { worker_start.store(start, std::memory_order_release); }

void on_worker_start() {
  if (const WorkerStart start = worker_start.load(std::memory_order_acquire)) start();
}

}  // namespace manicule
