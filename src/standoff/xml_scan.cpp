#include "standoff/xml_scan.h"

#include <algorithm>
#include <cstring>
#include <utility>

#include "core/error.h"
#include "standoff/utf8_codec.h"

namespace manicule {

std::string_view ScannedElement::local_name() const {
  std::string_view n(name);
  std::size_t colon = n.find(':');
  return colon == std::string_view::npos ? n : n.substr(colon + 1);
}

std::string_view ScannedElement::prefix() const {
  std::string_view n(name);
  std::size_t colon = n.find(':');
  return colon == std::string_view::npos ? std::string_view() : n.substr(0, colon);
}

const std::string* ScannedElement::attribute(std::string_view qname) const {
  for (const auto& a : attributes)
    if (a.name == qname) return &a.value;
  return nullptr;
}

std::vector<int> ScannedDocument::children_named(int parent, std::string_view local) const {
  std::vector<int> out;
  for (int c : elements[static_cast<std::size_t>(parent)].children)
    if (elements[static_cast<std::size_t>(c)].local_name() == local) out.push_back(c);
  return out;
}

int ScannedDocument::first_child_named(int parent, std::string_view local) const {
  for (int c : elements[static_cast<std::size_t>(parent)].children)
    if (elements[static_cast<std::size_t>(c)].local_name() == local) return c;
  return -1;
}

std::optional<std::string> line_indent(std::string_view bytes, std::size_t offset) {
  std::size_t i = offset;
  while (i > 0 && (bytes[i - 1] == ' ' || bytes[i - 1] == '\t')) --i;
  if (i == 0 || bytes[i - 1] == '\n' || bytes[i - 1] == '\r') return std::string(bytes.substr(i, offset - i));
  return std::nullopt;
}

namespace {

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

bool ends_name(char c) { return is_space(c) || c == '/' || c == '>' || c == '=' || c == '<'; }

bool is_predefined_entity(std::string_view name) {
  return name == "lt" || name == "gt" || name == "amp" || name == "quot" || name == "apos";
}

// Attribute values: character references and the five predefined entities resolved,
// whitespace characters normalised to spaces (XML 1.0, 3.3.3). Other references stay.
std::string decode_attribute(std::string_view raw) {
  std::string out;
  out.reserve(raw.size());
  for (std::size_t i = 0; i < raw.size(); ++i) {
    char c = raw[i];
    if (c == '&') {
      std::size_t semi = raw.find(';', i);
      if (semi != std::string_view::npos) {
        std::string_view ref = raw.substr(i + 1, semi - i - 1);
        if (!ref.empty() && ref[0] == '#') {
          bool hex = ref.size() > 1 && ref[1] == 'x';
          std::string digits(ref.substr(hex ? 2 : 1));
          unsigned long cp = std::strtoul(digits.c_str(), nullptr, hex ? 16 : 10);
          append_utf8(out, cp);
          i = semi;
          continue;
        }
        static const std::pair<std::string_view, char> predefined[] = {
            {"lt", '<'}, {"gt", '>'}, {"amp", '&'}, {"quot", '"'}, {"apos", '\''}};
        bool done = false;
        for (const auto& [name, ch] : predefined) {
          if (ref == name) {
            out += ch;
            i = semi;
            done = true;
            break;
          }
        }
        if (done) continue;
      }
    }
    out += (c == '\t' || c == '\n' || c == '\r') ? ' ' : c;
  }
  return out;
}

class Scanner {
 public:
  Scanner(std::string_view bytes, const std::string& name) : b_(bytes), name_(name) {}

  ScannedDocument run() {
    if (b_.size() >= 3 && b_.compare(0, 3, "\xEF\xBB\xBF") == 0) doc_.bom_size = 3;
    p_ = doc_.bom_size;
    // The file's own line end, for the lines added: CRLF, LF, or CR alone (an old Mac's;
    // XML 1.0 2.11 reads all three as one).
    const std::size_t first_line_end = b_.find_first_of("\r\n");
    if (first_line_end != std::string_view::npos && b_[first_line_end] == '\r')
      doc_.newline = first_line_end + 1 < b_.size() && b_[first_line_end + 1] == '\n' ? "\r\n" : "\r";
    if (starts("<?xml") && p_ + 5 < b_.size() && is_space(b_[p_ + 5])) xml_declaration();
    while (p_ < b_.size()) {
      if (b_[p_] != '<') {
        text();
      } else if (starts("<!--")) {
        std::size_t end = find("-->", p_ + 4, "comment");
        p_ = end + 3;
        note_content(p_, true);
      } else if (starts("<?")) {
        std::size_t end = find("?>", p_ + 2, "processing instruction");
        p_ = end + 2;
        note_content(p_, true);
      } else if (starts("<![CDATA[")) {
        if (open_.empty()) fail(p_, "CDATA section outside the root element");
        std::size_t end = find("]]>", p_ + 9, "CDATA section");
        p_ = end + 3;
        note_content(p_, true);
      } else if (starts("<!DOCTYPE")) {
        if (root_seen_) fail(p_, "DOCTYPE after the root element");
        doctype();
      } else if (starts("</")) {
        end_tag();
      } else {
        start_tag();
      }
    }
    if (!root_seen_) fail(p_, "no root element");
    if (!open_.empty()) fail(b_.size(), "the file ends inside <" + doc_.elements[open_.back()].name + ">");
    return std::move(doc_);
  }

 private:
  [[noreturn]] void fail(std::size_t at, const std::string& what) const {
    long line = 1 + static_cast<long>(std::count(b_.begin(), b_.begin() + static_cast<std::ptrdiff_t>(std::min(at, b_.size())), '\n'));
    throw Error(ErrorKind::bad_input, "malformed XML: " + what, name_, line);
  }

  bool starts(std::string_view s) const { return b_.compare(p_, s.size(), s) == 0; }

  std::size_t find(std::string_view s, std::size_t from, const char* what) const {
    std::size_t at = b_.find(s, from);
    if (at == std::string_view::npos) fail(p_, std::string("unterminated ") + what);
    return at;
  }

  void skip_space() {
    while (p_ < b_.size() && is_space(b_[p_])) ++p_;
  }

  std::string_view read_name() {
    std::size_t s = p_;
    while (p_ < b_.size() && !ends_name(b_[p_])) ++p_;
    if (p_ == s) fail(s, "a name was expected");
    return b_.substr(s, p_ - s);
  }

  // A quoted literal starting at p_; returns its content and moves past it.
  std::string_view literal() {
    char q = b_[p_];
    std::size_t end = b_.find(q, p_ + 1);
    if (end == std::string_view::npos) fail(p_, "unterminated quoted value");
    std::string_view v = b_.substr(p_ + 1, end - p_ - 1);
    p_ = end + 1;
    return v;
  }

  // Moves past the next '>' that is not inside a quoted literal.
  void skip_declaration() {
    while (p_ < b_.size()) {
      char c = b_[p_];
      if (c == '"' || c == '\'') {
        literal();
      } else if (c == '>') {
        ++p_;
        return;
      } else {
        ++p_;
      }
    }
    fail(p_, "unterminated declaration");
  }

  void note_content(std::size_t end, bool other) {
    if (open_.empty()) return;
    ScannedElement& e = doc_.elements[static_cast<std::size_t>(open_.back())];
    e.content_end = end;
    if (other) e.other_content = true;
  }

  void xml_declaration() {
    std::size_t end = find("?>", p_, "XML declaration");
    std::string_view decl = b_.substr(p_, end - p_);
    std::size_t at = decl.find("encoding");
    if (at != std::string_view::npos) {
      std::size_t q = decl.find_first_of("\"'", at);
      if (q != std::string_view::npos) {
        std::size_t qe = decl.find(decl[q], q + 1);
        if (qe != std::string_view::npos) doc_.declared_encoding = std::string(decl.substr(q + 1, qe - q - 1));
      }
    }
    p_ = end + 2;
  }

  void doctype() {
    p_ += 9;
    while (p_ < b_.size()) {
      char c = b_[p_];
      if (c == '"' || c == '\'') {
        literal();
      } else if (c == '[') {
        ++p_;
        internal_subset();
      } else if (c == '>') {
        ++p_;
        return;
      } else {
        ++p_;
      }
    }
    fail(p_, "unterminated DOCTYPE");
  }

  void internal_subset() {
    while (true) {
      skip_space();
      if (p_ >= b_.size()) fail(p_, "unterminated DOCTYPE internal subset");
      if (b_[p_] == ']') {
        ++p_;
        return;
      }
      if (starts("<!--")) {
        p_ = find("-->", p_ + 4, "comment") + 3;
      } else if (starts("<?")) {
        p_ = find("?>", p_ + 2, "processing instruction") + 2;
      } else if (starts("<!ENTITY")) {
        entity_declaration();
      } else if (starts("<!")) {
        skip_declaration();
      } else if (b_[p_] == '%') {
        // A parameter entity may declare general entities we cannot see.
        p_ = find(";", p_, "parameter entity reference") + 1;
        unknown_entities_ = true;
      } else {
        fail(p_, "unexpected content in the DOCTYPE internal subset");
      }
    }
  }

  void entity_declaration() {
    p_ += 8;
    skip_space();
    bool parameter = false;
    if (p_ < b_.size() && b_[p_] == '%') {
      parameter = true;
      ++p_;
      skip_space();
    }
    std::string name(read_name());
    skip_space();
    if (p_ < b_.size() && (b_[p_] == '"' || b_[p_] == '\'')) {
      std::string_view value = literal();
      bool markup = value.find_first_of("<&") != std::string_view::npos;
      if (!parameter && !declared_.count(name)) {
        declared_.insert(name);
        if (markup) markup_entities_.insert(name);
      }
    } else if (!parameter && !declared_.count(name)) {
      declared_.insert(name);  // external: its content is unknown here
      markup_entities_.insert(name);
    }
    skip_declaration();
  }

  bool is_markup_entity(std::string_view name) const {
    if (is_predefined_entity(name)) return false;
    if (unknown_entities_) return true;
    std::string n(name);
    return !declared_.count(n) || markup_entities_.count(n);
  }

  void text() {
    const char* start = b_.data() + p_;
    const void* lt = std::memchr(start, '<', b_.size() - p_);
    std::size_t end = lt ? static_cast<std::size_t>(static_cast<const char*>(lt) - b_.data()) : b_.size();
    std::size_t last = end;
    while (last > p_ && is_space(b_[last - 1])) --last;
    if (last > p_) {
      if (open_.empty()) fail(p_, "text outside the root element");
      note_content(last, true);
      std::string_view content = b_.substr(0, last);  // search this text node only
      for (std::size_t amp = content.find('&', p_); amp != std::string_view::npos; amp = content.find('&', amp + 1)) {
        std::size_t semi = b_.find(';', amp);
        if (semi == std::string_view::npos || semi > end) fail(amp, "unterminated entity reference");
        std::string_view ref = b_.substr(amp + 1, semi - amp - 1);
        if (!ref.empty() && ref[0] != '#' && is_markup_entity(ref)) {
          doc_.elements[static_cast<std::size_t>(open_.back())].markup_entity = true;
          doc_.markup_entity_in_root = true;
        }
      }
    }
    p_ = end;
  }

  void start_tag() {
    std::size_t begin = p_;
    ++p_;
    ScannedElement e;
    e.name = std::string(read_name());
    e.start_begin = begin;
    while (true) {
      skip_space();
      if (p_ >= b_.size()) fail(begin, "unterminated start tag <" + e.name + ">");
      if (starts("/>")) {
        p_ += 2;
        e.self_closing = true;
        break;
      }
      if (b_[p_] == '>') {
        ++p_;
        break;
      }
      ScannedAttribute a;
      a.name = std::string(read_name());
      skip_space();
      if (p_ >= b_.size() || b_[p_] != '=') fail(p_, "'=' expected after attribute " + a.name);
      ++p_;
      skip_space();
      if (p_ >= b_.size() || (b_[p_] != '"' && b_[p_] != '\'')) fail(p_, "quoted value expected for " + a.name);
      std::string_view raw = literal();
      if (raw.find('<') != std::string_view::npos) fail(p_, "'<' in the value of " + a.name);
      a.value = decode_attribute(raw);
      if (a.name == "xml:id") doc_.xml_ids.insert(a.value);
      e.attributes.push_back(std::move(a));
    }
    e.start_end = p_;
    e.content_end = p_;
    int index = static_cast<int>(doc_.elements.size());
    if (open_.empty()) {
      if (root_seen_) fail(begin, "a second root element <" + e.name + ">");
      root_seen_ = true;
      e.preceding_content_end = begin;
    } else {
      ScannedElement& parent = doc_.elements[static_cast<std::size_t>(open_.back())];
      e.parent = open_.back();
      e.preceding_content_end = parent.content_end;
      parent.children.push_back(index);
      auto& counts = name_counts_.back();
      std::string local(e.local_name());
      auto it = std::find_if(counts.begin(), counts.end(), [&](const auto& c) { return c.first == local; });
      if (it == counts.end()) {
        counts.emplace_back(local, 1);
        e.same_name_index = 1;
      } else {
        e.same_name_index = ++it->second;
      }
    }
    bool self_closing = e.self_closing;
    if (self_closing) {
      e.end_begin = p_;
      e.end_end = p_;
    }
    doc_.elements.push_back(std::move(e));
    if (self_closing) {
      note_content(p_, false);
    } else {
      open_.push_back(index);
      name_counts_.emplace_back();
    }
  }

  void end_tag() {
    std::size_t begin = p_;
    p_ += 2;
    std::string_view name = read_name();
    skip_space();
    if (p_ >= b_.size() || b_[p_] != '>') fail(begin, "unterminated end tag");
    ++p_;
    if (open_.empty()) fail(begin, "end tag </" + std::string(name) + "> without a start tag");
    ScannedElement& e = doc_.elements[static_cast<std::size_t>(open_.back())];
    if (e.name != name) fail(begin, "end tag </" + std::string(name) + "> does not close <" + e.name + ">");
    e.end_begin = begin;
    e.end_end = p_;
    open_.pop_back();
    name_counts_.pop_back();
    note_content(p_, false);
  }

  std::string_view b_;
  const std::string& name_;
  std::size_t p_ = 0;
  ScannedDocument doc_;
  std::vector<int> open_;
  std::vector<std::vector<std::pair<std::string, int>>> name_counts_;
  std::set<std::string> declared_, markup_entities_;
  bool unknown_entities_ = false;
  bool root_seen_ = false;
};

}  // namespace

ScannedDocument scan_xml(std::string_view bytes, const std::string& name_for_messages) {
  return Scanner(bytes, name_for_messages).run();
}

}  // namespace manicule
