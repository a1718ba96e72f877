// CountProfile: raw feature counts per segment for one run, with the vocabulary that names
// the features. Sparse: a segment lists only the features it contains. This is what
// ProfileBuilder produces and what a FeatureSpace selects from.
#pragma once
#include <cstddef>
#include <cstdint>
#include <memory>
#include <memory_resource>
#include <string>
#include <utility>
#include <vector>

#include "profile/count_arena.h"
#include "profile/feature_spec.h"
#include "profile/vocabulary.h"

namespace manicule {

// One segment's counts: (feature id, count) pairs. A polymorphic-allocator vector, so
// that a loader of many segments can cut them all from one CountArena; lists built one
// by one (ProfileBuilder) use the ordinary heap.
using CountEntries = std::pmr::vector<std::pair<FeatureId, std::uint32_t>>;

struct SegmentCounts {
  std::string id;
  std::size_t tokens = 0;         // words in the segment (what the minimum size is about)
  std::size_t feature_total = 0;  // occurrences of all features: the denominator of
                                  // relative frequencies (== tokens for word unigrams)
  CountEntries counts;            // sorted by id, counts > 0
};

struct CountProfile {
  FeatureSpec spec;
  Vocabulary vocabulary;
  // Where the segments' counts were cut from, when a loader chose one arena for them all
  // (else null). Declared before `segments`, so that it outlives their lists.
  std::shared_ptr<CountArena> count_memory;
  std::vector<SegmentCounts> segments;  // in the order they were added

  CountProfile() = default;
  CountProfile(CountProfile&&) = default;
  // A copy's lists are on the heap (a pmr list's copy takes the default resource), so it
  // holds no arena: otherwise the original's release_counts would see a second holder.
  CountProfile(const CountProfile& other)
      : spec(other.spec), vocabulary(other.vocabulary), segments(other.segments) {}
  // The old lists go before the arena they may lie in (member by member, the arena would
  // be let go first). Keep this in step with the members above.
  CountProfile& operator=(CountProfile&& other) noexcept {
    segments.clear();
    spec = std::move(other.spec);
    vocabulary = std::move(other.vocabulary);
    count_memory = std::move(other.count_memory);
    segments = std::move(other.segments);
    return *this;
  }
  // Assigned element by element, the lists would stay in this profile's arena (pmr
  // allocators do not follow a copy): not offered.
  CountProfile& operator=(const CountProfile&) = delete;

  // Empties every segment's counts and hands their memory back: to the system at once
  // when they came from count_memory and nothing else holds it, else to the heap. For
  // an analysis that needs no counts once its feature table is built.
  void release_counts() {
    for (SegmentCounts& s : segments) s.counts = CountEntries(s.counts.get_allocator());
    if (count_memory && count_memory.use_count() == 1) count_memory->release();
  }
};

}  // namespace manicule
