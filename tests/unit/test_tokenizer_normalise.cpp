// Tokenizer options and normalisation, each checked on the ICU path and on the fast path
// (the fast path hands text it cannot handle to ICU, so both must give the same tokens).
// Expected values come from the Unicode data files named beside each check.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include <map>

#include "test_tokenizer_support.h"
#include "text/icu_word_breaker.h"
#include "text/tokenizer.h"

using namespace manicule;
using Tokens = std::vector<std::string>;

namespace {

Tokens tokens_of(const std::string& text, TokenizerOptions options, bool fast_path,
                 const std::string& language = "de") {
  options.fast_path = fast_path;
  Tokenizer tokenizer(options);
  return tokenizer.tokens(text, language);
}

}  // namespace

TEST_CASE("tokens are NFC", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // NormalizationTest.txt / UnicodeData.txt: U+00E9 = U+0065 U+0301 canonically, and NFC
  // composes it. "e\u0301" as a UAX #29 word: U+0301 is Extend, kept with its base (WB4).
  CHECK(tokens_of("Caf\x65\xCC\x81 noir", {}, fast_path) == Tokens{"caf\xC3\xA9", "noir"});
  // U+212B ANGSTROM SIGN has the singleton decomposition U+00C5 (UnicodeData.txt);
  // case folding then gives U+00E5 (CaseFolding.txt "00C5; C; 00E5").
  CHECK(tokens_of("\xE2\x84\xAB", {}, fast_path) == Tokens{"\xC3\xA5"});
}

TEST_CASE("full case folding", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // CaseFolding.txt: "00DF; F; 0073 0073; # LATIN SMALL LETTER SHARP S" (full folding).
  CHECK(tokens_of("Straße STRASSE", {}, fast_path) == Tokens{"strasse", "strasse"});
  // CaseFolding.txt: "1E9E; F; 0073 0073; # LATIN CAPITAL LETTER SHARP S".
  CHECK(tokens_of("STRA\xE1\xBA\x9E" "E", {}, fast_path) == Tokens{"strasse"});
  // CaseFolding.txt: "00C4; C; 00E4", "00D6; C; 00F6", "00DC; C; 00FC".
  CHECK(tokens_of("ÄRGER ÖL ÜBER", {}, fast_path) == Tokens{"ärger", "öl", "über"});
  // CaseFolding.txt: "00B5; C; 03BC; # MICRO SIGN" (folds to Greek small mu).
  CHECK(tokens_of("\xC2\xB5m", {}, fast_path) == Tokens{"\xCE\xBCm"});
  // CaseFolding.txt: "03C2; C; 03C3; # GREEK SMALL LETTER FINAL SIGMA".
  CHECK(tokens_of("ΟΔΥΣΣΕΥΣ Ὀδυσσεύς", {}, fast_path) ==
        Tokens{"οδυσσευσ", "ὀδυσσεύσ"});
  // CaseFolding.txt has no entry for U+00FF ÿ (its capital is U+0178): it stays.
  CHECK(tokens_of("\xC5\xB8 \xC3\xBF", {}, fast_path) == Tokens{"\xC3\xBF", "\xC3\xBF"});

  TokenizerOptions no_fold;
  no_fold.case_fold = false;
  CHECK(tokens_of("Straße ÄRGER", no_fold, fast_path) == Tokens{"Straße", "ÄRGER"});
}

TEST_CASE("apostrophe variants become U+0027 inside one word", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // WordBreakProperty.txt: "2019 ; MidNumLet", so WB6/WB7 keep "don’t" one word.
  CHECK(tokens_of("don’t", {}, fast_path, "en") == Tokens{"don't"});
  // "2018 ; MidNumLet" as well; a leading ‘ has no letter before it and stands alone.
  CHECK(tokens_of("don‘t ‘tis", {}, fast_path, "en") == Tokens{"don't", "tis"});
  // U+02BC MODIFIER LETTER APOSTROPHE is ALetter (WordBreakProperty.txt).
  CHECK(tokens_of("don\xCA\xBCt", {}, fast_path, "en") == Tokens{"don't"});
  // "0027 ; Single_Quote": the plain apostrophe joins letters too (WB6/WB7).
  CHECK(tokens_of("don't", {}, fast_path, "en") == Tokens{"don't"});

  TokenizerOptions keep;
  keep.apostrophes = false;
  CHECK(tokens_of("don’t", keep, fast_path, "en") == Tokens{"don’t"});
}

TEST_CASE("invisible characters inside a word are dropped", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // Source: DerivedCoreProperties.txt (Default_Ignorable_Code_Point) and WordBreakProperty.txt
  // (Unicode 15.0, Debian's unicode-data, the version of ICU 72). Those UAX #29 keeps inside a
  // word (Format, Extend and ZWJ by WB4, ALetter by WB5) must leave the word as if absent;
  // the others (ZERO WIDTH SPACE, unassigned ones: Other) part words, which WB999 decides.
  std::map<char32_t, std::string> word_break;
  for (const auto& range : manicule::test::unicode_property_ranges(
           manicule::test::read_unicode_data("auxiliary/WordBreakProperty.txt")))
    for (char32_t c = range.first; c <= range.last; ++c) word_break[c] = range.value;
  int inside = 0, parting = 0;
  for (const auto& range : manicule::test::unicode_property_ranges(
           manicule::test::read_unicode_data("DerivedCoreProperties.txt"))) {
    if (range.value != "Default_Ignorable_Code_Point") continue;
    for (char32_t c = range.first; c <= range.last; ++c) {
      const std::string wb = word_break.count(c) ? word_break[c] : "Other";
      INFO("U+" << std::hex << static_cast<unsigned>(c) << " " << range.category << " " << wb);
      const Tokens got = tokens_of("amici" + manicule::test::utf8(c) + "tia", {}, fast_path, "la");
      if (wb == "Format" || wb == "Extend" || wb == "ZWJ" || wb == "ALetter") {
        ++inside;
        CHECK(got == Tokens{"amicitia"});
      } else {
        ++parting;
        CHECK(got == Tokens{"amici", "tia"});
      }
    }
  }
  // DerivedCoreProperties.txt 15.0 lists 4,174 such code points, most of them reserved tags.
  CHECK(inside > 300);
  CHECK(parting > 3000);
  // A segment made of them alone gives no token, punctuation kept or not.
  TokenizerOptions punctuation;
  punctuation.keep_punctuation = true;
  CHECK(tokens_of("ja \xE2\x80\x8D nein", punctuation, fast_path) == Tokens{"ja", "nein"});
}

TEST_CASE("a narrow no-break space at a word's edge is not part of it", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // WordBreakProperty.txt: "202F ; ExtendNumLet", so WB13a joins "Herr" and the U+202F that
  // French and German typesetting put before "!" and inside guillemets, and WB13b joins it to
  // a following word; the word counts without it. Between two words it stays (WB13a, WB13b:
  // Mongolian writes suffixes so).
  const std::string nnbsp = "\xE2\x80\xAF";
  CHECK(tokens_of("Herr" + nnbsp + "! Herr.", {}, fast_path) == Tokens{"herr", "herr"});
  CHECK(tokens_of("\xC2\xAB" + nnbsp + "Caf\xC3\xA9" + nnbsp + "\xC2\xBB", {}, fast_path, "fr") ==
        Tokens{"caf\xC3\xA9"});
  CHECK(tokens_of("a" + nnbsp + "b", {}, fast_path) == Tokens{"a" + nnbsp + "b"});
}

TEST_CASE("U+02BC at a word's edge goes as the apostrophes it stands for", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  // WordBreakProperty.txt: "02BC ; ALetter" keeps it in the word ("κατʼ"); "2019 ;
  // MidNumLet" and "0027 ; Single_Quote" join only between letters (WB6, WB7), so a word
  // ending in ’ or ' ends before it. Folded, an elision reads alike whichever mark it has.
  CHECK(tokens_of("\xCE\xBA\xCE\xB1\xCF\x84\xCA\xBC \xCE\xBA\xCE\xB1\xCF\x84\xE2\x80\x99 "
                  "\xCE\xBA\xCE\xB1\xCF\x84'", {}, fast_path, "grc") ==
        Tokens{"\xCE\xBA\xCE\xB1\xCF\x84", "\xCE\xBA\xCE\xB1\xCF\x84", "\xCE\xBA\xCE\xB1\xCF\x84"});
  CHECK(tokens_of("\xCA\xBCtis \xE2\x80\x99tis", {}, fast_path, "en") == Tokens{"tis", "tis"});
  TokenizerOptions keep;
  keep.apostrophes = false;
  CHECK(tokens_of("\xCA\xBCtis", keep, fast_path, "en") == Tokens{"\xCA\xBCtis"});
}

TEST_CASE("long s and ligatures when asked", "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  TokenizerOptions plain;
  plain.case_fold = false;
  TokenizerOptions typographic = plain;
  typographic.long_s = true;
  typographic.ligatures = true;

  CHECK(tokens_of("Waſſer", plain, fast_path) == Tokens{"Waſſer"});
  CHECK(tokens_of("Waſſer", typographic, fast_path) == Tokens{"Wasser"});
  // CaseFolding.txt: "017F; C; 0073" — folding alone already removes the long s.
  CHECK(tokens_of("Waſſer", {}, fast_path) == Tokens{"wasser"});

  // U+FB01 ﬁ, U+FB00 ﬀ, U+FB06 ﬆ are ALetter (WordBreakProperty.txt "FB00..FB06").
  CHECK(tokens_of("\xEF\xAC\x81nden \xEF\xAC\x80 Fe\xEF\xAC\x86", plain, fast_path) ==
        Tokens{"\xEF\xAC\x81nden", "\xEF\xAC\x80", "Fe\xEF\xAC\x86"});
  CHECK(tokens_of("\xEF\xAC\x81nden \xEF\xAC\x80 Fe\xEF\xAC\x86", typographic, fast_path) ==
        Tokens{"finden", "ff", "Fest"});
  // After expansion NFC applies again: "fi" + U+0301 composes to "f" U+00ED
  // (UnicodeData.txt: 00ED = 0069 0301), while "ﬁ" + U+0301 has no composition.
  CHECK(tokens_of("\xEF\xAC\x81\xCC\x81", typographic, fast_path) == Tokens{"f\xC3\xAD"});
  CHECK(tokens_of("\xEF\xAC\x81\xCC\x81", plain, fast_path) == Tokens{"\xEF\xAC\x81\xCC\x81"});
}

TEST_CASE("numbers are dropped unless kept; punctuation and spaces dropped",
          "[tokenizer][normalise]") {
  const bool fast_path = GENERATE(false, true);
  const std::string text = "Im Jahr 1848 kamen 3,5 Millionen, am 1st.";
  // UAX #29 WB8/WB11/WB12 keep "3,5" one number; ICU's rule status of a segment is that
  // of its last character, so "1st" is a word (letter status) and "1848" a number.
  CHECK(tokens_of(text, {}, fast_path) == Tokens{"im", "jahr", "kamen", "millionen", "am", "1st"});
  TokenizerOptions numbers;
  numbers.keep_numbers = true;
  CHECK(tokens_of(text, numbers, fast_path) ==
        Tokens{"im", "jahr", "1848", "kamen", "3,5", "millionen", "am", "1st"});
  TokenizerOptions punctuation;
  punctuation.keep_punctuation = true;
  CHECK(tokens_of("Ja, nein! \xE2\x80\x94 \xC2\xA0 \t", punctuation, fast_path) ==
        Tokens{"ja", ",", "nein", "!", "\xE2\x80\x94"});
  CHECK(tokens_of(" \n\t ", punctuation, fast_path).empty());
}

TEST_CASE("word boundaries include both ends", "[tokenizer]") {
  const bool fast_path = GENERATE(false, true);
  TokenizerOptions options;
  options.fast_path = fast_path;
  Tokenizer tokenizer(options);
  // UAX #29 WB1/WB2 (break at start and end), WB3d (spaces stay together), WB999.
  CHECK(tokenizer.word_boundaries("Ja,  nein", "de") == std::vector<std::size_t>{0, 2, 3, 5, 9});
  CHECK(tokenizer.word_boundaries("", "de").empty());
  CHECK(tokenizer.tokens("", "de").empty());
}

TEST_CASE("language tags become ICU locales", "[tokenizer]") {
  // BCP 47 (RFC 5646): language, then script, then region.
  CHECK(icu_locale_for_tag("de") == "de");
  CHECK(icu_locale_for_tag("de-AT") == "de");
  CHECK(icu_locale_for_tag("zh-Hant-TW") == "zh_Hant");
  CHECK(icu_locale_for_tag("grc") == "grc");
  CHECK(icu_locale_for_tag("") == "");
  CHECK(icu_locale_for_tag("und") == "");
  CHECK(icu_locale_for_tag("!!") == "");
  // Any tag yields a working tokenizer (unknown ones fall back to ICU's root rules).
  Tokenizer tokenizer;
  CHECK(tokenizer.tokens("Μῆνιν ἄειδε", "grc") == Tokens{"μῆνιν", "ἄειδε"});
  CHECK(tokenizer.tokens("abc", "qqq-Zzzz") == Tokens{"abc"});
}
