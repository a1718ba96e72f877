// A dendrogram as SVG 1.1, drawn sideways: the root on the left, one row per leaf on the
// right with its label (coloured marker by group), elbows between. With heights, a node
// sits at its merge height on a scale drawn underneath; without (a consensus tree), nodes
// are placed by depth. A node's support, when known, is written beside it in percent.
// Knows nothing of stylometry: tree_plot.h fills it from an Analysis.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "export/segment_groups.h"

namespace manicule {

struct DendrogramNode {
  // Children: 0..leaves-1 are leaves, leaves + k is nodes[k]. Drawn in this order.
  std::vector<std::size_t> children;
  double height = 0;    // used when the plot has heights
  double support = -1;  // share 0..1 of trees holding this group; < 0: not known
};

struct DendrogramPlot {
  std::string title;
  std::vector<std::string> caption;
  std::vector<std::string> leaf_labels;
  std::vector<std::size_t> leaf_groups;  // index into groups, per leaf
  std::vector<DendrogramNode> nodes;     // the root last
  bool has_heights = true;
  std::string height_title;              // the scale's title, e.g. "Ward height (Cosine Delta)"
  std::string support_note;              // explains the numbers at the nodes
  std::string legend_title;
  std::vector<GroupStyle> groups;
};

std::string render_svg_dendrogram(const DendrogramPlot& plot);

}  // namespace manicule
