// WordSegment: the text between two adjacent UAX #29 word boundaries, with the ICU rule
// status that says what kind of text it is. Both segmenters (ICU and the Latin fast path)
// produce these, with the same offsets and statuses.
#pragma once
#include <cstddef>
#include <cstdint>

#include <unicode/ubrk.h>

namespace manicule {

// What normalising a segment's text involves, as far as its segmenter saw. ICU's segments
// are left `unknown`; the Latin fast path, which looks at every byte anyway, says more, so
// that the common token needs no second pass.
enum class SegmentForm : std::uint8_t {
  unknown,        // anything: the general normaliser decides
  ascii_lower,    // ASCII without capital letters: its own normal form
  ascii_capitals, // ASCII with capitals: folding maps A-Z to a-z, nothing else
  latin,          // Latin-1 or general punctuation as well (latin_normalise)
};

struct WordSegment {
  std::size_t begin = 0;  // byte offset into the text, inclusive
  std::size_t end = 0;    // byte offset into the text, exclusive
  std::int32_t rule_status = 0;
  SegmentForm form = SegmentForm::unknown;
};

// ICU's word rule statuses (UWordBreak): none 0-99, number 100-199, letter 200-299,
// kana 300-399, ideographic 400-499. Letter, kana and ideographic make a word.
inline bool is_number_status(std::int32_t status) {
  return status >= UBRK_WORD_NUMBER && status < UBRK_WORD_NUMBER_LIMIT;
}
inline bool is_word_status(std::int32_t status) {
  return status >= UBRK_WORD_LETTER && status < UBRK_WORD_IDEO_LIMIT;
}

}  // namespace manicule
