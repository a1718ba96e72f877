// What sub-corpora compare header text and languages with (text/caseless_match.h,
// text/language_tags.h), against Unicode's CaseFolding.txt (Debian package unicode-data)
// and the ISO 639-2 code table of Debian's iso-codes package.
#include <catch2/catch.hpp>

#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>
#include <unicode/normalizer2.h>
#include <unicode/unistr.h>

#include "test_tokenizer_support.h"
#include "text/caseless_match.h"
#include "text/language_tags.h"

using namespace manicule;
using manicule::test::read_whole_file;
using manicule::test::read_unicode_data;
using manicule::test::utf8;

namespace {

bool is_nfc(char32_t c) {
  UErrorCode status = U_ZERO_ERROR;
  const icu::Normalizer2* nfc = icu::Normalizer2::getNFCInstance(status);
  return nfc->isNormalized(icu::UnicodeString(static_cast<UChar32>(c)), status) && U_SUCCESS(status);
}

}  // namespace

TEST_CASE("caseless_code_points folds each character as CaseFolding.txt's C and S lines say",
          "[caseless]") {
  // "<code>; <status>; <mapping>; # <name>": C (common) and S (simple) give the one-to-one
  // folding; F (full) and T (Turkic) lines are not used.
  const std::string content = read_unicode_data("CaseFolding.txt");
  std::istringstream lines(content);
  std::size_t checked = 0;
  for (std::string line; std::getline(lines, line);) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    std::string code, status, mapping;
    std::getline(fields, code, ';');
    std::getline(fields, status, ';');
    std::getline(fields, mapping, ';');
    if (status != " C" && status != " S") continue;
    const auto from = static_cast<char32_t>(std::stoul(code, nullptr, 16));
    const auto to = static_cast<char32_t>(std::stoul(mapping, nullptr, 16));
    // A character that NFC replaces (KELVIN SIGN -> K) is folded after that replacement.
    if (!is_nfc(from)) continue;
    INFO("CaseFolding.txt line: " << line);
    CHECK(caseless_code_points(utf8(from)) == std::u32string(1, to));
    ++checked;
  }
  CHECK(checked > 1400);  // CaseFolding-15.0.0.txt has 1,454 C and S lines: the file was read
}

TEST_CASE("caseless_contains and caseless_pattern_match", "[caseless]") {
  // Worked examples (common practice for shell patterns, no source: '*' any run, '?' one
  // character).
  CHECK(caseless_contains("Ödön von Horváth", "ÖDÖN"));
  CHECK(caseless_contains("Ödön von Horváth", "horváth"));
  CHECK_FALSE(caseless_contains("Ödön von Horváth", "horvath"));  // accents are not letter case
  // NFD input (o + U+0308) finds NFC text and the other way round.
  CHECK(caseless_contains("O\xCC\x88" "d\xC3\xB6n", "\xC3\x96" "D\xC3\x96N"));
  CHECK(caseless_pattern_match("*R?UBER*", "Die Räuber"));
  CHECK(caseless_pattern_match("die r?uber", "Die Räuber"));
  CHECK_FALSE(caseless_pattern_match("die r??uber", "Die Räuber"));  // ä is one character, not two bytes
  CHECK(caseless_pattern_match("*", ""));
  CHECK(caseless_pattern_match("a*b*c", "aXbYbZc"));
  CHECK_FALSE(caseless_pattern_match("a*b*c", "aXbYbZ"));
  CHECK_FALSE(caseless_pattern_match("Brief", "Briefe"));  // the whole title must match
  // Brackets are plain characters, not a class: titles hold them ("[Ohne Titel]").
  CHECK(caseless_pattern_match("[ohne titel]", "[Ohne Titel]"));
  CHECK_FALSE(caseless_pattern_match("[ot]", "o"));
}

TEST_CASE("each ISO 639-2 language has one canonical tag for all its codes", "[language]") {
  const std::string path = "/usr/share/iso-codes/json/iso_639-2.json";
  bool ok = false;
  const std::string content = read_whole_file(path, ok);
  if (!ok) FAIL("cannot read " << path << ": install Debian's iso-codes package");
  const auto table = nlohmann::json::parse(content).at("639-2");
  // CLDR's language aliases (common/supplemental/supplementalMetadata.xml, languageAlias;
  // from memory, not read here) put a few codes under another language's: Bihari under
  // Bhojpuri, Tagalog under Filipino, Twi under Akan. For every other language with a
  // two-letter code, that code is the canonical tag.
  const std::map<std::string, std::string> replaced{{"bh", "bho"}, {"tl", "fil"}, {"tw", "ak"}};
  std::size_t languages = 0;
  for (const auto& entry : table) {
    if (!entry.contains("alpha_2")) continue;
    const std::string alpha_2 = entry.at("alpha_2");
    const std::string expected = replaced.count(alpha_2) ? replaced.at(alpha_2) : alpha_2;
    for (const char* key : {"alpha_2", "alpha_3", "bibliographic"}) {
      if (!entry.contains(key)) continue;
      const std::string code = entry.at(key);
      INFO(entry.at("name").get<std::string>() << ": " << key << " " << code);
      CHECK(canonical_language_tag(code) == expected);
      std::string upper = code;
      for (char& c : upper) c = static_cast<char>(c - 'a' + 'A');
      CHECK(canonical_language_tag(upper) == expected);
      CHECK(LanguageRange(alpha_2).holds(code));
      CHECK(LanguageRange(code).holds(alpha_2 + "-AT"));
    }
    ++languages;
  }
  CHECK(languages > 180);
}

TEST_CASE("a language range holds the tags that extend it (RFC 4647 3.3.1)", "[language]") {
  // RFC 4647 section 3.3.1, basic filtering: a range matches a tag equal to it or extending
  // it at a hyphen, case ignored; "de-de" matches "de-DE-1996", not "de-Deva" (from memory
  // of the RFC's example).
  CHECK(LanguageRange("de-de").holds("de-DE-1996"));
  CHECK_FALSE(LanguageRange("de-de").holds("de-Deva"));
  CHECK(LanguageRange("en").holds("en-GB"));
  CHECK(LanguageRange("eng").holds("en-GB"));
  CHECK_FALSE(LanguageRange("en-GB").holds("en"));
  CHECK_FALSE(LanguageRange("en").holds("enm"));  // Middle English is another language
  CHECK_FALSE(LanguageRange("de").holds(""));     // unknown lies in no range
  CHECK(canonical_language_tag("x-private").empty());
  CHECK(canonical_language_tag("de_AT").empty());  // '_' is no BCP 47 separator (RFC 5646 2.1)
  // A language's name is well-formed BCP 47 (5-8 letters) but no ISO 639 code.
  CHECK_FALSE(is_language_code("german"));
  CHECK(is_language_code("ger"));
  CHECK(is_language_code("en-GB"));
  CHECK_FALSE(is_language_code("x-private"));
  // Two letters that ISO 639-1 assigns to no language, beside some that it does (the ISO
  // 639-1 codes as the ISO 639-2 registration authority, the Library of Congress, lists
  // them beside their 639-2 codes; from memory of that list: xh Xhosa, qu Quechua, cy
  // Welsh, and no xx or qq).
  CHECK_FALSE(is_language_code("xx"));
  CHECK_FALSE(is_language_code("qq-GB"));
  CHECK(is_language_code("xh"));
  CHECK(is_language_code("qu"));
  CHECK(is_language_code("cy"));
  CHECK(is_language_code("iw"));  // withdrawn for "he", which ICU's canonical form gives
  CHECK(canonical_language_tag("und").empty());
  CHECK(canonical_language_tag("e!").empty());
}
