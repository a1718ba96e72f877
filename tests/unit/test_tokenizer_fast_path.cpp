// The Latin fast path against ICU. The fast path segments and folds by hand; the ICU path
// uses ICU's word BreakIterator, Normalizer2 and case folding. These tests compare the two
// independent implementations, with ICU (an outside library) as the reference: on every
// short string over the fast path's character classes, on every character it handles, and
// on real German and English text from ../shared/corpora.
#include <catch2/catch.hpp>

#include <filesystem>
#include <string>
#include <vector>

#include "test_tokenizer_support.h"
#include "text/latin_fast_path.h"
#include "text/stretch_planner.h"
#include "text/tokenizer.h"

using namespace manicule;
using manicule::test::utf8;

namespace {

// The option sets that tell word, number and other segments apart.
std::vector<TokenizerOptions> option_sets() {
  std::vector<TokenizerOptions> sets(5);
  sets[1].keep_numbers = true;
  sets[2].keep_punctuation = true;
  sets[3].keep_punctuation = true;
  sets[3].case_fold = false;
  sets[4].keep_punctuation = true;
  sets[4].apostrophes = false;
  return sets;
}

// One tokenizer per option set and path; compares both paths on `text`.
class PathPair {
 public:
  PathPair() {
    for (TokenizerOptions options : option_sets()) {
      options.fast_path = false;
      icu_.push_back(std::make_unique<Tokenizer>(options));
      options.fast_path = true;
      fast_.push_back(std::make_unique<Tokenizer>(options));
    }
  }
  // Counts the differences rather than failing at once: millions of checks stay quiet.
  bool same(const std::string& text, const std::string& language) {
    if (icu_[0]->word_boundaries(text, language) != fast_[0]->word_boundaries(text, language)) {
      return false;
    }
    for (std::size_t i = 0; i < icu_.size(); ++i) {
      if (icu_[i]->tokens(text, language) != fast_[i]->tokens(text, language)) return false;
    }
    return true;
  }

 private:
  std::vector<std::unique_ptr<Tokenizer>> icu_;
  std::vector<std::unique_ptr<Tokenizer>> fast_;
};

// Calls check(s) for every string of 1..max_length items of `alphabet`.
template <typename Check>
void for_each_string(const std::vector<std::string>& alphabet, int max_length, Check check) {
  std::vector<std::size_t> digits;
  for (int length = 1; length <= max_length; ++length) {
    digits.assign(length, 0);
    while (true) {
      std::string text;
      for (std::size_t d : digits) text += alphabet[d];
      check(text);
      int position = length - 1;
      while (position >= 0 && ++digits[position] == alphabet.size()) digits[position--] = 0;
      if (position < 0) break;
    }
  }
}

}  // namespace

TEST_CASE("fast path equals ICU on all short strings over its character classes",
          "[tokenizer][fast_path]") {
  PathPair paths;
  // One character of each Word_Break class the fast path knows (WordBreakProperty.txt),
  // upper and lower case, and the colon, which the fast path leaves to ICU.
  const std::vector<std::string> classes = {
      "a", "Z", "1", ":", "\xC2\xB7" /* · */, ",", ".", "\xE2\x80\x99" /* ’ */, "'", "\"",
      "_", " ", "\r", "\n", "!"};
  int differences = 0;
  for_each_string(classes, 4, [&](const std::string& text) {
    if (!paths.same(text, "")) {
      ++differences;
      UNSCOPED_INFO("differs: \"" << text << "\"");
    }
  });
  CHECK(differences == 0);

  // Add characters the fast path leaves to ICU (Extend U+0301, Format U+00AD, ZWJ, an
  // ALetter outside Latin-1, a non-BMP letter) and letters that fold specially: the
  // stretch planner must hand them over without moving any boundary.
  const std::vector<std::string> mixed = {
      "a", "1", "'", ".", ":", "@", "_", " ", "\n", "\t", "\xC3\x9F" /* ß */, "\xC2\xB5" /* µ */,
      "\xC3\x89" /* É */, "\xCC\x81" /* U+0301 */, "\xC2\xAD" /* U+00AD */,
      "\xE2\x80\x8D" /* ZWJ */, "\xC4\x81" /* ā */, "\xE2\x80\x83" /* em space */,
      "\xF0\x90\x90\x80" /* U+10400 */, "\xE3\x82\xA2" /* ア */};
  for_each_string(mixed, 4, [&](const std::string& text) {
    if (!paths.same(text, "")) {
      ++differences;
      UNSCOPED_INFO("differs: \"" << text << "\"");
    }
  });
  CHECK(differences == 0);
}

TEST_CASE("fast path equals ICU on every character it handles, in context",
          "[tokenizer][fast_path]") {
  PathPair paths;
  const std::vector<std::string> contexts = {"", "a", "A", "1", "_", " ", "'", "\xC3\xA9"};
  int handled = 0;
  for (char32_t c = 0; c <= 0x2FFF; ++c) {
    if (latin_break_class(c) == LatinBreakClass::ineligible) continue;
    ++handled;
    const std::string character = utf8(c);
    for (const std::string& before : contexts) {
      for (const std::string& after : contexts) {
        INFO("U+" << std::hex << static_cast<unsigned>(c) << " between \"" << before
                  << "\" and \"" << after << "\"");
        CHECK(paths.same(before + character + after, "en"));
        CHECK(paths.same(before + character + character + after, "de"));
      }
    }
  }
  CHECK(handled > 300);
}

TEST_CASE("fast path equals ICU on long words, a capital or umlaut at every position",
          "[tokenizer][fast_path]") {
  // The fast path reads runs of ASCII letters sixteen bytes at a time; words of 1 to 40
  // letters with a capital, an umlaut or an apostrophe at each position, at each offset from
  // the start of the text, cross those blocks everywhere. Reference: ICU.
  PathPair paths;
  std::vector<TextStretch> stretches;
  int handled_by_fast_path = 0;
  for (std::size_t offset = 0; offset < 17; ++offset) {
    for (std::size_t length = 1; length <= 40; ++length) {
      for (std::size_t position = 0; position < length; ++position) {
        for (const std::string odd : {"Q", "\xC3\x9C", "'"}) {  // Q, U-umlaut (capital), apostrophe
          std::string word(length, 'w');
          word.replace(position, 1, odd);
          const std::string text = std::string(offset, ' ') + word + " wort, Wort.";
          INFO("\"" << text << "\"");
          CHECK(paths.same(text, "de"));
          plan_stretches(text, stretches);
          if (stretches.size() == 1 && stretches[0].fast) ++handled_by_fast_path;
        }
      }
    }
  }
  // Every one of these texts is eligible: the fast path, not ICU, must have segmented each
  // (else the checks above compare ICU with itself).
  CHECK(handled_by_fast_path == 17 * 820 * 3);
}

TEST_CASE("fast path equals ICU across runs of white space of every length",
          "[tokenizer][fast_path]") {
  // Between words the fast path skips ASCII white space sixteen bytes at a time; runs of 1
  // to 40 characters mixing spaces, tabs, line breaks and form feeds, ending at each offset
  // of a block, with an ineligible character (a colon, left to ICU) or a letter after them.
  // Reference: ICU.
  PathPair paths;
  const std::string kinds = " \t\n\r\v\f";
  std::vector<TextStretch> stretches;
  int handled_by_fast_path = 0;
  for (std::size_t length = 1; length <= 40; ++length) {
    for (std::size_t first = 0; first < kinds.size(); ++first) {
      std::string run;
      for (std::size_t i = 0; i < length; ++i) run += kinds[(first + i * (i % 3 + 1)) % kinds.size()];
      for (const std::string after : {"Wort", ":x", "\xC3\xA4rger", "'s"}) {
        const std::string text = "ab" + run + after + run + "Ende";
        INFO("length " << length << ", first kind " << first << ", then " << after);
        CHECK(paths.same(text, "de"));
        plan_stretches(text, stretches);
        if (stretches.size() == 1 && stretches[0].fast) ++handled_by_fast_path;
      }
    }
  }
  // All but the texts with a colon (left to ICU) are the fast path's alone.
  CHECK(handled_by_fast_path == 40 * 6 * 3);
}

TEST_CASE("fast path equals ICU on German plays and English novels", "[tokenizer][fast_path]") {
  namespace fs = std::filesystem;
  const fs::path corpora = MANICULE_CORPORA;
  if (!fs::is_directory(corpora)) {
    WARN("corpora not found at " << corpora.string() << ": comparison on real text skipped");
    return;
  }
  const std::vector<std::pair<std::string, std::string>> files = {
      {"gerdracor/buechner-dantons-tod.xml", "de"},
      {"gerdracor/goethe-faust-eine-tragoedie.xml", "de"},
      {"gerdracor/goethe-egmont.xml", "de"},
      {"eltec-eng/ENG18471_Bronte.xml", "en"},
      {"eltec-eng/ENG18610_Eliot.xml", "en"},
  };
  std::vector<TextStretch> stretches;
  for (const auto& [file, language] : files) {
    INFO(file);
    bool ok = false;
    const std::string xml = test::read_whole_file((corpora / file).string(), ok);
    REQUIRE(ok);
    const std::string text = test::crude_text_of(xml);

    // The comparison means something only if the fast path does most of the work.
    plan_stretches(text, stretches);
    std::size_t fast_bytes = 0;
    for (const TextStretch& stretch : stretches) {
      if (stretch.fast) fast_bytes += stretch.end - stretch.begin;
    }
    CHECK(fast_bytes > text.size() * 9 / 10);

    for (TokenizerOptions options : option_sets()) {
      options.fast_path = false;
      Tokenizer icu(options);
      options.fast_path = true;
      Tokenizer fast(options);
      const std::vector<std::string> reference = icu.tokens(text, language);
      CHECK(reference.size() > 10000);
      CHECK(fast.tokens(text, language) == reference);  // reference: ICU
    }
    Tokenizer icu(TokenizerOptions{.fast_path = false});
    Tokenizer fast;
    CHECK(fast.word_boundaries(text, language) == icu.word_boundaries(text, language));
  }
}
