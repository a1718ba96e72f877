// A labelled scatter plot as SVG 1.1: title, axes with ticks and titles, under each axis
// title the words that pull most towards either end of it ("← a, b, c" at the low end,
// "d, e, f →" at the high end), one marker and one text label per point (labels kept
// apart by label_placement.h), a legend when points fall into groups, and a small caption.
// Knows nothing of stylometry: pca_plot.h fills it from an Analysis.
#pragma once
#include <string>
#include <vector>

#include "export/segment_groups.h"

namespace manicule {

struct ScatterPoint {
  double x = 0, y = 0;
  std::string label;
  std::size_t group = 0;
};

struct AxisPoles {
  std::vector<std::string> low;   // strongest first
  std::vector<std::string> high;  // strongest first
};

struct ScatterPlot {
  std::string title;
  std::vector<std::string> caption;  // small lines under the plot (parameters)
  std::string x_title, y_title;
  AxisPoles x_poles, y_poles;
  std::string poles_heading = "strongest loadings";
  std::vector<ScatterPoint> points;
  std::string legend_title;          // no legend when empty or one group
  std::vector<GroupStyle> groups;
};

std::string render_svg_scatter(const ScatterPlot& plot);

}  // namespace manicule
