// XmlNode: a small element tree for the markup we write (never for the edition itself),
// and its serialisation in the host document's style: its newline, its indentation, the
// namespace prefix its TEI elements use, and (for editions in a legacy single-byte
// encoding) every non-ASCII character written as a character reference.
#pragma once
#include <string>
#include <utility>
#include <vector>

namespace manicule {

struct XmlNode {
  std::string name;  // element name without prefix; empty for a text node
  std::vector<std::pair<std::string, std::string>> attributes;
  std::vector<XmlNode> children;
  std::string text;  // text nodes only

  static XmlNode element(std::string name, std::vector<std::pair<std::string, std::string>> attributes = {});
  static XmlNode text_node(std::string text);
  // Appends a child and returns it.
  XmlNode& add(XmlNode child);
  // Appends <name attributes>text</name>.
  XmlNode& add_text_element(std::string name, std::string text,
                            std::vector<std::pair<std::string, std::string>> attributes = {});
  bool is_text() const { return name.empty(); }
  // Value of an attribute, "" when absent.
  const std::string& attribute(const std::string& key) const;
};

struct XmlStyle {
  std::string newline = "\n";
  std::string indent_unit = "  ";
  std::string prefix;       // "tei" writes <tei:standOff>; "" writes <standOff>
  bool ascii_only = false;  // write non-ASCII characters as &#xHH; references
};

// `node` as markup. The first line has no indentation of its own (the caller places it);
// every following line starts with `indent` plus one unit per level. Elements whose
// children include text are written on one line, so no whitespace is added to mixed
// content; so is an element with a single child that holds no elements.
std::string serialise(const XmlNode& node, const XmlStyle& style, const std::string& indent);

// Escaping for text content and for attribute values in double quotes.
std::string escape_text(const std::string& text, bool ascii_only = false);
std::string escape_attribute(const std::string& value, bool ascii_only = false);

}  // namespace manicule
