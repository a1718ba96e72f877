// Counts a batch run has just stored, kept in memory for an analysis in the same process so
// that it need not read back what was just written: the store's vocabulary as the run left
// it (ids are the store's feature ids), and the counts in store ids of the segments read in
// this run that have at least `min_tokens` words (an analysis leaves shorter ones out
// anyway). Contents stored by earlier runs are not here: an analysis reads those from the
// store. On the plays, loading the stored counts took a quarter of a second of the first
// run's analysis, most of it reading back the vocabulary and decoding counts.
#pragma once
#include <algorithm>
#include <cstddef>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "store/count_blob.h"

namespace manicule::store {

struct FreshCounts {
  Vocabulary forms;  // every form of the settings, by store id
  std::size_t min_tokens = 0;
  // By content (SHA-256): (segment ordinal, counts), in ordinal order.
  std::unordered_map<std::string, std::vector<std::pair<std::size_t, FeatureCounts>>> by_content;

  // The counts of a segment, or null when they were not kept; an analysis may move them out.
  FeatureCounts* find(const std::string& sha256, std::size_t ordinal) {
    auto content = by_content.find(sha256);
    if (content == by_content.end()) return nullptr;
    auto& segments = content->second;
    auto at = std::lower_bound(segments.begin(), segments.end(), ordinal,
                               [](const auto& entry, std::size_t o) { return entry.first < o; });
    return at != segments.end() && at->first == ordinal ? &at->second : nullptr;
  }
};

}  // namespace manicule::store
