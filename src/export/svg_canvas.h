// SvgCanvas: writes a plain SVG 1.1 document (no scripts, no external resources) element
// by element, escaping every piece of text and attribute value, with coordinates rounded
// to 0.1 px. Also estimates how wide a text will be drawn, which the plots need to keep
// labels apart: an estimate from per-character widths of common sans-serif faces (DejaVu
// Sans, Arial, Helvetica), erring wide, since the viewer picks the actual font.
#pragma once
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace manicule {

using SvgAttributes = std::vector<std::pair<std::string, std::string>>;

// Text with & < > " ' as character references, and characters XML 1.0 forbids removed.
std::string xml_escape(std::string_view text);

// A coordinate or length with at most one decimal ("12", "12.5").
std::string svg_number(double value);

// Estimated drawn width of UTF-8 `text` at `font_size` px.
double estimate_text_width(std::string_view text, double font_size);

class SvgCanvas {
 public:
  // `title` becomes the document's <title> (shown as its name by viewers).
  SvgCanvas(double width, double height, std::string_view title);

  void line(double x1, double y1, double x2, double y2, const SvgAttributes& attributes = {});
  void rect(double x, double y, double width, double height, const SvgAttributes& attributes = {});
  void circle(double cx, double cy, double r, const SvgAttributes& attributes = {});
  void polygon(const std::vector<std::pair<double, double>>& points, const SvgAttributes& attributes = {});
  void polyline(const std::vector<std::pair<double, double>>& points, const SvgAttributes& attributes = {});
  // Text at (x, y) (baseline); `attributes` may set text-anchor, font-size, transform ...
  void text(double x, double y, std::string_view content, const SvgAttributes& attributes = {});
  void begin_group(const SvgAttributes& attributes = {});
  void end_group();
  void comment(std::string_view text);

  // The document so far, closed.
  std::string finish();

  double width() const { return width_; }
  double height() const { return height_; }

 private:
  void open(std::string_view name, const SvgAttributes& attributes);
  std::string body_;
  double width_;
  double height_;
  std::string title_;
  int open_groups_ = 0;
};

}  // namespace manicule
