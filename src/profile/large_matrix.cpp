#include "profile/large_matrix.h"

#include <sys/mman.h>

#include <cstdint>

namespace manicule {

void advise_huge_pages(void* data, std::size_t bytes) {
  if (bytes < 2 * kHugePageBytes) return;
  const auto begin = (reinterpret_cast<std::uintptr_t>(data) + kHugePageBytes - 1) & ~(kHugePageBytes - 1);
  const auto end = (reinterpret_cast<std::uintptr_t>(data) + bytes) & ~(kHugePageBytes - 1);
  if (end > begin) madvise(reinterpret_cast<void*>(begin), end - begin, MADV_HUGEPAGE);  // advice only
}

}  // namespace manicule
