#include "cli/allocator_settings.h"

#include <malloc.h>

#include <cstddef>
#include <cstdlib>

#include "profile/large_matrix.h"

namespace manicule::cli {

void keep_freed_memory_for_reuse() {
  // glibc's defaults: blocks from 128 KiB up are mapped on their own (the threshold then
  // drifts with what is freed), and the heap is trimmed when 128 KiB lie free at its top.
  // Measured over the play corpus (bench/RESULTS.md): a fifth fewer page faults and 1-5%
  // less CPU, peak memory within a few MiB.
  mallopt(M_MMAP_THRESHOLD, 32 << 20);
  mallopt(M_TRIM_THRESHOLD, 128 << 20);
  mallopt(M_TOP_PAD, 16 << 20);
}

void back_main_heap_with_huge_pages() {
  // Two blocks below the 32 MiB mapping threshold, so both come from the heap's top, one
  // after the other; freed, they stay there as free space (the trim threshold is 128 MiB)
  // and later allocations are carved from the advised range.
  constexpr std::size_t kBlock = std::size_t{30} << 20;
  void* first = std::malloc(kBlock);
  void* second = std::malloc(kBlock);
  for (void* block : {first, second})
    if (block) advise_huge_pages(block, kBlock);
  std::free(second);
  std::free(first);
}

}  // namespace manicule::cli
