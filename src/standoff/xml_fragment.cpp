#include "standoff/xml_fragment.h"

#include <cstdio>

#include "standoff/utf8_codec.h"

namespace manicule {

XmlNode XmlNode::element(std::string name, std::vector<std::pair<std::string, std::string>> attributes) {
  XmlNode n;
  n.name = std::move(name);
  n.attributes = std::move(attributes);
  return n;
}

XmlNode XmlNode::text_node(std::string text) {
  XmlNode n;
  n.text = std::move(text);
  return n;
}

XmlNode& XmlNode::add(XmlNode child) {
  children.push_back(std::move(child));
  return children.back();
}

XmlNode& XmlNode::add_text_element(std::string child_name, std::string content,
                                   std::vector<std::pair<std::string, std::string>> attrs) {
  XmlNode& c = add(element(std::move(child_name), std::move(attrs)));
  c.add(text_node(std::move(content)));
  return c;
}

const std::string& XmlNode::attribute(const std::string& key) const {
  static const std::string none;
  for (const auto& [k, v] : attributes)
    if (k == key) return v;
  return none;
}

namespace {

std::string escape(const std::string& in, bool attribute, bool ascii_only) {
  std::string out;
  out.reserve(in.size());
  for (std::size_t i = 0; i < in.size();) {
    char c = in[i];
    switch (c) {
      case '&': out += "&amp;"; ++i; continue;
      case '<': out += "&lt;"; ++i; continue;
      case '>': out += "&gt;"; ++i; continue;
      default: break;
    }
    if (attribute && (c == '"' || c == '\t' || c == '\n' || c == '\r')) {
      out += c == '"' ? "&quot;" : c == '\t' ? "&#9;" : c == '\n' ? "&#10;" : "&#13;";
      ++i;
      continue;
    }
    if (ascii_only && static_cast<unsigned char>(c) >= 0x80) {
      unsigned long cp = 0;
      std::size_t len = next_utf8(in, i, cp);
      char buf[16];
      std::snprintf(buf, sizeof buf, "&#x%lX;", cp);
      out += buf;
      i += len;
      continue;
    }
    out += c;
    ++i;
  }
  return out;
}

bool has_text_child(const XmlNode& node) {
  for (const auto& c : node.children)
    if (c.is_text()) return true;
  return false;
}

// One line for mixed content, and for a single child that holds no elements itself
// (<f name="tokens"><numeric value="389"/></f>), as people write small TEI by hand.
bool fits_one_line(const XmlNode& node) {
  if (has_text_child(node)) return true;
  if (node.children.size() != 1) return false;
  for (const auto& grandchild : node.children.front().children)
    if (!grandchild.is_text()) return false;
  return true;
}

void write(std::string& out, const XmlNode& node, const XmlStyle& style, const std::string& indent, bool inline_only) {
  if (node.is_text()) {
    out += escape_text(node.text, style.ascii_only);
    return;
  }
  std::string qname = style.prefix.empty() ? node.name : style.prefix + ":" + node.name;
  out += "<" + qname;
  for (const auto& [k, v] : node.attributes) out += " " + k + "=\"" + escape_attribute(v, style.ascii_only) + "\"";
  if (node.children.empty()) {
    out += "/>";
    return;
  }
  out += ">";
  bool one_line = inline_only || fits_one_line(node);
  std::string inner = indent + style.indent_unit;
  for (const auto& child : node.children) {
    if (!one_line) out += style.newline + inner;
    write(out, child, style, inner, one_line);
  }
  if (!one_line) out += style.newline + indent;
  out += "</" + qname + ">";
}

}  // namespace

std::string escape_text(const std::string& text, bool ascii_only) { return escape(text, false, ascii_only); }

std::string escape_attribute(const std::string& value, bool ascii_only) { return escape(value, true, ascii_only); }

std::string serialise(const XmlNode& node, const XmlStyle& style, const std::string& indent) {
  std::string out;
  write(out, node, style, indent, false);
  return out;
}

}  // namespace manicule
