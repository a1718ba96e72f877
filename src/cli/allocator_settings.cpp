#include "cli/allocator_settings.h"

#include <malloc.h>
#include <unistd.h>

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <mutex>
#include <vector>

#include "core/worker_start.h"
#include "profile/large_matrix.h"

namespace manicule::cli {

namespace {

constexpr std::size_t kTopPad = std::size_t{16} << 20;

// advise_huge_pages (profile/large_matrix.h) over [begin, end), given as addresses.
void advise_range(std::uintptr_t begin, std::uintptr_t end) {
  if (end > begin) advise_huge_pages(reinterpret_cast<void*>(begin), end - begin);
}

}  // namespace

void keep_freed_memory_for_reuse() {
  // glibc's defaults: blocks from 128 KiB up are mapped on their own (the threshold then
  // drifts with what is freed), and the heap is trimmed when 128 KiB lie free at its top.
  // Measured over the play corpus (bench/RESULTS.md): a fifth fewer page faults and 1-5%
  // less CPU, peak memory within a few MiB.
  mallopt(M_MMAP_THRESHOLD, 32 << 20);
  mallopt(M_TRIM_THRESHOLD, 128 << 20);
  mallopt(M_TOP_PAD, static_cast<int>(kTopPad));
}

void back_main_heap_with_huge_pages() {
  // One growth of the heap, by a block just larger than what its top holds plus a top pad
  // of 90 MiB, so that the whole range is new and nothing in it has been written before the
  // advice (a page written first would keep its 2 MiB to small pages). Freed, the range
  // stays in the heap as free space (the trim threshold is 128 MiB).
  constexpr std::size_t kReserve = std::size_t{90} << 20;
  mallopt(M_TOP_PAD, static_cast<int>(kReserve));
  const std::size_t request = mallinfo2().keepcost + 4096;
  void* trigger = std::malloc(request);
  if (trigger) {
    // The trigger's own pages and the header written after it lie below the range (whose
    // ends advise_huge_pages rounds inwards to whole huge pages).
    advise_range(reinterpret_cast<std::uintptr_t>(trigger) + request + 64,
                 reinterpret_cast<std::uintptr_t>(sbrk(0)));
  }
  std::free(trigger);
  mallopt(M_TOP_PAD, static_cast<int>(kTopPad));
}

namespace {

// glibc gives a thread that is not the main one an arena of its own, in heaps of
// HEAP_MAX_SIZE bytes aligned to that size (malloc/arena.c: 2 * DEFAULT_MMAP_THRESHOLD_MAX,
// 64 MiB on 64-bit; heap_for_ptr finds a block's heap by that alignment), mapped at once
// and made writable as it fills. The arena's headers come first.
constexpr std::uintptr_t kThreadHeapBytes = std::uintptr_t{64} << 20;
// A block this close to its heap's start is among the first of a new arena.
constexpr std::uintptr_t kFreshArena = std::uintptr_t{64} << 10;
// How far a thread's heap is made writable at once (below the 32 MiB mapping threshold).
constexpr std::size_t kThreadHeapGrowth = std::size_t{30} << 20;

// The heaps advised so far. A thread that ends leaves its arena to the next thread started
// (the analysis starts threads for each of its steps), which must not advise it again and
// above all not keep another 2 MiB of it out of use.
std::mutex advised_mutex;
std::vector<std::uintptr_t> advised_heaps;  // one per arena: a handful

bool first_advice_for(std::uintptr_t heap) {
  std::lock_guard<std::mutex> lock(advised_mutex);
  if (std::find(advised_heaps.begin(), advised_heaps.end(), heap) != advised_heaps.end()) return false;
  advised_heaps.push_back(heap);
  return true;
}

void advise_this_threads_heap() {
  void* probe = std::malloc(1);  // creates the thread's arena if it has none yet
  if (!probe) return;
  const auto at = reinterpret_cast<std::uintptr_t>(probe);
  const std::uintptr_t heap = at & ~(kThreadHeapBytes - 1);
  // Below the program break: the main heap (glibc's arenas ran out), advised already.
  if (at < reinterpret_cast<std::uintptr_t>(sbrk(0)) || !first_advice_for(heap)) {
    std::free(probe);
    return;
  }
  advise_range(heap, heap + kThreadHeapBytes);
  // The heap's first 2 MiB were written before the advice (glibc's headers, the probe) and
  // stay in small pages: in a new arena, a block filling them, never freed and never
  // written, keeps the thread's memory out of them (it costs address space, not memory).
  // Then the heap is made writable 30 MiB further at once, so that its growth does not
  // leave the 2 MiB at its end half writable, which would also give them small pages.
  // (Through volatile pointers: a compiler may drop a block that is never read, and does.)
  const std::uintptr_t filler_at = at + 32;  // the probe's 32-byte block ends at + 16
  const std::uintptr_t first_huge = heap + kHugePageBytes;
  if (at - heap < kFreshArena && first_huge > filler_at + 4096) {
    void* volatile never_freed = std::malloc(first_huge - filler_at - 64);
    (void)never_freed;
  }
  void* volatile growth = std::malloc(kThreadHeapGrowth);
  std::free(growth);
  std::free(probe);
}

}  // namespace

void back_thread_heaps_with_huge_pages() { set_worker_start(&advise_this_threads_heap); }

}  // namespace manicule::cli
