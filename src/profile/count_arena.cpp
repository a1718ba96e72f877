#include "profile/count_arena.h"

#include <sys/mman.h>

#include <algorithm>
#include <cstdint>
#include <new>

#include "profile/large_matrix.h"

namespace manicule {

namespace {

// Blocks are whole huge pages (2 MiB, aligned), since fresh memory is dear on virtual
// machines and counts are written once, in order; they start at 4 MiB (of address
// space: a letter or two touches one page) and double up to 64 MiB, so the counts of
// 20,000 play segments (some 175 MB) take six blocks.
constexpr std::size_t kFirstBlock = std::size_t{4} << 20;
constexpr std::size_t kLargestBlock = std::size_t{64} << 20;

// `size` bytes (a multiple of kHugePageBytes) mapped at a multiple of kHugePageBytes: a
// larger mapping is cut down to the aligned part.
char* map_aligned(std::size_t size) {
  void* data = mmap(nullptr, size + kHugePageBytes, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
  if (data == MAP_FAILED) throw std::bad_alloc();
  const auto start = reinterpret_cast<std::uintptr_t>(data);
  const std::uintptr_t aligned = (start + kHugePageBytes - 1) & ~(kHugePageBytes - 1);
  if (aligned > start) munmap(data, aligned - start);
  const std::uintptr_t tail = start + kHugePageBytes - aligned;  // what is mapped beyond aligned + size
  if (tail > 0) munmap(reinterpret_cast<void*>(aligned + size), tail);
  advise_huge_pages(reinterpret_cast<void*>(aligned), size);  // the whole block: it is aligned
  return reinterpret_cast<char*>(aligned);
}

}  // namespace

CountArena::~CountArena() { release(); }

void CountArena::release() {
  for (const Block& b : blocks_) munmap(b.data, b.size);
  blocks_.clear();
  used_ = 0;
}

std::size_t CountArena::mapped_bytes() const {
  std::size_t bytes = 0;
  for (const Block& b : blocks_) bytes += b.size;
  return bytes;
}

void* CountArena::do_allocate(std::size_t bytes, std::size_t alignment) {
  if (!blocks_.empty()) {
    const Block& last = blocks_.back();
    const std::size_t start = (used_ + alignment - 1) / alignment * alignment;
    if (start <= last.size && bytes <= last.size - start) {
      used_ = start + bytes;
      return last.data + start;
    }
  }
  // A new block; what was left of the last one stays unused (a few KiB at most but for
  // a list larger than the rest of a block).
  std::size_t size = blocks_.empty() ? kFirstBlock : std::min(blocks_.back().size * 2, kLargestBlock);
  size = std::max(size, (bytes + kHugePageBytes - 1) / kHugePageBytes * kHugePageBytes);
  char* data = map_aligned(size);
  blocks_.push_back(Block{data, size});
  used_ = bytes;  // a block is aligned to 2 MiB, enough for any list
  return data;
}

}  // namespace manicule
