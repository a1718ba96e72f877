#include "export/plot_parts.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace manicule {

void draw_marker(SvgCanvas& canvas, const GroupStyle& style, double x, double y, double radius) {
  const SvgAttributes paint{{"fill", style.colour}, {"stroke", "#ffffff"}, {"stroke-width", "0.8"}};
  switch (style.shape) {
    case MarkerShape::circle: canvas.circle(x, y, radius, paint); break;
    case MarkerShape::square:
      canvas.rect(x - radius * 0.9, y - radius * 0.9, radius * 1.8, radius * 1.8, paint);
      break;
    case MarkerShape::triangle:
      canvas.polygon({{x, y - radius * 1.2}, {x + radius * 1.1, y + radius * 0.8}, {x - radius * 1.1, y + radius * 0.8}},
                     paint);
      break;
    case MarkerShape::diamond:
      canvas.polygon({{x, y - radius * 1.25}, {x + radius * 1.25, y}, {x, y + radius * 1.25}, {x - radius * 1.25, y}},
                     paint);
      break;
  }
}

double legend_width(const std::string& title, const std::vector<GroupStyle>& groups) {
  if (title.empty() || groups.size() < 2) return 0;
  double width = estimate_text_width(title, kLabelFontSize);
  for (const auto& g : groups) width = std::max(width, 18 + estimate_text_width(g.name, kLabelFontSize));
  return std::min(width, 240.0) + 16;
}

double draw_legend(SvgCanvas& canvas, double x, double y, const std::string& title,
                   const std::vector<GroupStyle>& groups) {
  if (legend_width(title, groups) == 0) return 0;
  canvas.begin_group({{"class", "legend"}});
  canvas.text(x, y + 12, title, {{"font-size", svg_number(kLabelFontSize)}, {"font-weight", "bold"}, {"fill", kInkColour}});
  double row = y + 32;
  for (const auto& g : groups) {
    draw_marker(canvas, g, x + 6, row - 4, 5);
    canvas.text(x + 18, row, g.name, {{"font-size", svg_number(kLabelFontSize)}, {"fill", kInkColour}});
    row += 18;
  }
  canvas.end_group();
  return row - y;
}

std::vector<double> nice_ticks(double low, double high, int wanted) {
  if (!(high > low)) return {low};
  const double raw = (high - low) / std::max(1, wanted);
  const double power = std::pow(10.0, std::floor(std::log10(raw)));
  double step = power;
  for (double factor : {1.0, 2.0, 5.0, 10.0}) {
    step = factor * power;
    if (step >= raw) break;
  }
  std::vector<double> ticks;
  for (double t = std::ceil(low / step - 1e-9) * step; t <= high + step * 1e-9; t += step)
    ticks.push_back(std::abs(t) < step * 1e-9 ? 0.0 : t);
  return ticks;
}

std::string tick_text(double value) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.6g", value);
  return buffer;
}

namespace {
constexpr double kTitleFontSize = 17;
constexpr double kCaptionFontSize = 10.5;
}  // namespace

std::vector<std::string> title_lines(const std::string& title, double canvas_width) {
  return wrap_text(title, canvas_width - 40, kTitleFontSize);
}

double draw_title(SvgCanvas& canvas, const std::vector<std::string>& lines) {
  double y = 32;
  for (const auto& line : lines) {
    canvas.text(canvas.width() / 2, y, line, {{"font-size", svg_number(kTitleFontSize)}, {"font-weight", "bold"},
                                              {"text-anchor", "middle"}, {"fill", kInkColour}, {"class", "plot-title"}});
    y += kTitleLineHeight;
  }
  return y;
}

std::vector<std::string> caption_lines(const std::vector<std::string>& caption, double canvas_width) {
  std::vector<std::string> lines;
  for (const auto& line : caption)
    for (auto& part : wrap_text(line, canvas_width - 40, kCaptionFontSize)) lines.push_back(part);
  return lines;
}

void draw_caption(SvgCanvas& canvas, const std::vector<std::string>& lines, double top) {
  canvas.begin_group({{"class", "caption"}, {"font-size", svg_number(kCaptionFontSize)}, {"fill", kMutedColour}});
  for (const auto& line : lines) {
    canvas.text(20, top, line);
    top += kCaptionLineHeight;
  }
  canvas.end_group();
}

std::vector<std::string> wrap_text(const std::string& text, double width, double font_size) {
  std::vector<std::string> lines;
  std::string line;
  std::size_t start = 0;
  while (start <= text.size()) {
    std::size_t space = text.find(' ', start);
    if (space == std::string::npos) space = text.size();
    const std::string word = text.substr(start, space - start);
    const std::string longer = line.empty() ? word : line + " " + word;
    if (!line.empty() && estimate_text_width(longer, font_size) > width) {
      lines.push_back(line);
      line = word;
    } else {
      line = longer;
    }
    start = space + 1;
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

std::string fit_word_list(const std::vector<std::string>& words, const std::string& prefix,
                          const std::string& suffix, double width, double font_size) {
  std::string list;
  for (const auto& word : words) {
    const std::string longer = list.empty() ? word : list + ", " + word;
    if (estimate_text_width(prefix + longer + suffix, font_size) > width) break;
    list = longer;
  }
  return list.empty() ? std::string() : prefix + list + suffix;
}

}  // namespace manicule
