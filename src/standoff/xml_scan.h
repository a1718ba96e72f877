// XmlScan: an exact map of an XML document's markup by byte offset, so that results can be
// spliced into the original bytes without re-serialising anything. The scanner reads
// UTF-8 or any ASCII-compatible encoding (the caller converts UTF-16 first) and knows
// comments, processing instructions, CDATA sections, the DOCTYPE with its internal subset
// (quoted literals, comments and PIs inside it), attribute values holding '>' and
// entity references. It checks the nesting of tags but is no full XML parser: callers
// parse the result with libxml2 afterwards. Malformed markup throws Error(bad_input).
//
// An internal entity whose replacement text may hold markup ("markup entity") can hide
// elements from a byte-level view; the scan records where such entities are referenced
// so that callers can refuse to work where that matters.
#pragma once
#include <cstddef>
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

namespace manicule {

struct ScannedAttribute {
  std::string name;   // qualified name as written, e.g. "xml:id"
  std::string value;  // character and predefined entity references resolved
};

struct ScannedElement {
  std::string name;              // qualified name as written, e.g. "TEI" or "tei:TEI"
  std::size_t start_begin = 0;   // '<' of the start tag
  std::size_t start_end = 0;     // just after the start tag's '>' (or "/>")
  std::size_t end_begin = 0;     // '<' of the end tag (start_end for an empty-element tag)
  std::size_t end_end = 0;       // just after the whole element
  bool self_closing = false;     // written as <name/>: nothing can be inserted inside
  int parent = -1;               // index into ScannedDocument::elements
  int same_name_index = 1;       // 1-based among element siblings with the same local name
  // Where the parent's content before this element ends, not counting whitespace: a
  // point just after '>' or after a non-whitespace character.
  std::size_t preceding_content_end = 0;
  // Where this element's content ends, not counting trailing whitespace (start_end when
  // empty). Always just after '>' or after a non-whitespace character.
  std::size_t content_end = 0;
  bool other_content = false;    // text other than whitespace, comments, PIs or CDATA
  bool markup_entity = false;    // a markup entity is referenced directly in its content
  std::vector<int> children;     // element children in document order
  std::vector<ScannedAttribute> attributes;

  std::string_view local_name() const;
  std::string_view prefix() const;  // "" when unprefixed
  // Value of the attribute with this qualified name, or nullptr.
  const std::string* attribute(std::string_view qname) const;
};

struct ScannedDocument {
  std::size_t bom_size = 0;          // a UTF-8 byte-order mark at the start (kept as is)
  std::string declared_encoding;     // from the XML declaration, "" when none
  std::vector<ScannedElement> elements;  // document order; elements[0] is the root
  std::set<std::string> xml_ids;     // every xml:id value in the document
  bool markup_entity_in_root = false;  // a markup entity is referenced inside the root
  std::string newline = "\n";        // the first line end's: "\r\n" (CRLF) or "\r" (CR alone)

  const ScannedElement& root() const { return elements.front(); }
  // Element children of `parent` with this local name, in document order.
  std::vector<int> children_named(int parent, std::string_view local) const;
  int first_child_named(int parent, std::string_view local) const;  // -1 when none
};

ScannedDocument scan_xml(std::string_view bytes, const std::string& name_for_messages);

// The whitespace before `offset` on its line when only spaces and tabs precede it there.
std::optional<std::string> line_indent(std::string_view bytes, std::size_t offset);

}  // namespace manicule
