// Majority-rule consensus of several dendrograms over the same segments (Margush &
// McMorris 1981, Bull. Math. Biology 43(2)): a group of segments (clade) is kept if it is
// the full set of leaves below some node in more than half of the trees. Such clades are
// pairwise compatible, so they nest into one tree; branching that no majority agrees on
// becomes a multifurcation. Each kept clade carries the share of trees in which it
// appears (its support). Trivial clades (single segments, all segments) are not listed.
// In Newick, support is the internal node's label, in whole percent; the consensus tree
// has no branch lengths. Children are ordered by their smallest segment index.
// Errors: usage if there are no trees or their labels differ.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "measure/linkage.h"

namespace manicule {

struct ConsensusClade {
  std::vector<std::size_t> members;  // segment indices, ascending
  std::size_t appearances = 0;       // trees holding this clade
  double support = 0;                // appearances / trees
};

struct ConsensusTree {
  std::vector<std::string> labels;
  std::size_t trees = 0;
  std::vector<ConsensusClade> clades;  // larger clades first, then by smallest member
};

ConsensusTree majority_consensus(const std::vector<Dendrogram>& trees);

std::string to_newick(const ConsensusTree& tree);

}  // namespace manicule
