// The rough word count that decides a segment's main language, checked code point by code
// point against the Unicode Character Database (Debian's unicode-data, Unicode 15.0, the
// version of ICU 72): the table that answers below U+0800 and the ICU calls above it must
// both give what the data files say.
#include <catch2/catch.hpp>

#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "test_tokenizer_support.h"
#include "text/word_characters.h"

namespace {

// Script_Extensions of each code point that has them (ScriptExtensions.txt: "0951 ; Beng
// Deva ..."), as the set of short script names.
std::vector<std::set<std::string>> script_extensions() {
  std::vector<std::set<std::string>> out(0x110000);
  std::istringstream lines(manicule::test::read_unicode_data("ScriptExtensions.txt"));
  for (std::string line; std::getline(lines, line);) {
    line = line.substr(0, line.find('#'));
    const std::size_t semicolon = line.find(';');
    if (semicolon == std::string::npos) continue;
    const std::string code_points = line.substr(0, semicolon);
    const std::size_t dots = code_points.find("..");
    const auto first = static_cast<char32_t>(std::stoul(code_points, nullptr, 16));
    const auto last =
        dots == std::string::npos ? first : static_cast<char32_t>(std::stoul(code_points.substr(dots + 2), nullptr, 16));
    std::istringstream names(line.substr(semicolon + 1));
    std::set<std::string> scripts;
    for (std::string name; names >> name;) scripts.insert(name);
    for (char32_t c = first; c <= last; ++c) out[c] = scripts;
  }
  return out;
}

}  // namespace

TEST_CASE("rough word count: every code point as the Unicode data files class it", "[word-characters]") {
  // Source: DerivedCoreProperties.txt (Alphabetic), extracted/DerivedGeneralCategory.txt (Nd,
  // Mn, Mc), Scripts.txt and ScriptExtensions.txt (Unicode 15.0). A word character is
  // Alphabetic, a decimal digit or a combining mark; one of Han, Hiragana, Katakana, Thai,
  // Lao, Khmer or Myanmar (by Script_Extensions, else Script) is a word on its own.
  std::vector<bool> word(0x110000, false);
  for (const auto& range : manicule::test::unicode_property_ranges(
           manicule::test::read_unicode_data("DerivedCoreProperties.txt")))
    if (range.value == "Alphabetic")
      for (char32_t c = range.first; c <= range.last; ++c) word[c] = true;
  for (const auto& range : manicule::test::unicode_property_ranges(
           manicule::test::read_unicode_data("extracted/DerivedGeneralCategory.txt")))
    if (range.value == "Nd" || range.value == "Mn" || range.value == "Mc")
      for (char32_t c = range.first; c <= range.last; ++c) word[c] = true;

  const std::set<std::string> unspaced_long = {"Han", "Hiragana", "Katakana", "Thai", "Lao", "Khmer", "Myanmar"};
  const std::set<std::string> unspaced_short = {"Hani", "Hira", "Kana", "Thai", "Laoo", "Khmr", "Mymr"};
  std::vector<bool> unspaced(0x110000, false);
  for (const auto& range :
       manicule::test::unicode_property_ranges(manicule::test::read_unicode_data("Scripts.txt")))
    if (unspaced_long.count(range.value))
      for (char32_t c = range.first; c <= range.last; ++c) unspaced[c] = true;
  const auto extensions = script_extensions();
  for (char32_t c = 0; c < 0x110000; ++c) {
    if (extensions[c].empty()) continue;  // Script_Extensions is the Script
    unspaced[c] = false;
    for (const auto& name : extensions[c])
      if (unspaced_short.count(name)) unspaced[c] = true;
  }

  // "a", the code point, "a": a word character written with spaces joins the two letters
  // (1 word), one written without spaces is a word between them (3), any other parts them (2).
  int spaced_words = 0, unspaced_words = 0, mismatches = 0;
  for (char32_t c = 1; c < 0x110000; ++c) {
    if (c >= 0xD800 && c <= 0xDFFF) continue;  // surrogates: no UTF-8 form
    const std::size_t expected = !word[c] ? 2 : unspaced[c] ? 3 : 1;
    const std::size_t got = manicule::rough_word_count("a" + manicule::test::utf8(c) + "a");
    if (got != expected) {
      ++mismatches;
      if (mismatches <= 10) {
        INFO("U+" << std::hex << static_cast<unsigned>(c));
        CHECK(got == expected);
      }
    }
    if (expected == 1) ++spaced_words;
    if (expected == 3) ++unspaced_words;
  }
  CHECK(mismatches == 0);
  // Unicode 15.0 has some 137,000 Alphabetic code points, over 98,000 of them Han.
  CHECK(spaced_words > 30000);
  CHECK(unspaced_words > 90000);
}

TEST_CASE("rough word count: runs of words in several scripts", "[word-characters]") {
  // Counted by hand: three Latin words (one with a combining acute inside, one ending in a
  // digit), the dash parting nothing, a Greek and a Hebrew word: 5; then three Han characters
  // and two hiragana, a word each: 5 more.
  CHECK(manicule::rough_word_count("Caf\xCC\x81" "e, mon ami3 \xE2\x80\x94 λόγος שלום 東京都でも") == 10);
}
