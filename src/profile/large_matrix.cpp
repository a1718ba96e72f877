#include "profile/large_matrix.h"

#include <sys/mman.h>

#include <cstdint>

namespace manicule {

void advise_huge_pages(void* data, std::size_t bytes) {
  constexpr std::uintptr_t kHuge = kHugePageBytes;
  if (bytes < 2 * kHuge) return;
  const auto begin = (reinterpret_cast<std::uintptr_t>(data) + kHuge - 1) & ~(kHuge - 1);
  const auto end = (reinterpret_cast<std::uintptr_t>(data) + bytes) & ~(kHuge - 1);
  if (end > begin) madvise(reinterpret_cast<void*>(begin), end - begin, MADV_HUGEPAGE);  // advice only
}

}  // namespace manicule
