#include "measure/consensus_tree.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <map>

#include "core/error.h"
#include "measure/newick.h"

namespace manicule {

namespace {

using LeafSet = std::vector<std::uint64_t>;  // bit i = segment i

// The leaf set below every merge of a dendrogram (merge k -> node n + k).
std::vector<LeafSet> clades_of(const Dendrogram& tree) {
  const std::size_t n = tree.labels.size();
  const std::size_t words = (n + 63) / 64;
  std::vector<LeafSet> sets(2 * n - 1, LeafSet(words, 0));
  for (std::size_t i = 0; i < n; ++i) sets[i][i / 64] |= std::uint64_t{1} << (i % 64);
  for (std::size_t k = 0; k < tree.merges.size(); ++k) {
    LeafSet& merged = sets[n + k];
    for (std::size_t w = 0; w < words; ++w) {
      merged[w] = sets[tree.merges[k].a][w] | sets[tree.merges[k].b][w];
    }
  }
  return {sets.begin() + static_cast<std::ptrdiff_t>(n), sets.end() - 1};  // no leaves, no root
}

std::vector<std::size_t> members_of(const LeafSet& set, std::size_t n) {
  std::vector<std::size_t> members;
  for (std::size_t i = 0; i < n; ++i) {
    if (set[i / 64] >> (i % 64) & 1) members.push_back(i);
  }
  return members;
}

// Writes the subtree of clade `c` (or the root when c == clades.size()).
void write_clade(const ConsensusTree& tree, std::size_t c,
                 const std::vector<std::vector<std::size_t>>& child_clades,
                 const std::vector<std::vector<std::size_t>>& child_leaves, std::string& out) {
  // Merge child clades and direct leaves, ordered by smallest segment index.
  std::vector<std::pair<std::size_t, std::ptrdiff_t>> children;  // (first member, clade or ~leaf)
  for (std::size_t sub : child_clades[c]) {
    children.emplace_back(tree.clades[sub].members.front(), static_cast<std::ptrdiff_t>(sub));
  }
  for (std::size_t leaf : child_leaves[c]) {
    children.emplace_back(leaf, -1 - static_cast<std::ptrdiff_t>(leaf));
  }
  std::sort(children.begin(), children.end());
  out += '(';
  for (std::size_t k = 0; k < children.size(); ++k) {
    if (k > 0) out += ',';
    const std::ptrdiff_t child = children[k].second;
    if (child < 0) {
      out += newick_label(tree.labels[static_cast<std::size_t>(-1 - child)]);
    } else {
      write_clade(tree, static_cast<std::size_t>(child), child_clades, child_leaves, out);
    }
  }
  out += ')';
  if (c < tree.clades.size()) {
    out += std::to_string(static_cast<long>(std::lround(tree.clades[c].support * 100.0)));
  }
}

}  // namespace

ConsensusTree majority_consensus(const std::vector<Dendrogram>& trees) {
  if (trees.empty()) throw Error(ErrorKind::usage, "a consensus needs at least one tree");
  ConsensusTree result;
  result.labels = trees.front().labels;
  result.trees = trees.size();
  const std::size_t n = result.labels.size();
  std::map<LeafSet, std::size_t> appearances;
  for (const Dendrogram& tree : trees) {
    if (tree.labels != result.labels || tree.merges.size() + 1 != n) {
      throw Error(ErrorKind::usage, "consensus trees must cover the same segments");
    }
    for (LeafSet& clade : clades_of(tree)) ++appearances[std::move(clade)];
  }
  for (const auto& [set, count] : appearances) {
    if (2 * count <= trees.size()) continue;
    result.clades.push_back({members_of(set, n), count,
                             static_cast<double>(count) / static_cast<double>(trees.size())});
  }
  std::sort(result.clades.begin(), result.clades.end(),
            [](const ConsensusClade& a, const ConsensusClade& b) {
              if (a.members.size() != b.members.size()) return a.members.size() > b.members.size();
              return a.members < b.members;
            });
  return result;
}

std::string to_newick(const ConsensusTree& tree) {
  const std::size_t n = tree.labels.size();
  const std::size_t root = tree.clades.size();
  // Clades are sorted larger first, so each clade's parent is the last earlier one holding
  // it; a segment belongs to the smallest (last) clade that holds it.
  std::vector<std::size_t> owner(n, root);
  std::vector<std::vector<std::size_t>> child_clades(root + 1);
  std::vector<std::vector<std::size_t>> child_leaves(root + 1);
  for (std::size_t c = 0; c < root; ++c) {
    child_clades[owner[tree.clades[c].members.front()]].push_back(c);
    for (std::size_t leaf : tree.clades[c].members) owner[leaf] = c;
  }
  for (std::size_t leaf = 0; leaf < n; ++leaf) child_leaves[owner[leaf]].push_back(leaf);
  std::string out;
  if (n == 1) {
    out = newick_label(tree.labels[0]);
  } else {
    write_clade(tree, root, child_clades, child_leaves, out);
  }
  return out + ";";
}

}  // namespace manicule
