#include "core/segment_index.h"

#include "core/analysis.h"

namespace manicule {

SegmentIndex::SegmentIndex(const std::vector<SegmentSummary>& segments) {
  positions_.reserve(segments.size());
  for (std::size_t i = 0; i < segments.size(); ++i) positions_.emplace(segments[i].id, i);
}

std::size_t SegmentIndex::find(std::string_view id) const {
  const auto it = positions_.find(id);
  return it == positions_.end() ? npos : it->second;
}

}  // namespace manicule
