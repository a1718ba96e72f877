#include "export/svg_canvas.h"

#include <cmath>
#include <cstdio>

#include "standoff/utf8_codec.h"

namespace manicule {

namespace {

// The next code point of `text` at i; advances i.
char32_t next_code_point(std::string_view text, std::size_t& i) {
  unsigned long cp = 0;
  i += next_utf8(text, i, cp);
  return static_cast<char32_t>(cp);
}

bool allowed_in_xml(char32_t cp) {
  return cp == 0x9 || cp == 0xA || cp == 0xD || (cp >= 0x20 && cp <= 0xD7FF) || (cp >= 0xE000 && cp <= 0xFFFD) ||
         (cp >= 0x10000 && cp <= 0x10FFFF);
}

// Advance widths in em, rounded up from DejaVu Sans and Arial.
double char_width_em(char32_t cp) {
  if (cp == ' ') return 0.32;
  if (cp < 0x80) {
    const char c = static_cast<char>(cp);
    if (std::string_view("iIjl.,:;'!|").find(c) != std::string_view::npos) return 0.30;
    if (std::string_view("frt()[]{}-\"/\\").find(c) != std::string_view::npos) return 0.42;
    if (std::string_view("mwMW").find(c) != std::string_view::npos) return 0.92;
    if (c >= 'A' && c <= 'Z') return 0.72;
    return 0.61;  // other lower-case letters, digits, signs
  }
  if (cp >= 0x2190 && cp <= 0x21FF) return 0.85;  // arrows
  if (cp >= 0x3000) return 1.0;                    // CJK and other wide scripts
  return 0.66;                                     // accented Latin, Greek, Cyrillic ...
}

std::string attributes_text(const SvgAttributes& attributes) {
  std::string out;
  for (const auto& [name, value] : attributes) out += ' ' + name + "=\"" + xml_escape(value) + '"';
  return out;
}

}  // namespace

std::string xml_escape(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    const char32_t cp = next_code_point(text, i);
    switch (cp) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&apos;"; break;
      case '\t': case '\n': case '\r': out += ' '; break;  // one line of text
      default:
        if (allowed_in_xml(cp)) append_utf8(out, cp);
    }
  }
  return out;
}

std::string svg_number(double value) {
  if (!std::isfinite(value)) return "0";
  const double rounded = std::round(value * 10.0) / 10.0;
  char buffer[32];
  if (rounded == std::floor(rounded)) {
    std::snprintf(buffer, sizeof buffer, "%.0f", rounded == 0 ? 0.0 : rounded);
  } else {
    std::snprintf(buffer, sizeof buffer, "%.1f", rounded);
  }
  return buffer;
}

double estimate_text_width(std::string_view text, double font_size) {
  double em = 0;
  for (std::size_t i = 0; i < text.size();) {
    const char32_t cp = next_code_point(text, i);
    if (cp >= 0x300 && cp <= 0x36F) continue;  // combining marks take no advance
    em += char_width_em(cp);
  }
  return em * font_size;
}

SvgCanvas::SvgCanvas(double width, double height, std::string_view title)
    : width_(width), height_(height), title_(title) {}

void SvgCanvas::open(std::string_view name, const SvgAttributes& attributes) {
  body_ += '<';
  body_ += name;
  body_ += attributes_text(attributes);
}

void SvgCanvas::line(double x1, double y1, double x2, double y2, const SvgAttributes& attributes) {
  open("line", {{"x1", svg_number(x1)}, {"y1", svg_number(y1)}, {"x2", svg_number(x2)}, {"y2", svg_number(y2)}});
  body_ += attributes_text(attributes) + "/>\n";
}

void SvgCanvas::rect(double x, double y, double width, double height, const SvgAttributes& attributes) {
  open("rect", {{"x", svg_number(x)}, {"y", svg_number(y)}, {"width", svg_number(width)}, {"height", svg_number(height)}});
  body_ += attributes_text(attributes) + "/>\n";
}

void SvgCanvas::circle(double cx, double cy, double r, const SvgAttributes& attributes) {
  open("circle", {{"cx", svg_number(cx)}, {"cy", svg_number(cy)}, {"r", svg_number(r)}});
  body_ += attributes_text(attributes) + "/>\n";
}

namespace {
std::string points_text(const std::vector<std::pair<double, double>>& points) {
  std::string out;
  for (const auto& [x, y] : points) out += (out.empty() ? "" : " ") + svg_number(x) + "," + svg_number(y);
  return out;
}
}  // namespace

void SvgCanvas::polygon(const std::vector<std::pair<double, double>>& points, const SvgAttributes& attributes) {
  open("polygon", {{"points", points_text(points)}});
  body_ += attributes_text(attributes) + "/>\n";
}

void SvgCanvas::polyline(const std::vector<std::pair<double, double>>& points, const SvgAttributes& attributes) {
  open("polyline", {{"points", points_text(points)}, {"fill", "none"}});
  body_ += attributes_text(attributes) + "/>\n";
}

void SvgCanvas::text(double x, double y, std::string_view content, const SvgAttributes& attributes) {
  open("text", {{"x", svg_number(x)}, {"y", svg_number(y)}});
  body_ += attributes_text(attributes) + ">" + xml_escape(content) + "</text>\n";
}

void SvgCanvas::begin_group(const SvgAttributes& attributes) {
  open("g", attributes);
  body_ += ">\n";
  ++open_groups_;
}

void SvgCanvas::end_group() {
  if (open_groups_ == 0) return;
  body_ += "</g>\n";
  --open_groups_;
}

void SvgCanvas::comment(std::string_view text) {
  std::string safe = xml_escape(text);
  for (std::size_t at; (at = safe.find("--")) != std::string::npos;) safe.replace(at, 2, "- -");
  body_ += "<!-- " + safe + " -->\n";
}

std::string SvgCanvas::finish() {
  while (open_groups_ > 0) end_group();
  std::string out = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out += "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"" + svg_number(width_) + "\" height=\"" +
         svg_number(height_) + "\" viewBox=\"0 0 " + svg_number(width_) + " " + svg_number(height_) +
         "\" font-family=\"DejaVu Sans, Arial, Helvetica, sans-serif\">\n";
  out += "<title>" + xml_escape(title_) + "</title>\n";
  out += "<rect x=\"0\" y=\"0\" width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>\n";
  return out + body_ + "</svg>\n";
}

}  // namespace manicule
