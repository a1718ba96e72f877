// Hardened, streaming XML input: libxml2's SAX2 push parser fed in chunks, so memory does
// not grow with file size. Security: no network (XML_PARSE_NONET), no external DTD, no
// external entity is ever loaded (refused with an error), internal entities are expanded
// under libxml2's amplification limits (no XML_PARSE_HUGE) and an allowance of our own for
// their replacement text, and elements nest at most 10,000 deep (the push parser has no limit).
// UTF-8 and UTF-16 (with byte-order mark or declaration) are accepted.
#pragma once
#include <libxml/xmlstring.h>
#include <cstddef>
#include <string>
#include <string_view>

namespace manicule {

inline constexpr std::string_view kTeiNamespace = "http://www.tei-c.org/ns/1.0";
inline constexpr std::string_view kXmlNamespace = "http://www.w3.org/XML/1998/namespace";

// One start tag as libxml2 reports it; valid only during the callback.
struct StartTag {
  std::string_view local;
  std::string_view ns;
  bool in_tei_namespace = false;  // ns == kTeiNamespace, worked out once per distinct ns
  long line = 0;
  const xmlChar** attributes = nullptr;  // libxml2 SAX2 layout: 5 pointers per attribute
  int attribute_count = 0;
  // Value of the attribute with this local name and namespace ("" = no namespace);
  // empty view when absent.
  std::string_view attribute(std::string_view local_name, std::string_view ns_uri = {}) const;
  bool has_attribute(std::string_view local_name, std::string_view ns_uri = {}) const;
  bool is_tei(std::string_view name) const { return in_tei_namespace && local == name; }
};

class XmlEventHandler {
 public:
  virtual ~XmlEventHandler() = default;
  virtual void start(const StartTag& tag) = 0;
  virtual void end() = 0;
  virtual void text(std::string_view chars) = 0;
};

// Where the bytes come from: a file on disk, or a buffer owned by the caller.
struct XmlSource {
  std::string name;          // shown in messages (the path, or a host's document name)
  const char* data = nullptr;  // when set, parse this buffer instead of reading `name`
  std::size_t size = 0;
  static XmlSource file(std::string path) { return XmlSource{std::move(path), nullptr, 0}; }
  static XmlSource buffer(std::string name, const char* bytes, std::size_t n) {
    return XmlSource{std::move(name), bytes, n};
  }
};

// What parsing saw of the raw bytes: their size and SHA-256 (computed on the way, so
// provenance and the archive store need not read the file again).
struct SourceDigest {
  std::size_t bytes = 0;
  std::string sha256;
};

// Parses the whole source, calling the handler. Throws Error(bad_input) naming file, line
// and column for unreadable, empty, malformed or hostile input. The handler may throw to
// stop early (its exception is passed on).
SourceDigest parse_xml(const XmlSource& source, XmlEventHandler& handler);

}  // namespace manicule
