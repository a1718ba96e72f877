// Matching header text (authors, titles) against what a user typed, regardless of letter
// case in any script: "öda" finds "Öda von Hallvík", "*F?hre*" finds "Die Fähre". Both
// sides are put in NFC, then case-folded one character at a time (simple case folding,
// CaseFolding.txt statuses C and S), so that one character stays one for '?'.
#pragma once
#include <string>
#include <string_view>

namespace manicule {

// The code points of `utf8` (ill-formed bytes read as U+FFFD), in NFC, simply case-folded,
// with the apostrophe's typeset forms (’ ʼ) read as the apostrophe.
std::u32string caseless_code_points(std::string_view utf8);

// caseless_code_points as UTF-8: texts with the same form match alike everywhere below
// ("O’NEILL" and "o'neill"), so a question can be told from its respellings.
std::string caseless_form(std::string_view utf8);

// Whether `part` occurs in `text`, letter case ignored.
bool caseless_contains(std::string_view text, std::string_view part);

// Whether `word` occurs in `text` as a whole word, letter case ignored: neither side of it
// continues with a letter, a digit or a combining mark, so that "Kind" finds "Anna Kind"
// and "Kind, Anna" but not "Wendekind" (in scripts written without spaces, Han, kana, Thai
// and the like, any run of letters is found: "海風" in "潮見海風").
bool caseless_contains_word(std::string_view text, std::string_view word);

// Whether all of `text` matches the shell pattern: '*' stands for any run of characters,
// '?' for one character; every other character stands for itself, letter case ignored.
bool caseless_pattern_match(std::string_view pattern, std::string_view text);

}  // namespace manicule
