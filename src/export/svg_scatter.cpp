#include "export/svg_scatter.h"

#include <algorithm>
#include <cmath>

#include "export/label_placement.h"
#include "export/plot_parts.h"

namespace manicule {

namespace {

constexpr double kPlotWidth = 820;
constexpr double kPlotHeight = 620;
constexpr double kLeft = 128;    // y poles, y title, tick labels
constexpr double kTop = 64;      // title
constexpr double kPointRadius = 4.5;
constexpr double kAxisTitleFontSize = 13;

struct Frame {
  double left, top, right, bottom;
  double x_low, x_high, y_low, y_high;  // data range shown
  double px(double x) const { return left + (x - x_low) / (x_high - x_low) * (right - left); }
  double py(double y) const { return bottom - (y - y_low) / (y_high - y_low) * (bottom - top); }
};

// The data range with room around the points; never empty.
std::pair<double, double> padded_range(double low, double high) {
  if (!(high > low)) return {low - 1, high + 1};
  const double pad = (high - low) * 0.08;
  return {low - pad, high + pad};
}

void draw_grid(SvgCanvas& canvas, const Frame& f) {
  const SvgAttributes grid{{"stroke", "#e4e4e4"}, {"stroke-width", "1"}};
  const SvgAttributes tick_font{{"font-size", svg_number(kSmallFontSize)}, {"fill", kMutedColour}};
  canvas.begin_group({{"class", "grid"}});
  for (double t : nice_ticks(f.x_low, f.x_high, 8)) {
    canvas.line(f.px(t), f.top, f.px(t), f.bottom, grid);
    SvgAttributes font = tick_font;
    font.emplace_back("text-anchor", "middle");
    canvas.text(f.px(t), f.bottom + 16, tick_text(t), font);
  }
  for (double t : nice_ticks(f.y_low, f.y_high, 7)) {
    canvas.line(f.left, f.py(t), f.right, f.py(t), grid);
    SvgAttributes font = tick_font;
    font.emplace_back("text-anchor", "end");
    canvas.text(f.left - 6, f.py(t) + 4, tick_text(t), font);
  }
  const SvgAttributes zero{{"stroke", "#b0b0b0"}, {"stroke-width", "1"}, {"stroke-dasharray", "4 3"}};
  if (f.x_low < 0 && f.x_high > 0) canvas.line(f.px(0), f.top, f.px(0), f.bottom, zero);
  if (f.y_low < 0 && f.y_high > 0) canvas.line(f.left, f.py(0), f.right, f.py(0), zero);
  canvas.rect(f.left, f.top, f.right - f.left, f.bottom - f.top, {{"fill", "none"}, {"stroke", "#999999"}});
  canvas.end_group();
}

// The poles of one axis along a line of `length` px: low end, heading in the middle, high end.
struct PoleTexts {
  std::string low, heading, high;
};

PoleTexts fit_poles(const AxisPoles& poles, const std::string& heading, double length) {
  const double heading_width = estimate_text_width(heading, kSmallFontSize);
  const double side = (length - heading_width) / 2 - 14;
  PoleTexts out;
  out.low = fit_word_list(poles.low, "\u2190 ", "", side, kLabelFontSize);
  out.high = fit_word_list(poles.high, "", " \u2192", side, kLabelFontSize);
  if (!out.low.empty() || !out.high.empty()) out.heading = heading;
  return out;
}

void draw_axis_titles(SvgCanvas& canvas, const Frame& f, const ScatterPlot& plot) {
  const SvgAttributes title_font{{"font-size", svg_number(kAxisTitleFontSize)}, {"fill", kInkColour},
                                 {"text-anchor", "middle"}, {"class", "axis-title"}};
  const SvgAttributes pole_font{{"font-size", svg_number(kLabelFontSize)}, {"fill", "#333333"}, {"class", "axis-poles"}};
  const SvgAttributes heading_font{{"font-size", svg_number(kSmallFontSize)}, {"fill", kMutedColour},
                                   {"font-style", "italic"}, {"text-anchor", "middle"}};
  const auto with = [](SvgAttributes a, const std::string& name, const std::string& value) {
    a.emplace_back(name, value);
    return a;
  };
  const double mid_x = (f.left + f.right) / 2, mid_y = (f.top + f.bottom) / 2;
  // x axis: title under the tick labels, poles under the title at either end.
  canvas.text(mid_x, f.bottom + 40, plot.x_title, title_font);
  const PoleTexts x = fit_poles(plot.x_poles, plot.poles_heading, f.right - f.left);
  const double x_row = f.bottom + 62;
  if (!x.low.empty()) canvas.text(f.left, x_row, x.low, with(pole_font, "text-anchor", "start"));
  if (!x.heading.empty()) canvas.text(mid_x, x_row, x.heading, heading_font);
  if (!x.high.empty()) canvas.text(f.right, x_row, x.high, with(pole_font, "text-anchor", "end"));
  // y axis: read from bottom to top, title nearer the axis, poles further out.
  const double title_x = f.left - 56, poles_x = f.left - 84;
  const auto turned = [](double x, double y) { return "rotate(-90 " + svg_number(x) + " " + svg_number(y) + ")"; };
  canvas.text(title_x, mid_y, plot.y_title, with(title_font, "transform", turned(title_x, mid_y)));
  const PoleTexts y = fit_poles(plot.y_poles, plot.poles_heading, f.bottom - f.top);
  if (!y.low.empty())
    canvas.text(poles_x, f.bottom, y.low,
                with(with(pole_font, "text-anchor", "start"), "transform", turned(poles_x, f.bottom)));
  if (!y.heading.empty())
    canvas.text(poles_x, mid_y, y.heading, with(heading_font, "transform", turned(poles_x, mid_y)));
  if (!y.high.empty())
    canvas.text(poles_x, f.top, y.high, with(with(pole_font, "text-anchor", "end"), "transform", turned(poles_x, f.top)));
}

void draw_points(SvgCanvas& canvas, const Frame& f, const ScatterPlot& plot) {
  std::vector<LabelRequest> requests;
  for (const auto& p : plot.points)
    requests.push_back({f.px(p.x), f.py(p.y), estimate_text_width(p.label, kLabelFontSize) + 2, kLabelFontSize * 1.25});
  const Box bounds{f.left + 2, f.top + 2, f.right - 2, f.bottom - 2};
  const std::vector<PlacedLabel> placed = place_labels(requests, bounds, kPointRadius + 1);
  canvas.begin_group({{"class", "leaders"}});
  for (std::size_t i = 0; i < placed.size(); ++i) {
    if (!placed[i].leader) continue;
    const Box& b = placed[i].box;
    const double tx = std::clamp(requests[i].x, b.left, b.right), ty = std::clamp(requests[i].y, b.top, b.bottom);
    canvas.line(requests[i].x, requests[i].y, tx, ty, {{"stroke", "#7a7a7a"}, {"stroke-width", "1"}});
  }
  canvas.end_group();
  canvas.begin_group({{"class", "points"}});
  for (std::size_t i = 0; i < plot.points.size(); ++i) {
    const std::size_t g = plot.points[i].group < plot.groups.size() ? plot.points[i].group : 0;
    const GroupStyle style = plot.groups.empty() ? GroupStyle{"", "#0072B2", MarkerShape::circle} : plot.groups[g];
    draw_marker(canvas, style, requests[i].x, requests[i].y, kPointRadius);
  }
  canvas.end_group();
  canvas.begin_group({{"class", "label-backgrounds"}});
  for (const auto& p : placed)
    canvas.rect(p.box.left, p.box.top + 1, p.box.width(), p.box.height() - 1,
                {{"fill", "#ffffff"}, {"fill-opacity", "0.7"}});
  canvas.end_group();
  canvas.begin_group({{"class", "point-labels"}, {"font-size", svg_number(kLabelFontSize)}, {"fill", kInkColour}});
  for (std::size_t i = 0; i < placed.size(); ++i) {
    const TextAnchor anchor = placed[i].anchor;
    SvgAttributes attributes{{"class", "point-label"}};
    if (anchor != TextAnchor::start) attributes.emplace_back("text-anchor", anchor == TextAnchor::end ? "end" : "middle");
    const double nudge = anchor == TextAnchor::start ? 1 : anchor == TextAnchor::end ? -1 : 0;
    canvas.text(placed[i].x + nudge, placed[i].baseline, plot.points[i].label, attributes);
  }
  canvas.end_group();
}

}  // namespace

std::string render_svg_scatter(const ScatterPlot& plot) {
  const double legend = legend_width(plot.legend_title, plot.groups);
  const double width = kLeft + kPlotWidth + 30 + (legend > 0 ? legend + 20 : 0);
  const std::vector<std::string> title = title_lines(plot.title, width);
  const std::vector<std::string> caption = caption_lines(plot.caption, width);
  const double top = kTop + kTitleLineHeight * (std::max<std::size_t>(title.size(), 1) - 1);
  const double height = top + kPlotHeight + 86 + kCaptionLineHeight * static_cast<double>(caption.size()) + 8;

  double x_low = INFINITY, x_high = -INFINITY, y_low = INFINITY, y_high = -INFINITY;
  for (const auto& p : plot.points) {
    x_low = std::min(x_low, p.x), x_high = std::max(x_high, p.x);
    y_low = std::min(y_low, p.y), y_high = std::max(y_high, p.y);
  }
  if (plot.points.empty()) x_low = y_low = -1, x_high = y_high = 1;
  const auto [xl, xh] = padded_range(x_low, x_high);
  const auto [yl, yh] = padded_range(y_low, y_high);
  const Frame frame{kLeft, top, kLeft + kPlotWidth, top + kPlotHeight, xl, xh, yl, yh};

  SvgCanvas canvas(width, height, plot.title);
  draw_title(canvas, title);
  draw_grid(canvas, frame);
  draw_axis_titles(canvas, frame, plot);
  draw_points(canvas, frame, plot);
  draw_legend(canvas, frame.right + 24, frame.top, plot.legend_title, plot.groups);
  draw_caption(canvas, caption, frame.bottom + 92);
  return canvas.finish();
}

}  // namespace manicule
