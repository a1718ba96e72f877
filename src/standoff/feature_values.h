// The parts of TEI feature structures (P5 chapter 18) that our standoff writes: an `f`
// added to an `fs`, and its values (numeric, binary, symbol, a vColl of strings). One definition,
// so that profiles, distances, PCA and attribution results write their values alike.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "standoff/standoff_builder.h"
#include "standoff/xml_fragment.h"

namespace manicule::tei_fs {

// Appends <f name="NAME"/> to `fs` and returns it, for its value to be added.
inline XmlNode& add_feature(XmlNode& fs, const std::string& name) {
  return fs.add(XmlNode::element("f", {{"name", name}}));
}

inline XmlNode numeric(const std::string& value) { return XmlNode::element("numeric", {{"value", value}}); }
inline XmlNode numeric(double value) { return numeric(format_number(value)); }
inline XmlNode count(std::size_t value) { return numeric(std::to_string(value)); }
inline XmlNode binary(bool value) { return XmlNode::element("binary", {{"value", value ? "true" : "false"}}); }

// TEI symbol/@value is teidata.word: no spaces ("weighted centroid" -> "weighted-centroid").
inline XmlNode symbol(std::string value) {
  for (char& c : value)
    if (c == ' ') c = '-';
  return XmlNode::element("symbol", {{"value", value}});
}

// <f name="NAME"><vColl org="list"><string>..</string>...</vColl></f>; nothing when empty.
inline void add_strings(XmlNode& fs, const std::string& name, const std::vector<std::string>& values) {
  if (values.empty()) return;
  XmlNode& list = add_feature(fs, name).add(XmlNode::element("vColl", {{"org", "list"}}));
  for (const auto& v : values) list.add_text_element("string", v);
}

}  // namespace manicule::tei_fs
