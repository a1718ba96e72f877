// Helpers shared by the tokenizer tests: where Debian's Unicode data lives, UTF-8
// building, and crude text extraction from TEI files for comparing the two tokenizer paths.
#pragma once
#include <catch2/catch.hpp>
#include <unicode/utf8.h>

#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

namespace manicule::test {

// Debian's unicode-data package installs the Unicode Character Database here;
// MANICULE_UNICODE_DATA points elsewhere when set.
inline std::string unicode_data_file(const std::string& relative) {
  const char* dir = std::getenv("MANICULE_UNICODE_DATA");
  return std::string(dir ? dir : "/usr/share/unicode") + "/" + relative;
}

// The whole file, or "" with ok = false when it cannot be read.
inline std::string read_whole_file(const std::string& path, bool& ok) {
  std::ifstream in(path, std::ios::binary);
  ok = static_cast<bool>(in);
  std::ostringstream content;
  content << in.rdbuf();
  return content.str();
}

// The whole of a Unicode Character Database file (unicode_data_file); fails the test
// case, saying what to install, when it cannot be read.
inline std::string read_unicode_data(const std::string& relative) {
  const std::string path = unicode_data_file(relative);
  bool ok = false;
  std::string content = read_whole_file(path, ok);
  if (!ok) {
    FAIL("cannot read " << path << ": install Debian's unicode-data package "
                        << "(or point MANICULE_UNICODE_DATA at a Unicode data folder)");
  }
  return content;
}

// One line of a Unicode Character Database property file: "0041..005A ; ALetter # Lu ..."
// or "00AD ; Default_Ignorable_Code_Point # Cf SOFT HYPHEN"; `category` is the general
// category the comment gives (DerivedCoreProperties.txt writes it there), "" if none.
struct UnicodePropertyRange {
  char32_t first = 0, last = 0;
  std::string value, category;
};

inline std::vector<UnicodePropertyRange> unicode_property_ranges(const std::string& content) {
  std::vector<UnicodePropertyRange> out;
  std::istringstream lines(content);
  for (std::string line; std::getline(lines, line);) {
    const std::size_t hash = line.find('#');
    const std::string comment = hash == std::string::npos ? "" : line.substr(hash + 1);
    line = line.substr(0, hash);
    const std::size_t semicolon = line.find(';');
    if (semicolon == std::string::npos) continue;
    UnicodePropertyRange range;
    const std::string code_points = line.substr(0, semicolon);
    std::istringstream(line.substr(semicolon + 1)) >> range.value;
    std::istringstream(comment) >> range.category;
    const std::size_t dots = code_points.find("..");
    range.first = static_cast<char32_t>(std::stoul(code_points, nullptr, 16));
    range.last = dots == std::string::npos ? range.first
                                           : static_cast<char32_t>(std::stoul(code_points.substr(dots + 2), nullptr, 16));
    out.push_back(range);
  }
  return out;
}

inline void append_utf8(char32_t c, std::string& out) {
  char bytes[U8_MAX_LENGTH];
  int32_t length = 0;
  U8_APPEND_UNSAFE(bytes, length, c);
  out.append(bytes, static_cast<std::size_t>(length));
}

inline std::string utf8(char32_t c) {
  std::string out;
  append_utf8(c, out);
  return out;
}

// The character data after "<text" with every tag replaced by a space and the five
// predefined entities resolved: good enough to get real running text, not a TEI reader.
inline std::string crude_text_of(std::string_view xml) {
  const std::size_t body = xml.find("<text");
  if (body != std::string_view::npos) xml.remove_prefix(body);
  std::string out;
  out.reserve(xml.size());
  bool in_tag = false;
  for (std::size_t i = 0; i < xml.size(); ++i) {
    const char c = xml[i];
    if (in_tag) {
      if (c == '>') in_tag = false;
      continue;
    }
    if (c == '<') {
      in_tag = true;
      out += ' ';
      continue;
    }
    if (c == '&') {
      static const std::pair<std::string_view, char> entities[] = {
          {"&amp;", '&'}, {"&lt;", '<'}, {"&gt;", '>'}, {"&quot;", '"'}, {"&apos;", '\''}};
      bool resolved = false;
      for (const auto& [name, value] : entities) {
        if (xml.substr(i, name.size()) == name) {
          out += value;
          i += name.size() - 1;
          resolved = true;
          break;
        }
      }
      if (resolved) continue;
    }
    out += c;
  }
  return out;
}

}  // namespace manicule::test
