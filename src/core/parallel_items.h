// parallel_items: runs work(item) for item = 0 .. count-1 on up to `threads` threads
// (0 = every hardware thread), handing items out one at a time in ascending order, so
// that callers can put their largest items first for balance. The calling thread works
// too. If a work call throws, the first exception is rethrown after all threads stop.
// No state outlives the call.
#pragma once
#include <cstddef>
#include <functional>

namespace manicule {

unsigned resolve_thread_count(unsigned requested);

void parallel_items(std::size_t count, unsigned threads,
                    const std::function<void(std::size_t)>& work);

}  // namespace manicule
