// Work started on a thread of its own, to overlap with what the caller does next; where the
// system grants no further thread (a process limit, as on a shared login node), the work is
// done when its result is asked for instead of aborting the run.
#pragma once
#include <future>
#include <system_error>
#include <utility>

namespace manicule {

template <typename Work>
auto start_side_task(Work&& work) {
  try {
    return std::async(std::launch::async, work);
  } catch (const std::system_error&) {
    return std::async(std::launch::deferred, std::forward<Work>(work));
  }
}

}  // namespace manicule
