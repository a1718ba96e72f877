// Hierarchical agglomerative clustering of a distance matrix, reported as a list of merges
// in the layout of a SciPy linkage matrix: merge k joins clusters a and b (ids 0..n-1 are
// the segments, n + k is the cluster made by merge k; a < b) at `height`, giving a cluster
// of `size` segments. Merges are in ascending height order.
// Methods, with their Lance-Williams updates for the distance from a merged cluster x+y to
// another cluster i (n_ = cluster sizes):
//   complete: max(d(x,i), d(y,i))
//   average:  (n_x d(x,i) + n_y d(y,i)) / (n_x + n_y)          (UPGMA)
//   ward:     sqrt(((n_i+n_x) d(x,i)^2 + (n_i+n_y) d(y,i)^2 - n_i d(x,y)^2) / (n_i+n_x+n_y))
//             Ward 1963, JASA 58(301); meaningful on Euclidean distances, where the height
//             is the rise in within-cluster error as SciPy reports it. On Delta distances it
//             is the common heuristic, not Ward's criterion.
// All three are reducible, so the nearest-neighbour-chain algorithm (Muellner 2011,
// arXiv:1109.2378) finds the same merges in O(n^2) time and n(n-1)/2 doubles of memory.
// Errors: usage for fewer than two items, a matrix that is not square and symmetric,
// negative, NaN or infinite distances, or labels that do not match.
#pragma once
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include <Eigen/Dense>

namespace manicule {

enum class LinkageMethod { ward, average, complete };

std::string_view linkage_method_name(LinkageMethod method);
LinkageMethod parse_linkage_method(std::string_view name);  // Error(usage) if unknown

struct Merge {
  std::size_t a = 0;
  std::size_t b = 0;
  double height = 0;
  std::size_t size = 0;
};

struct Dendrogram {
  LinkageMethod method = LinkageMethod::ward;
  std::vector<std::string> labels;  // one per segment
  std::vector<Merge> merges;        // labels.size() - 1 of them
};

Dendrogram hierarchical_clustering(const Eigen::MatrixXd& distances,
                                   std::vector<std::string> labels, LinkageMethod method);

}  // namespace manicule
