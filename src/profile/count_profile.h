// CountProfile: raw feature counts per segment for one run, with the vocabulary that names
// the features. Sparse: a segment lists only the features it contains. This is what
// ProfileBuilder produces and what a FeatureSpace selects from.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "profile/feature_spec.h"
#include "profile/vocabulary.h"

namespace manicule {

struct SegmentCounts {
  std::string id;
  std::size_t tokens = 0;         // words in the segment (what the minimum size is about)
  std::size_t feature_total = 0;  // occurrences of all features: the denominator of
                                  // relative frequencies (== tokens for word unigrams)
  std::vector<std::pair<FeatureId, std::uint32_t>> counts;  // sorted by id, counts > 0
};

struct CountProfile {
  FeatureSpec spec;
  Vocabulary vocabulary;
  std::vector<SegmentCounts> segments;  // in the order they were added
};

}  // namespace manicule
