#include "export/tree_plot.h"

#include <algorithm>
#include <numeric>

#include "core/error.h"
#include "export/plot_captions.h"
#include "export/segment_groups.h"

namespace manicule {

std::vector<DendrogramNode> consensus_nodes(const ConsensusTree& tree) {
  const std::size_t n = tree.labels.size();
  // Groups smallest first, so that a group's node comes after those of its subgroups.
  std::vector<std::vector<std::size_t>> groups;
  std::vector<double> support;
  std::vector<std::size_t> order(tree.clades.size());
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return tree.clades[a].members.size() < tree.clades[b].members.size();
  });
  for (std::size_t c : order) {
    groups.push_back(tree.clades[c].members);
    support.push_back(tree.clades[c].support);
  }
  std::vector<std::size_t> everyone(n);
  std::iota(everyone.begin(), everyone.end(), 0);
  groups.push_back(everyone);
  support.push_back(-1);

  std::vector<DendrogramNode> nodes(groups.size());
  std::vector<std::size_t> parent_of_leaf(n, groups.size() - 1);
  for (std::size_t g = groups.size(); g-- > 0;) {  // larger groups first: the smallest holder wins
    for (std::size_t leaf : groups[g]) parent_of_leaf[leaf] = g;
  }
  std::vector<std::vector<std::pair<std::size_t, std::size_t>>> children(groups.size());  // (first member, child)
  // Each leaf hangs from the smallest group holding it, each group from the next larger one.
  for (std::size_t leaf = 0; leaf < n; ++leaf) children[parent_of_leaf[leaf]].emplace_back(leaf, leaf);
  for (std::size_t g = 0; g + 1 < groups.size(); ++g) {
    for (std::size_t h = g + 1; h < groups.size(); ++h) {  // the smallest larger group holding it
      if (groups[h].size() > groups[g].size() &&
          std::includes(groups[h].begin(), groups[h].end(), groups[g].begin(), groups[g].end())) {
        children[h].emplace_back(groups[g].front(), n + g);
        break;
      }
    }
  }
  for (std::size_t g = 0; g < groups.size(); ++g) {
    std::sort(children[g].begin(), children[g].end());
    for (const auto& child : children[g]) nodes[g].children.push_back(child.second);
    nodes[g].support = support[g];
  }
  return nodes;
}

DendrogramPlot clustering_plot(const Analysis& analysis, const std::string& title) {
  if (!analysis.clustering) throw Error(ErrorKind::usage, "the run computed no clustering to plot");
  const ClusteringResult& result = *analysis.clustering;
  DendrogramPlot plot;
  const SegmentGrouping grouping = group_segments(analysis, result.leaves);
  plot.leaf_labels = grouping.labels;
  plot.leaf_groups = grouping.group_of;
  plot.legend_title = grouping.legend_title;
  plot.groups = grouping.groups;
  const std::string method(linkage_method_name(result.method));
  const std::string measure_name(measure_info(result.measure).name);
  plot.title = !title.empty() ? title : "Clustering of " + describe_measured_segments(analysis);
  if (result.tree) {
    for (const Merge& m : result.tree->merges) plot.nodes.push_back({{m.a, m.b}, m.height, -1});
    plot.has_heights = true;
    plot.height_title = method + " linkage height" + (measure_name.empty() ? "" : " (" + measure_name + ")");
    plot.caption = plot_caption(analysis, describe_clustering(result));
  } else {
    plot.nodes = consensus_nodes(*result.consensus);
    plot.has_heights = false;
    plot.support_note = "Numbers at the branchings: the % of the " + std::to_string(result.ranges.size()) +
                        " trees (one per feature range) that hold the group; groups held by half or fewer are dissolved.";
    plot.caption = plot_caption(analysis, describe_clustering(result));
  }
  return plot;
}

}  // namespace manicule
