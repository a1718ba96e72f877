// Latin fast path: UAX #29 word segmentation and token normalisation by hand for text made
// only of ASCII, Latin-1 and the punctuation of U+2002–U+203F, giving exactly what ICU's
// root word rules and the ICU normalisation path give. ICU is slow and our corpora are
// mostly German and English; tests/unit/test_tokenizer_fast_path.cpp holds the paths equal.
//
// The code points handled ("eligible") are listed by latin_break_class(); every other
// code point, and ill-formed UTF-8, is left to ICU (see stretch_planner.h). None of the
// eligible characters is Extend, Format, ZWJ, Hebrew_Letter, Katakana or Regional_Indicator,
// so rules WB4, WB7a–c, WB13 and WB15–16 never apply and the rest shrink to pairs.
#pragma once
#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "text/word_segment.h"

namespace manicule {

// The Word_Break values (UAX #29, WordBreakProperty.txt) that eligible code points take.
enum class LatinBreakClass : std::uint8_t {
  ineligible,  // left to ICU
  other,
  aletter,
  numeric,
  mid_letter,
  mid_num,
  mid_num_let,
  single_quote,
  double_quote,  // behaves as Other where there are no Hebrew letters
  extend_num_let,
  wseg_space,
  cr,
  lf,
  newline,
};

// The class the fast path gives `code_point`: its Word_Break value (Unicode 15.0), or
// ineligible. The colon and '@', whose treatment changed between ICU releases, are
// ineligible, so are Extend, Format and ZWJ characters and canonical singletons.
LatinBreakClass latin_break_class(char32_t code_point);

struct LatinCodePoint {
  std::size_t length = 1;  // UTF-8 bytes; 1 for an ill-formed byte
  LatinBreakClass break_class = LatinBreakClass::ineligible;
};

// Tab, line feed, vertical tab, form feed, carriage return and space.
inline bool is_ascii_space(unsigned char byte) { return byte == ' ' || (byte >= '\t' && byte <= '\r'); }

// Classes of the ASCII code points, by value.
extern const std::array<LatinBreakClass, 128> kAsciiBreakClasses;

// Decodes the code point starting at text[at] (at < text.size()), which is not ASCII.
LatinCodePoint decode_latin_multibyte(std::string_view text, std::size_t at);

// Decodes the code point starting at text[at] (at < text.size()).
inline LatinCodePoint decode_latin(std::string_view text, std::size_t at) {
  const auto lead = static_cast<unsigned char>(text[at]);
  if (lead < 0x80) return {1, kAsciiBreakClasses[lead]};
  return decode_latin_multibyte(text, at);
}

// Where latin_segment stopped.
struct LatinRun {
  std::size_t end = 0;         // the segments appended cover [begin, end)
  std::size_t ineligible = 0;  // the first ineligible code point; == end when there is none
};

// Appends the word segments of text[begin, end) to `out`, which must be cut from the text at
// boundaries that hold whatever the context; with `letters_only`, only the segments of
// letters (UBRK_WORD_LETTER), for callers that drop numbers, spaces and punctuation anyway.
// Stops at the first ineligible code point: then the segments cover [begin, cut), cut being
// the latest boundary before it that holds whatever follows (latest_cut; `begin` if none),
// and the text from the cut on is left to ICU. Each segment says its SegmentForm.
LatinRun latin_segment(std::string_view text, std::size_t begin, std::size_t end,
                       std::vector<WordSegment>& out, bool letters_only = false);
// `token` (ASCII) with A-Z folded to a-z, in `buffer`: what full case folding does to ASCII.
std::string_view fold_ascii_capitals(std::string_view token, std::string& buffer);

// Normalises a token made of eligible code points as TokenNormaliser would (NFC is a no-op
// on them): optional full case folding and apostrophe unification. A view into `buffer`.
// The tokenizer sends only tokens with other than ASCII here (SegmentForm::latin).
std::string_view latin_normalise(std::string_view token, bool case_fold, bool apostrophes,
                                 std::string& buffer);

}  // namespace manicule
