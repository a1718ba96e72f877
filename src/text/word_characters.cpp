#include "text/word_characters.h"

#include <array>

#include <unicode/uchar.h>
#include <unicode/uscript.h>
#include <unicode/utf8.h>

namespace manicule {

bool is_word_character(char32_t c) {
  const auto code = static_cast<UChar32>(c);
  const auto kind = u_charType(code);
  return u_hasBinaryProperty(code, UCHAR_ALPHABETIC) || u_isdigit(code) || kind == U_NON_SPACING_MARK ||
         kind == U_COMBINING_SPACING_MARK;
}

bool is_written_without_spaces(char32_t c) {
  // By Script_Extensions, so that characters the scripts share count too: the prolonged
  // sound mark ー (U+30FC, script Common, used by hiragana and katakana).
  for (UScriptCode script : {USCRIPT_HAN, USCRIPT_HIRAGANA, USCRIPT_KATAKANA, USCRIPT_THAI, USCRIPT_LAO,
                             USCRIPT_KHMER, USCRIPT_MYANMAR})
    if (uscript_hasScript(static_cast<UChar32>(c), script)) return true;
  return false;
}

namespace {

// The code points of one and two bytes in UTF-8 (below U+0800: Latin, Greek, Cyrillic,
// Hebrew, Arabic and the rest), answered from a table made once by the same ICU calls.
// The count runs over every word of a segment whose text is in several languages (a play's
// speaker quoting French), where asking ICU for two properties of each character cost
// about 3 % of the CPU of reading the plays of the test corpora.
constexpr char32_t kTabled = 0x800;

enum class WordKind : unsigned char { none, spaced, unspaced };

WordKind word_kind(char32_t c) {
  if (!is_word_character(c)) return WordKind::none;
  return is_written_without_spaces(c) ? WordKind::unspaced : WordKind::spaced;
}

WordKind tabled_word_kind(char32_t c) {
  static const std::array<WordKind, kTabled> table = [] {
    std::array<WordKind, kTabled> kinds{};
    for (char32_t code = 0; code < kTabled; ++code) kinds[code] = word_kind(code);
    return kinds;
  }();
  return table[c];
}

}  // namespace

std::size_t rough_word_count(std::string_view utf8) {
  std::size_t words = 0;
  bool in_word = false;
  const auto* bytes = reinterpret_cast<const uint8_t*>(utf8.data());
  const auto length = static_cast<int32_t>(utf8.size());
  for (int32_t i = 0; i < length;) {
    UChar32 c;
    U8_NEXT(bytes, i, length, c);
    const WordKind kind = c < 0                                  ? WordKind::none
                          : static_cast<char32_t>(c) < kTabled ? tabled_word_kind(static_cast<char32_t>(c))
                                                                 : word_kind(static_cast<char32_t>(c));
    if (kind == WordKind::none) {
      in_word = false;
    } else if (kind == WordKind::unspaced) {
      ++words;
      in_word = false;
    } else {
      if (!in_word) ++words;
      in_word = true;
    }
  }
  return words;
}

bool ends_in_spaced_word_character(std::string_view utf8) {
  if (utf8.empty()) return false;
  const auto* bytes = reinterpret_cast<const uint8_t*>(utf8.data());
  int32_t i = static_cast<int32_t>(utf8.size());
  UChar32 c;
  U8_PREV(bytes, 0, i, c);
  return c >= 0 && is_word_character(static_cast<char32_t>(c)) && !is_written_without_spaces(static_cast<char32_t>(c));
}

}  // namespace manicule
