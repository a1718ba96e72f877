// Clustering in a run: what a Request asks for (ClusteringOptions) and what the Analysis
// then holds (ClusteringResult). Either one dendrogram of the run's distance matrix, or,
// when feature ranges are given, a majority-rule consensus of one dendrogram per range
// (measure/bootstrap_consensus.h) whose clades carry their support.
// Leaves are the measured segments in table-row order; Dendrogram labels are segment ids.
#pragma once
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "measure/bootstrap_consensus.h"
#include "measure/linkage.h"

namespace manicule {

struct Request;
struct Analysis;
struct CountProfile;

struct ClusteringOptions {
  bool compute = false;
  LinkageMethod method = LinkageMethod::ward;
  std::vector<RankRange> consensus_ranges;  // empty: one tree over the request's ranks
};

struct ClusteringResult {
  LinkageMethod method = LinkageMethod::ward;
  DistanceMeasure measure = DistanceMeasure::cosine_delta;
  std::vector<std::size_t> leaves;        // index into Analysis::segments per leaf
  std::optional<Dendrogram> tree;         // without consensus ranges
  std::optional<ConsensusTree> consensus; // with them
  std::vector<RankRange> ranges;          // the ranges the consensus used
};

// Clusters the measured segments of `analysis` (whose distances must be computed when no
// consensus ranges are given). Errors as hierarchical_clustering and bootstrap_consensus.
ClusteringResult cluster_segments(const Request& request, const CountProfile& counts,
                                  const Analysis& analysis);

// For provenance and captions: e.g. "ward linkage of cosine-delta distances" or "ward
// linkage of cosine-delta distances, majority-rule consensus of 5 trees (feature ranks
// 100-200, 100-300, ...)".
std::string describe_clustering(const ClusteringResult& result);

}  // namespace manicule
