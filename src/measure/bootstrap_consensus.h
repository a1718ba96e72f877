// Consensus over feature ranges: the same segments are clustered once per range of
// feature ranks (e.g. 100-200, 100-300, ..., 100-1000), each run with its own z-scores,
// and the runs are combined into a majority-rule consensus tree (consensus_tree.h) whose
// clade supports say how stable each grouping is against the choice of features.
// All other feature-space options (culling, stop list, minimum size) are the same for
// every run, so every run keeps the same segments. Errors as build_feature_table,
// pairwise_distances and hierarchical_clustering give them, and usage for no range.
#pragma once
#include <cstddef>
#include <utility>
#include <vector>

#include "measure/consensus_tree.h"
#include "measure/distance_measure.h"
#include "measure/linkage.h"
#include "measure/pairwise_distances.h"
#include "profile/count_profile.h"
#include "profile/feature_space.h"

namespace manicule {

using RankRange = std::pair<std::size_t, std::size_t>;  // first, last (1-based, inclusive)

struct ConsensusRequest {
  std::vector<RankRange> ranges;
  FeatureSpaceOptions features;  // rank_first / rank_last are replaced by each range
  DistanceMeasure measure = DistanceMeasure::cosine_delta;
  LinkageMethod method = LinkageMethod::ward;
  DistanceOptions distance;
};

// first..(last_min), first..(last_min + step), ... up to last_max: the usual growing ranges.
std::vector<RankRange> growing_ranges(std::size_t first, std::size_t last_min,
                                      std::size_t last_max, std::size_t step);

ConsensusTree bootstrap_consensus(const CountProfile& profile, const ConsensusRequest& request);

}  // namespace manicule
