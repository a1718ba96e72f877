#include "export/svg_dendrogram.h"

#include <algorithm>
#include <cmath>

#include "export/plot_parts.h"

namespace manicule {

namespace {

constexpr double kTreeWidth = 640;
constexpr double kLeft = 36;
constexpr double kRowHeight = 21;

struct Layout {
  std::vector<double> x, y;  // per leaf, then per node (index leaves + k)
};

// Depth of each node: leaves 0, a node one more than its deepest child.
std::vector<double> depths(const DendrogramPlot& plot) {
  const std::size_t n = plot.leaf_labels.size();
  std::vector<double> depth(n + plot.nodes.size(), 0);
  for (std::size_t k = 0; k < plot.nodes.size(); ++k)  // children come before parents
    for (std::size_t c : plot.nodes[k].children) depth[n + k] = std::max(depth[n + k], depth[c] + 1);
  return depth;
}

Layout lay_out(const DendrogramPlot& plot, double top, double right, double& scale_max) {
  const std::size_t n = plot.leaf_labels.size();
  Layout layout;
  layout.x.assign(n + plot.nodes.size(), right);
  layout.y.assign(n + plot.nodes.size(), 0);
  std::vector<double> level = depths(plot);
  if (plot.has_heights)
    for (std::size_t k = 0; k < plot.nodes.size(); ++k) level[n + k] = plot.nodes[k].height;
  scale_max = plot.nodes.empty() ? 1 : level.back();
  if (!(scale_max > 0)) scale_max = 1;
  for (std::size_t i = 0; i < level.size(); ++i) layout.x[i] = right - level[i] / scale_max * kTreeWidth;
  // Leaves in drawing order: a depth-first walk from the root.
  double row = 0;
  std::vector<std::size_t> stack{plot.nodes.empty() ? 0 : n + plot.nodes.size() - 1};
  while (!stack.empty()) {
    const std::size_t node = stack.back();
    stack.pop_back();
    if (node < n) {
      layout.y[node] = top + (row++ + 0.5) * kRowHeight;
      continue;
    }
    const auto& children = plot.nodes[node - n].children;
    for (auto c = children.rbegin(); c != children.rend(); ++c) stack.push_back(*c);
  }
  for (std::size_t k = 0; k < plot.nodes.size(); ++k) {
    double low = INFINITY, high = -INFINITY;
    for (std::size_t c : plot.nodes[k].children) low = std::min(low, layout.y[c]), high = std::max(high, layout.y[c]);
    layout.y[n + k] = (low + high) / 2;
  }
  return layout;
}

void draw_scale(SvgCanvas& canvas, const DendrogramPlot& plot, double right, double y, double scale_max) {
  canvas.begin_group({{"class", "scale"}});
  canvas.line(right - kTreeWidth, y, right, y, {{"stroke", "#999999"}});
  for (double t : nice_ticks(0, scale_max, 6)) {
    const double x = right - t / scale_max * kTreeWidth;
    canvas.line(x, y, x, y + 4, {{"stroke", "#999999"}});
    canvas.text(x, y + 16, tick_text(t), {{"font-size", svg_number(kSmallFontSize)}, {"fill", kMutedColour},
                                           {"text-anchor", "middle"}});
  }
  canvas.text(right - kTreeWidth / 2, y + 34, plot.height_title,
              {{"font-size", "13"}, {"fill", kInkColour}, {"text-anchor", "middle"}, {"class", "axis-title"}});
  canvas.end_group();
}

}  // namespace

std::string render_svg_dendrogram(const DendrogramPlot& plot) {
  const std::size_t n = plot.leaf_labels.size();
  double label_width = 0;
  for (const auto& label : plot.leaf_labels) label_width = std::max(label_width, estimate_text_width(label, kLabelFontSize));
  label_width = std::min(label_width, 360.0);
  const double legend = legend_width(plot.legend_title, plot.groups);
  const double right = kLeft + kTreeWidth;
  const double width = std::max(right + 20 + label_width + 24 + (legend > 0 ? legend + 16 : 0), 900.0);
  const std::vector<std::string> title = title_lines(plot.title, width);
  std::vector<std::string> caption = caption_lines(plot.caption, width);
  if (!plot.support_note.empty()) {
    const auto note = caption_lines({plot.support_note}, width);
    caption.insert(caption.begin(), note.begin(), note.end());
  }
  const double top = 40 + kTitleLineHeight * static_cast<double>(title.size());
  const double tree_bottom = top + kRowHeight * static_cast<double>(n);
  const double scale_height = plot.has_heights ? 52 : 8;
  const double height = tree_bottom + scale_height + 16 + kCaptionLineHeight * static_cast<double>(caption.size()) + 8;

  SvgCanvas canvas(width, height, plot.title);
  draw_title(canvas, title);
  double scale_max = 1;
  const Layout layout = lay_out(plot, top, right, scale_max);

  canvas.begin_group({{"class", "branches"}, {"stroke", "#444444"}, {"stroke-width", "1.3"}, {"fill", "none"}});
  for (std::size_t k = 0; k < plot.nodes.size(); ++k) {
    const double x = layout.x[n + k];
    double low = INFINITY, high = -INFINITY;
    for (std::size_t c : plot.nodes[k].children) {
      canvas.line(x, layout.y[c], layout.x[c], layout.y[c]);
      low = std::min(low, layout.y[c]), high = std::max(high, layout.y[c]);
    }
    canvas.line(x, low, x, high);
  }
  canvas.end_group();
  canvas.begin_group({{"class", "supports"}, {"font-size", "10"}, {"fill", "#9A3B00"}, {"text-anchor", "end"}});
  for (std::size_t k = 0; k < plot.nodes.size(); ++k) {
    if (plot.nodes[k].support < 0) continue;
    const long percent = std::lround(plot.nodes[k].support * 100);
    canvas.text(layout.x[n + k] - 3, layout.y[n + k] - 4, std::to_string(percent), {{"class", "support"}});
  }
  canvas.end_group();
  canvas.begin_group({{"class", "leaves"}, {"font-size", svg_number(kLabelFontSize)}, {"fill", kInkColour}});
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t g = i < plot.leaf_groups.size() ? plot.leaf_groups[i] : 0;
    const GroupStyle style = g < plot.groups.size() ? plot.groups[g] : GroupStyle{"", "#0072B2", MarkerShape::circle};
    draw_marker(canvas, style, right + 9, layout.y[i], 4.5);
    canvas.text(right + 20, layout.y[i] + 4, plot.leaf_labels[i], {{"class", "leaf-label"}});
  }
  canvas.end_group();
  draw_legend(canvas, right + 20 + label_width + 24, top, plot.legend_title, plot.groups);
  if (plot.has_heights) draw_scale(canvas, plot, right, tree_bottom + 8, scale_max);
  draw_caption(canvas, caption, tree_bottom + scale_height + 16);
  return canvas.finish();
}

}  // namespace manicule
