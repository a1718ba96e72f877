#include "measure/bootstrap_consensus.h"

#include "core/error.h"

namespace manicule {

std::vector<RankRange> growing_ranges(std::size_t first, std::size_t last_min,
                                      std::size_t last_max, std::size_t step) {
  if (first < 1 || last_min < first || last_max < last_min || step < 1) {
    throw Error(ErrorKind::usage, "feature ranges need 1 <= first <= last_min <= last_max and a step");
  }
  std::vector<RankRange> ranges;
  for (std::size_t last = last_min; last <= last_max; last += step) ranges.emplace_back(first, last);
  return ranges;
}

ConsensusTree bootstrap_consensus(const CountProfile& profile, const ConsensusRequest& request) {
  if (request.ranges.empty()) throw Error(ErrorKind::usage, "a consensus needs feature ranges");
  std::vector<Dendrogram> trees;
  trees.reserve(request.ranges.size());
  for (const auto& [first, last] : request.ranges) {
    FeatureSpaceOptions options = request.features;
    options.rank_first = first;
    options.rank_last = last;
    const FeatureTable table = build_feature_table(profile, options);
    const DistanceMatrix distances = distance_matrix(table, request.measure, request.distance);
    trees.push_back(hierarchical_clustering(distances.values, distances.labels, request.method));
  }
  return majority_consensus(trees);
}

}  // namespace manicule
