#include "export/pca_plot.h"

#include <cstdio>

#include "core/error.h"
#include "export/plot_captions.h"
#include "export/segment_groups.h"

namespace manicule {

namespace {

AxisPoles poles_of(const PcaResult& pca, std::size_t component, std::size_t shown) {
  AxisPoles poles;
  if (component >= pca.poles.size()) return poles;
  for (const auto& w : pca.poles[component].negative)
    if (poles.low.size() < shown) poles.low.push_back(pca.features[w.feature]);
  for (const auto& w : pca.poles[component].positive)
    if (poles.high.size() < shown) poles.high.push_back(pca.features[w.feature]);
  return poles;
}

}  // namespace

std::string component_title(std::size_t component, double explained_variance_ratio) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "PC%zu (%.1f %%)", component + 1, explained_variance_ratio * 100.0);
  return buffer;
}

ScatterPlot pca_scatter(const Analysis& analysis, const PcaPlotOptions& options) {
  if (!analysis.pca) throw Error(ErrorKind::usage, "the run computed no PCA to plot");
  const PcaResult& pca = *analysis.pca;
  const auto components = static_cast<std::size_t>(pca.coordinates.cols());
  if (options.x_component >= components || options.y_component >= components)
    throw Error(ErrorKind::usage, "the plot asks for component " +
                                      std::to_string(std::max(options.x_component, options.y_component) + 1) +
                                      " but only " + std::to_string(components) + " exist");
  ScatterPlot plot;
  plot.title = options.title.empty() ? "Principal components of " + describe_measured_segments(analysis) : options.title;
  plot.x_title = component_title(options.x_component, pca.explained_variance_ratio(static_cast<Eigen::Index>(options.x_component)));
  plot.y_title = component_title(options.y_component, pca.explained_variance_ratio(static_cast<Eigen::Index>(options.y_component)));
  plot.x_poles = poles_of(pca, options.x_component, options.poles_shown);
  plot.y_poles = poles_of(pca, options.y_component, options.poles_shown);

  const SegmentGrouping grouping = group_segments(analysis, analysis.table_rows);
  plot.legend_title = grouping.legend_title;
  plot.groups = grouping.groups;
  for (std::size_t r = 0; r < analysis.table_rows.size(); ++r) {
    ScatterPoint point;
    point.x = pca.coordinates(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(options.x_component));
    point.y = pca.coordinates(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(options.y_component));
    point.label = grouping.labels[r];
    point.group = grouping.group_of[r];
    plot.points.push_back(point);
  }
  const std::string input = analysis.provenance.parameter("pca input");
  plot.caption = plot_caption(analysis, "PCA on " + (input.empty() ? std::string("z-scores") : input));
  return plot;
}

}  // namespace manicule
