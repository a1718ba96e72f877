#include "attribution/label_file.h"

#include <map>

#include "core/error.h"
#include "core/regular_file.h"

namespace manicule {

namespace {

std::string trimmed(const std::string& s) {
  const std::size_t first = s.find_first_not_of(" \t\r");
  if (first == std::string::npos) return {};
  return s.substr(first, s.find_last_not_of(" \t\r") - first + 1);
}

// Splits one CSV record starting at `pos` (which it advances past the record's line end).
// Quoted fields may hold commas and line breaks; `line` counts the lines consumed.
std::vector<std::string> read_record(std::string_view text, std::size_t& pos, std::size_t& line,
                                     const std::string& source) {
  std::vector<std::string> fields(1);
  const std::size_t first_line = line;
  bool quoted = false, was_quoted = false;
  while (pos < text.size()) {
    const char c = text[pos++];
    if (quoted) {
      if (c == '"' && pos < text.size() && text[pos] == '"') {
        fields.back() += '"';
        ++pos;
      } else if (c == '"') {
        quoted = false;
      } else {
        if (c == '\n') ++line;
        fields.back() += c;
      }
    } else if (c == '"' && trimmed(fields.back()).empty() && !was_quoted) {
      fields.back().clear();
      quoted = was_quoted = true;
    } else if (c == ',') {
      fields.emplace_back();
      was_quoted = false;
    } else if (c == '\n') {
      ++line;
      return fields;
    } else {
      fields.back() += c;
    }
  }
  if (quoted) throw Error(ErrorKind::bad_input, "a quoted field is never closed", source, static_cast<long>(first_line));
  ++line;
  return fields;
}

}  // namespace

std::vector<LabelOverride> parse_label_file(std::string_view text, const std::string& source) {
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  std::vector<LabelOverride> out;
  std::map<std::string, std::size_t> seen;
  std::size_t pos = 0, line = 1;
  bool first_record = true;
  while (pos < text.size()) {
    const std::size_t at = line;
    const std::size_t line_end = text.find('\n', pos);
    const std::string raw = trimmed(std::string(text.substr(pos, line_end == std::string_view::npos ? std::string_view::npos : line_end - pos)));
    if (raw.empty() || raw[0] == '#') {
      pos = line_end == std::string_view::npos ? text.size() : line_end + 1;
      ++line;
      continue;
    }
    std::vector<std::string> fields = read_record(text, pos, line, source);
    for (auto& f : fields) f = trimmed(f);
    const bool header = first_record && fields.size() == 2 && fields[0] == "segment" && fields[1] == "label";
    first_record = false;
    if (header) continue;
    if (fields.size() != 2) {
      throw Error(ErrorKind::bad_input,
                  "expected two fields, segment,label; found " + std::to_string(fields.size()) +
                      " (quote a label that holds a comma)",
                  source, static_cast<long>(at));
    }
    if (fields[0].empty()) throw Error(ErrorKind::bad_input, "the segment id is empty", source, static_cast<long>(at));
    if (auto it = seen.find(fields[0]); it != seen.end()) {
      throw Error(ErrorKind::bad_input,
                  "segment '" + fields[0] + "' is labelled twice (first on line " + std::to_string(it->second) + ")",
                  source, static_cast<long>(at));
    }
    seen.emplace(fields[0], at);
    out.push_back(LabelOverride{fields[0], fields[1], at, source});
  }
  // An empty file is most likely the wrong file: the run would silently use the edition.
  if (out.empty()) throw Error(ErrorKind::bad_input, "no labelled row (expected lines 'segment,label')", source);
  return out;
}

std::vector<LabelOverride> load_label_file(const std::string& path) {
  return parse_label_file(read_regular_file(path, "the labels file"), path);  // a pipe or a folder is refused
}

}  // namespace manicule
