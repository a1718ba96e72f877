#include "text/caseless_match.h"

#include <unicode/normalizer2.h>
#include <unicode/uchar.h>
#include <unicode/unistr.h>

#include "text/word_characters.h"

namespace manicule {

std::u32string caseless_code_points(std::string_view utf8) {
  icu::UnicodeString text =
      icu::UnicodeString::fromUTF8(icu::StringPiece(utf8.data(), static_cast<int32_t>(utf8.size())));
  UErrorCode status = U_ZERO_ERROR;
  const icu::Normalizer2* nfc = icu::Normalizer2::getNFCInstance(status);
  if (U_SUCCESS(status)) {
    icu::UnicodeString composed = nfc->normalize(text, status);
    if (U_SUCCESS(status)) text = composed;
  }
  std::u32string out;
  out.reserve(static_cast<std::size_t>(text.length()));
  for (int32_t i = 0; i < text.length(); i = text.moveIndex32(i, 1)) {
    UChar32 c = text.char32At(i);
    // The apostrophe typed and typeset alike (’ ʼ ＇): "O'Neill", "O’Neill". (Not ‘, an
    // opening quotation mark in titles.)
    if (c == 0x2019 || c == 0x02BC || c == 0xFF07) c = '\'';
    out.push_back(static_cast<char32_t>(u_foldCase(c, U_FOLD_CASE_DEFAULT)));
  }
  return out;
}

std::string caseless_form(std::string_view utf8) {
  const std::u32string code_points = caseless_code_points(utf8);
  std::string out;
  icu::UnicodeString::fromUTF32(reinterpret_cast<const UChar32*>(code_points.data()),
                                static_cast<int32_t>(code_points.size()))
      .toUTF8String(out);
  return out;
}

bool caseless_contains(std::string_view text, std::string_view part) {
  return caseless_code_points(text).find(caseless_code_points(part)) != std::u32string::npos;
}

namespace {

// Whether a word goes on through `c`: not in scripts written without spaces between words
// (Han, kana, Thai and its neighbours), where a name is found inside a longer run of
// letters: "海風" in "潮見海風".
bool continues_word(char32_t c) { return is_word_character(c) && !is_written_without_spaces(c); }

}  // namespace

bool caseless_contains_word(std::string_view text_utf8, std::string_view word_utf8) {
  const std::u32string text = caseless_code_points(text_utf8);
  const std::u32string word = caseless_code_points(word_utf8);
  if (word.empty()) return false;
  for (std::size_t at = text.find(word); at != std::u32string::npos; at = text.find(word, at + 1)) {
    const std::size_t end = at + word.size();
    // A word that itself begins or ends with a non-letter ("F.") needs no boundary there.
    const bool starts_clean = at == 0 || !continues_word(word.front()) || !continues_word(text[at - 1]);
    const bool ends_clean = end == text.size() || !continues_word(word.back()) || !continues_word(text[end]);
    if (starts_clean && ends_clean) return true;
  }
  return false;
}

bool caseless_pattern_match(std::string_view pattern_utf8, std::string_view text_utf8) {
  const std::u32string pattern = caseless_code_points(pattern_utf8);
  const std::u32string text = caseless_code_points(text_utf8);
  // Greedy with a return to the last '*': linear in practice, never exponential.
  std::size_t p = 0, t = 0, star = std::u32string::npos, star_text = 0;
  while (t < text.size()) {
    if (p < pattern.size() && (pattern[p] == U'?' || (pattern[p] != U'*' && pattern[p] == text[t]))) {
      ++p;
      ++t;
    } else if (p < pattern.size() && pattern[p] == U'*') {
      star = p++;
      star_text = t;
    } else if (star != std::u32string::npos) {
      p = star + 1;
      t = ++star_text;
    } else {
      return false;
    }
  }
  while (p < pattern.size() && pattern[p] == U'*') ++p;
  return p == pattern.size();
}

}  // namespace manicule
