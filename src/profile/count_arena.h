// CountArena: memory for many segments' count lists that are all let go at once. An
// analysis of a large store holds each segment's counts only until its feature table is
// built; held as many small heap blocks among others, their memory stayed with the process
// after they were freed (glibc cannot hand back a heap page that still holds anything
// else), so the peak carried the counts through the whole nearest-segment search. Here
// they are cut from a few large blocks mapped for them alone, and release() unmaps those.
//
// Handing out is a bump of a pointer; a list given back alone (a vector that grows) is
// not reused, so fill each list at its final size. Not safe for use by two threads at once.
#pragma once
#include <cstddef>
#include <memory_resource>
#include <vector>

namespace manicule {

class CountArena final : public std::pmr::memory_resource {
 public:
  CountArena() = default;
  CountArena(const CountArena&) = delete;
  CountArena& operator=(const CountArena&) = delete;
  ~CountArena() override;

  // Unmaps every block. Lists cut from the arena must be empty (or gone) by then; the
  // arena itself stays usable and maps new blocks when asked again.
  void release();

  // Bytes mapped for lists now (what release() hands back).
  std::size_t mapped_bytes() const;

 private:
  void* do_allocate(std::size_t bytes, std::size_t alignment) override;
  void do_deallocate(void*, std::size_t, std::size_t) override {}  // all at once, by release()
  bool do_is_equal(const std::pmr::memory_resource& other) const noexcept override { return this == &other; }

  struct Block {
    char* data = nullptr;
    std::size_t size = 0;
  };
  std::vector<Block> blocks_;
  std::size_t used_ = 0;  // bytes handed out from the last block
};

}  // namespace manicule
