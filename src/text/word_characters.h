// Which characters make words, for the rough counts and the matching of header text that
// need no tokenizer: letters, digits and combining marks; and which of them belong to
// scripts written without spaces between words, where every run of letters may hold many.
#pragma once
#include <cstddef>
#include <string_view>

namespace manicule {

// A letter, a digit or a combining mark (ICU's character properties).
bool is_word_character(char32_t c);

// A character of Han, hiragana, katakana, Thai, Lao, Khmer or Myanmar (ICU's scripts).
bool is_written_without_spaces(char32_t c);

// Words in UTF-8 text, roughly: runs of word characters, each character of a script written
// without spaces counting as a word of its own; the rest (spaces, punctuation, symbols,
// ill-formed bytes) parts them.
std::size_t rough_word_count(std::string_view utf8);

// Whether the text ends in a word character of a script written with spaces (its last
// code point; false when empty): where a following word needs a space before it.
bool ends_in_spaced_word_character(std::string_view utf8);

}  // namespace manicule
