// WordSegment: the text between two adjacent UAX #29 word boundaries, with the ICU rule
// status that says what kind of text it is. Both segmenters (ICU and the Latin fast path)
// produce these, with the same offsets and statuses.
#pragma once
#include <cstddef>
#include <cstdint>

#include <unicode/ubrk.h>

namespace manicule {

struct WordSegment {
  std::size_t begin = 0;  // byte offset into the text, inclusive
  std::size_t end = 0;    // byte offset into the text, exclusive
  std::int32_t rule_status = 0;
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
