// The clustering of an Analysis as a dendrogram plot (svg_dendrogram.h): a single tree
// with its merge heights on a scale, or a consensus tree drawn by depth with each group's
// support; leaves named and coloured as in the scatter plot (segment_groups.h), and a
// caption with the run's parameters.
#pragma once
#include <string>

#include "core/analysis.h"
#include "export/svg_dendrogram.h"

namespace manicule {

// The consensus tree's groups as plot nodes (children before parents, the root last).
std::vector<DendrogramNode> consensus_nodes(const ConsensusTree& tree);

// Error(usage) if the analysis holds no clustering. `title` "" = "Clustering of ...".
DendrogramPlot clustering_plot(const Analysis& analysis, const std::string& title = {});

}  // namespace manicule
