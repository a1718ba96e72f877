// SegmentIndex: finds a run's segments by id in constant time. Looking each id up by a
// scan of all segments made matching a run's table rows and left-out segments to its
// segments quadratic: over all plays by speaker (16,563 segments, 14,579 left out) that
// scan was some 5 % of a distances run, and it grows with the square of an archive.
#pragma once
#include <cstddef>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace manicule {

struct SegmentSummary;

class SegmentIndex {
 public:
  // Indexes `segments` by id; the first of equal ids is kept. The views point into the
  // segments' ids, so the index must not outlive them or see them change.
  explicit SegmentIndex(const std::vector<SegmentSummary>& segments);
  // The position of the segment with this id, or npos.
  std::size_t find(std::string_view id) const;
  static constexpr std::size_t npos = std::string::npos;

 private:
  std::unordered_map<std::string_view, std::size_t> positions_;
};

}  // namespace manicule
