// Pieces both SVG plots (scatter, dendrogram) draw alike: group markers, the legend,
// round tick values for an axis, captions wrapped to a width, and word lists cut to fit.
#pragma once
#include <string>
#include <vector>

#include "export/segment_groups.h"
#include "export/svg_canvas.h"

namespace manicule {

inline constexpr double kLabelFontSize = 12;
inline constexpr double kSmallFontSize = 11;
inline constexpr const char* kInkColour = "#222222";
inline constexpr const char* kMutedColour = "#666666";

void draw_marker(SvgCanvas& canvas, const GroupStyle& style, double x, double y, double radius);

// The legend's width for these groups (0 when there is no legend to draw).
double legend_width(const std::string& title, const std::vector<GroupStyle>& groups);
// Draws it with its top-left corner at (x, y); returns its height.
double draw_legend(SvgCanvas& canvas, double x, double y, const std::string& title,
                   const std::vector<GroupStyle>& groups);

// About `wanted` round values (1, 2 or 5 times a power of ten) covering [low, high].
std::vector<double> nice_ticks(double low, double high, int wanted);
// A tick value without rounding noise ("0.25", "-3", "1e-05").
std::string tick_text(double value);

// The plot's title, centred, wrapped to the canvas; returns the y below it.
double draw_title(SvgCanvas& canvas, const std::vector<std::string>& lines);
std::vector<std::string> title_lines(const std::string& title, double canvas_width);
// The caption lines, small and grey, from `top` down (each line wrapped to the canvas).
std::vector<std::string> caption_lines(const std::vector<std::string>& caption, double canvas_width);
void draw_caption(SvgCanvas& canvas, const std::vector<std::string>& lines, double top);
inline constexpr double kTitleLineHeight = 22;
inline constexpr double kCaptionLineHeight = 15;

// Splits `text` at spaces into lines that fit `width` px at `font_size`.
std::vector<std::string> wrap_text(const std::string& text, double width, double font_size);

// "a, b, c": as many of `words` (in order) as fit into `width` px with `prefix` and
// `suffix` around them; "" when not even one fits.
std::string fit_word_list(const std::vector<std::string>& words, const std::string& prefix,
                          const std::string& suffix, double width, double font_size);

}  // namespace manicule
