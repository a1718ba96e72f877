// The PCA of an Analysis as a scatter plot (svg_scatter.h): one point per measured
// segment on two components, axis titles "PC1 (23.4 %)" with the share of variance each
// explains, the features with the strongest negative and positive loadings at either end
// of each axis, colours by author or edition (segment_groups.h) and a caption with the
// parameters of the run.
#pragma once
#include <cstddef>
#include <string>

#include "core/analysis.h"
#include "export/svg_scatter.h"

namespace manicule {

struct PcaPlotOptions {
  std::size_t x_component = 0;  // 0-based
  std::size_t y_component = 1;
  std::size_t poles_shown = 6;  // features listed per end of an axis, at most
  std::string title;            // "" = "Principal components of ..."
};

// "PC1 (23.4 %)".
std::string component_title(std::size_t component, double explained_variance_ratio);

// Error(usage) if the analysis has no PCA or lacks a component asked for.
ScatterPlot pca_scatter(const Analysis& analysis, const PcaPlotOptions& options = {});

}  // namespace manicule
