#include "core/clustering.h"

#include "core/analysis.h"
#include "core/error.h"
#include "core/request.h"
#include "core/segment_index.h"
#include "profile/stop_list.h"

namespace manicule {

ClusteringResult cluster_segments(const Request& request, const CountProfile& counts,
                                  const Analysis& analysis) {
  const ClusteringOptions& options = request.clustering;
  ClusteringResult result;
  result.method = options.method;
  result.measure = request.measure;
  if (options.consensus_ranges.empty()) {
    if (!analysis.distances)
      throw Error(ErrorKind::internal, "clustering needs the run's distances");
    std::vector<std::string> labels;
    for (std::size_t row : analysis.distances->rows) labels.push_back(analysis.segments[row].id);
    result.leaves = analysis.distances->rows;
    result.tree = hierarchical_clustering(analysis.distances->values, std::move(labels), options.method);
    return result;
  }
  ConsensusRequest consensus;
  consensus.ranges = options.consensus_ranges;
  consensus.features = request.feature_space;
  consensus.features.stop_words = normalised_stop_words(consensus.features.stop_words, request.tokenizer);
  consensus.measure = request.measure;
  consensus.method = options.method;
  consensus.distance.threads = request.threads;
  result.consensus = bootstrap_consensus(counts, consensus);
  result.ranges = options.consensus_ranges;
  // Every range keeps the same segments (same minimum size), in table-row order; check it.
  const SegmentIndex segment_index(analysis.segments);
  for (const auto& id : result.consensus->labels) {
    const std::size_t index = segment_index.find(id);
    if (index == SegmentIndex::npos) throw Error(ErrorKind::internal, "consensus leaf " + id + " is not a segment");
    result.leaves.push_back(index);
  }
  return result;
}

std::string describe_clustering(const ClusteringResult& result) {
  std::string out = std::string(linkage_method_name(result.method)) + " linkage of " +
                    std::string(measure_info(result.measure).name) + " distances";
  if (!result.consensus) return out;
  out += ", majority-rule consensus of " + std::to_string(result.ranges.size()) + " trees (feature ranks ";
  for (std::size_t i = 0; i < result.ranges.size(); ++i)
    out += (i ? ", " : "") + std::to_string(result.ranges[i].first) + "-" + std::to_string(result.ranges[i].second);
  return out + ")";
}

}  // namespace manicule
