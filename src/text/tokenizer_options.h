// TokenizerOptions: what the tokenizer keeps and how it normalises the tokens it keeps.
// Every option has the same effect on the ICU path and on the Latin fast path.
#pragma once

namespace manicule {

struct TokenizerOptions {
  // Full Unicode case folding (Unicode CaseFolding.txt, statuses C and F, as ICU's
  // u_strFoldCase with U_FOLD_CASE_DEFAULT): "Straße" -> "strasse". Folding alone already
  // turns ſ into s and the ligatures U+FB00–U+FB06 into their letters.
  bool case_fold = true;
  // Keep segments whose UAX #29 rule status is "number" (a segment ending in a digit:
  // "1848", "3.14", "a1"). A segment ending in a letter ("1st") is a word either way.
  bool keep_numbers = false;
  // Keep non-word segments that do not start with white space (punctuation, symbols,
  // a lone "_"). White space is never kept.
  bool keep_punctuation = false;
  // ſ (U+017F LATIN SMALL LETTER LONG S) -> s.
  bool long_s = false;
  // Latin presentation forms U+FB00–U+FB06 (ﬀ ﬁ ﬂ ﬃ ﬄ ﬅ ﬆ) -> ff fi fl ffi ffl st st.
  bool ligatures = false;
  // Apostrophe look-alikes inside a token -> U+0027 ': U+2019 ’ and U+2018 ‘ (MidNumLet in
  // UAX #29, so they sit inside a word only as an elision mark), U+02BC ʼ (a letter, used
  // as an apostrophe) and U+FF07 ＇ (fullwidth apostrophe). Not U+00B4 ´ or U+2032 ′:
  // both are Other in UAX #29, so they always end a word and never reach a token. A U+02BC
  // at either end of a word is dropped, as ’ and ' are split off there by UAX #29.
  // (Invisible characters, Default_Ignorable_Code_Point, are dropped from every token.)
  bool apostrophes = true;
  // Segment and fold text made only of ASCII, Latin-1 and common punctuation by hand,
  // falling back to ICU for the stretches that hold anything else. Same output either way.
  bool fast_path = true;
};

}  // namespace manicule
