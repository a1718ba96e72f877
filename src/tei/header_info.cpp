#include "tei/header_info.h"

#include <unicode/unistr.h>

namespace manicule {

std::string normalise_space(const std::string& text) {
  std::string out;
  out.reserve(text.size());
  bool space = false;
  for (char c : text) {
    if (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
      space = !out.empty();
    } else {
      if (space) out.push_back(' ');
      space = false;
      out.push_back(c);
    }
  }
  return out;
}

std::string join_authors(const std::vector<std::string>& authors) {
  std::string out;
  for (const auto& a : authors) out += (out.empty() ? "" : "; ") + a;
  return out;
}

bool is_placeholder_name(const std::string& name) {
  std::string folded;
  icu::UnicodeString::fromUTF8(normalise_space(name)).foldCase().toUTF8String(folded);
  std::string bare;
  for (char c : folded) {
    if (c != '[' && c != ']' && c != '(' && c != ')' && c != '?' && c != '.' && c != ' ') bare += c;
  }
  static const char* const placeholders[] = {"",        "unknown", "nn",      "anonym",
                                             "anonymous", "anon",  "unbekannt", "anonyme",
                                             "inconnu", "ignoto",  "xx",      "x"};
  for (const char* p : placeholders) {
    if (bare == p) return true;
  }
  return false;
}

}  // namespace manicule
