#include "text/latin_fast_path.h"

#include "text/stretch_planner.h"

#include <unicode/utf8.h>

#include <array>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace manicule {

namespace {

using C = LatinBreakClass;

// Values from WordBreakProperty.txt (Unicode 15.0); code points it does not list are Other.
constexpr C basic_latin_class(char32_t c) {
  if (c >= 'a' && c <= 'z') return C::aletter;
  if (c >= 'A' && c <= 'Z') return C::aletter;
  if (c >= '0' && c <= '9') return C::numeric;
  switch (c) {
    case '\r': return C::cr;
    case '\n': return C::lf;
    case 0x0B: case 0x0C: return C::newline;
    case ' ': return C::wseg_space;
    case '"': return C::double_quote;
    case '\'': return C::single_quote;
    case ',': case ';': return C::mid_num;
    case '.': return C::mid_num_let;
    case '_': return C::extend_num_let;
    // Colon and commercial at depend on the ICU version: ICU 72 (CLDR 42) took ':' out of
    // MidLetter and made '@' ALetter in root, ICU 73.2 and 74 undid both. ICU decides them.
    case ':': case '@': return C::ineligible;
    default: return C::other;
  }
}

C latin1_supplement_class(char32_t c) {
  switch (c) {
    case 0x85: return C::newline;
    case 0xAA: case 0xB5: case 0xBA: return C::aletter;  // ª µ º
    case 0xAD: return C::ineligible;                     // soft hyphen is Format (WB4)
    case 0xB7: return C::mid_letter;                     // middle dot
    case 0xD7: case 0xF7: return C::other;               // × ÷
    default: return c >= 0xC0 ? C::aletter : C::other;
  }
}

C general_punctuation_class(char32_t c) {
  if (c <= 0x2001) return C::ineligible;  // canonical singletons (-> U+2002, U+2003)
  if (c <= 0x2006 || (c >= 0x2008 && c <= 0x200A)) return C::wseg_space;
  // ZERO WIDTH SPACE (Other, but a token that normalising drops: TokenNormaliser), ZWNJ
  // Extend, ZWJ, LRM/RLM Format: ICU's.
  if (c >= 0x200B && c <= 0x200F) return C::ineligible;
  if (c >= 0x202A && c <= 0x202E) return C::ineligible;  // bidi embedding controls, Format
  switch (c) {
    case 0x2018: case 0x2019: case 0x2024: return C::mid_num_let;  // ‘ ’ one dot leader
    case 0x2027: return C::mid_letter;                             // hyphenation point
    case 0x2028: case 0x2029: return C::newline;
    case 0x202F: case 0x203F: return C::extend_num_let;  // narrow no-break space, undertie
    default: return C::other;  // figure space, dashes, quotes, daggers, ellipsis...
  }
}

bool is_mid_letter_q(C c) {  // (MidLetter | MidNumLetQ)
  return c == C::mid_letter || c == C::mid_num_let || c == C::single_quote;
}
bool is_mid_num_q(C c) {  // (MidNum | MidNumLetQ)
  return c == C::mid_num || c == C::mid_num_let || c == C::single_quote;
}
bool is_hard_break(C c) { return c == C::cr || c == C::lf || c == C::newline; }
bool is_word_part(C c) {
  return c == C::aletter || c == C::numeric || c == C::extend_num_let;
}

// Whether UAX #29 forbids a break between `left` and `right`, with `before` the class
// ahead of `left` and after() that of the code point following `right` (asked only by
// WB6 and WB12). With no Extend/Format/ZWJ present, no rule looks further.
template <typename After>
bool joins(C before, C left, C right, After after) {
  if (left == C::cr && right == C::lf) return true;                        // WB3
  if (is_hard_break(left) || is_hard_break(right)) return false;           // WB3a, WB3b
  if (left == C::wseg_space && right == C::wseg_space) return true;        // WB3d
  if (left == C::aletter && right == C::aletter) return true;              // WB5
  if (left == C::aletter && is_mid_letter_q(right) && after() == C::aletter) return true;  // WB6
  if (before == C::aletter && is_mid_letter_q(left) && right == C::aletter) return true; // WB7
  if (left == C::numeric && right == C::numeric) return true;              // WB8
  if (left == C::aletter && right == C::numeric) return true;              // WB9
  if (left == C::numeric && right == C::aletter) return true;              // WB10
  if (before == C::numeric && is_mid_num_q(left) && right == C::numeric) return true;  // WB11
  if (left == C::numeric && is_mid_num_q(right) && after() == C::numeric) return true;  // WB12
  if (is_word_part(left) && right == C::extend_num_let) return true;       // WB13a
  if (left == C::extend_num_let && (right == C::aletter || right == C::numeric)) {
    return true;                                                           // WB13b
  }
  return false;  // WB999
}

// ICU's rule status for a segment ending in a code point of class `last`, preceded in the
// segment by one of class `before` unless `alone`. ICU tags a segment by the rule that
// matched its last character (word.txt: "$Numeric $ExFm* {100}; $ALetterPlus $ExFm*
// {200}"; rule 13a tags "X ExtendNumLet" by X; a lone ExtendNumLet has no tag).
std::int32_t rule_status(C last, C before, bool alone) {
  switch (last) {
    case C::aletter: return UBRK_WORD_LETTER;
    case C::numeric: return UBRK_WORD_NUMBER;
    case C::extend_num_let:
      if (alone) return UBRK_WORD_NONE;
      return before == C::numeric ? UBRK_WORD_NUMBER : UBRK_WORD_LETTER;
    default: return UBRK_WORD_NONE;
  }
}

// What a segment's bytes say about normalising it, gathered as they are read.
constexpr unsigned kCapital = 1;   // an ASCII capital letter
constexpr unsigned kNonAscii = 2;  // a multi-byte code point
constexpr unsigned kLetter = 4;    // (table only) an ASCII letter

// kLetter for ASCII letters, with kCapital for A-Z; 0 for every other byte.
constexpr std::array<unsigned char, 256> kAsciiLetterBits = [] {
  std::array<unsigned char, 256> table{};
  for (int c = 'a'; c <= 'z'; ++c) table[c] = kLetter;
  for (int c = 'A'; c <= 'Z'; ++c) table[c] = kLetter | kCapital;
  return table;
}();

unsigned form_bits(const LatinCodePoint& code_point, unsigned char lead) {
  if (code_point.length > 1) return kNonAscii;
  return lead >= 'A' && lead <= 'Z' ? kCapital : 0;
}

// The end of the run of ASCII letters starting at `at` (at most `end`), noting capitals in
// `seen`. Sixteen bytes at a time with SSE2 (part of every x86-64 CPU): a word's letters
// take one step instead of a branch each, the last of them mispredicted.
std::size_t skip_ascii_letters(const unsigned char* bytes, std::size_t at, std::size_t end, unsigned& seen) {
#if defined(__SSE2__)
  while (at + 16 <= end) {
    const __m128i block = _mm_loadu_si128(reinterpret_cast<const __m128i*>(bytes + at));
    // Letters are the bytes whose lower-case form (bit 0x20 set) lies in 'a'..'z': moved
    // to the bottom of the signed range, they are exactly those below -128 + 26.
    const __m128i lower = _mm_or_si128(block, _mm_set1_epi8(0x20));
    const __m128i moved = _mm_add_epi8(lower, _mm_set1_epi8(static_cast<char>(128 - 'a')));
    const auto letters = static_cast<unsigned>(
        _mm_movemask_epi8(_mm_cmplt_epi8(moved, _mm_set1_epi8(static_cast<char>(-128 + 26)))));
    const auto capitals = static_cast<unsigned>(
        _mm_movemask_epi8(_mm_cmpeq_epi8(_mm_and_si128(block, _mm_set1_epi8(0x20)), _mm_setzero_si128())));
    const unsigned run = letters == 0xFFFF ? 16 : static_cast<unsigned>(__builtin_ctz(~letters));
    const unsigned in_run = run == 16 ? 0xFFFFu : (1u << run) - 1;
    if (capitals & letters & in_run) seen |= kCapital;
    at += run;
    if (run < 16) return at;
  }
#endif
  while (at < end) {
    const unsigned bits = kAsciiLetterBits[bytes[at]];
    if (!bits) break;
    seen |= bits;
    ++at;
  }
  return at;
}

// The end of the run of ASCII white space starting at `at` (at most `end`); like
// skip_ascii_letters, sixteen bytes at a time: markup indentation makes long runs.
std::size_t skip_ascii_space(const unsigned char* bytes, std::size_t at, std::size_t end) {
#if defined(__SSE2__)
  while (at + 16 <= end) {
    const __m128i block = _mm_loadu_si128(reinterpret_cast<const __m128i*>(bytes + at));
    // Tab to carriage return (9-13) moved to the bottom of the signed range; and space.
    const __m128i moved = _mm_add_epi8(block, _mm_set1_epi8(static_cast<char>(128 - '\t')));
    const __m128i controls = _mm_cmplt_epi8(moved, _mm_set1_epi8(static_cast<char>(-128 + 5)));
    const __m128i spaces = _mm_cmpeq_epi8(block, _mm_set1_epi8(' '));
    const auto white = static_cast<unsigned>(_mm_movemask_epi8(_mm_or_si128(controls, spaces)));
    if (white != 0xFFFF) return at + static_cast<unsigned>(__builtin_ctz(~white));
    at += 16;
  }
#endif
  while (at < end && is_ascii_space(bytes[at])) ++at;
  return at;
}

SegmentForm form_of(unsigned bits) {
  if (bits & kNonAscii) return SegmentForm::latin;
  return bits & kCapital ? SegmentForm::ascii_capitals : SegmentForm::ascii_lower;
}

// Whether a letter of U+00C0-U+00FF (C3 80-BF in UTF-8) starts at `at`, as
// latin1_supplement_class says: the letters most Latin-script text has beyond ASCII.
bool is_latin1_letter_at(const unsigned char* bytes, std::size_t at, std::size_t end) {
  return bytes[at] == 0xC3 && at + 1 < end && (bytes[at + 1] & 0xC0) == 0x80 &&
         latin1_supplement_class(0xC0 | (bytes[at + 1] & 0x3F)) == C::aletter;
}

void append_code_point(char32_t c, std::string& out) {
  char bytes[U8_MAX_LENGTH];
  int32_t length = 0;
  U8_APPEND_UNSAFE(bytes, length, c);
  out.append(bytes, static_cast<std::size_t>(length));
}

}  // namespace

const std::array<LatinBreakClass, 128> kAsciiBreakClasses = [] {
  std::array<LatinBreakClass, 128> table{};
  for (char32_t c = 0; c < 128; ++c) table[c] = basic_latin_class(c);
  return table;
}();

LatinBreakClass latin_break_class(char32_t code_point) {
  if (code_point < 0x80) return basic_latin_class(code_point);
  if (code_point < 0x100) return latin1_supplement_class(code_point);
  if (code_point >= 0x2000 && code_point <= 0x203F) return general_punctuation_class(code_point);
  return C::ineligible;
}

LatinCodePoint decode_latin_multibyte(std::string_view text, std::size_t at) {
  const auto byte = [&](std::size_t i) { return static_cast<unsigned char>(text[i]); };
  const auto continuation = [&](std::size_t i) {
    return i < text.size() && (byte(i) & 0xC0) == 0x80;
  };
  const unsigned char lead = byte(at);
  if ((lead == 0xC2 || lead == 0xC3) && continuation(at + 1)) {
    return {2, latin1_supplement_class(((lead & 0x1F) << 6) | (byte(at + 1) & 0x3F))};
  }
  // U+2000–U+203F is E2 80 80–BF.
  if (lead == 0xE2 && continuation(at + 1) && byte(at + 1) == 0x80 && continuation(at + 2)) {
    return {3, general_punctuation_class(0x2000 | (byte(at + 2) & 0x3F))};
  }
  return {1, C::ineligible};
}

LatinRun latin_segment(std::string_view text, std::size_t begin, std::size_t end,
                       std::vector<WordSegment>& out, bool letters_only) {
  if (begin >= end) return {end, end};
  const std::size_t kept = out.size();
  const auto* bytes = reinterpret_cast<const unsigned char*>(text.data());
  const LatinCodePoint first = decode_latin(text, begin);
  if (first.break_class == C::ineligible) return {begin, begin};
  C before = C::other;            // class of the code point ahead of `left`
  C left = first.break_class;     // class of the code point ending at `at`
  bool left_is_alone = true;      // `left` starts the current segment
  std::size_t segment_begin = begin;
  unsigned seen = form_bits(first, bytes[begin]);  // kCapital | kNonAscii of the segment so far
  std::size_t at = begin + first.length;
  const auto emit = [&](std::size_t segment_end) {
    const std::int32_t status = rule_status(left, before, left_is_alone);
    if (!letters_only || status == UBRK_WORD_LETTER)
      out.push_back({segment_begin, segment_end, status, form_of(seen)});
  };
  while (at < end) {
    if (left == C::aletter) {  // WB5 through a run of letters: the common case
      std::size_t run_end = at;
      while (run_end < end) {
        run_end = skip_ascii_letters(bytes, run_end, end, seen);
        if (run_end == end) break;
        if (is_latin1_letter_at(bytes, run_end, end)) {
          seen |= kNonAscii;
          run_end += 2;
        } else {
          break;
        }
      }
      if (run_end > at) {
        before = C::aletter;
        left_is_alone = false;
        at = run_end;
        if (at == end) break;
      }
    }
    if (left == C::wseg_space && bytes[at] == ' ') {  // WB3d through a run of spaces
      std::size_t run_end = at;
      while (run_end < end && bytes[run_end] == ' ') ++run_end;
      before = C::wseg_space;
      left_is_alone = false;
      at = run_end;
      if (at == end) break;
    }
    if (letters_only && is_ascii_space(bytes[at]) && !is_ascii_space(bytes[at - 1])) {
      // Between words (and the indentation of the markup): nothing here is handed over,
      // and a word always ends before ASCII white space (no rule joins Other, WSegSpace
      // or a line break to what precedes it). Skip to the run's last character and go on
      // from there as if it began a segment: the rules ask of `before` only whether it is
      // a letter or a number, which white space is not.
      emit(at);
      const std::size_t run_end = skip_ascii_space(bytes, at + 1, end);
      segment_begin = run_end - 1;
      before = C::other;
      left = kAsciiBreakClasses[bytes[run_end - 1]];
      left_is_alone = true;
      seen = 0;
      at = run_end;
      continue;
    }
    const LatinCodePoint right = decode_latin(text, at);
    if (right.break_class == C::ineligible) {
      // Keep what lies before the latest boundary that holds whatever the context (the
      // segments beyond it may depend on the ineligible code point) and hand the rest
      // back. A segment cannot straddle such a boundary, so the open one either ends
      // there or begins after it.
      const std::size_t cut = latest_cut(text, begin, at);
      while (out.size() > kept && out.back().begin >= cut) out.pop_back();
      if (segment_begin < cut) emit(cut);
      return {cut, at};
    }
    const std::size_t next = at + right.length;
    // An ineligible code point ahead reads as Other here; a decision it would change lies
    // beyond the cut made when it is reached, and is taken back then.
    const auto after = [&] { return next < end ? decode_latin(text, next).break_class : C::other; };
    if (joins(before, left, right.break_class, after)) {
      left_is_alone = false;
      seen |= form_bits(right, bytes[at]);
    } else {
      emit(at);
      segment_begin = at;
      left_is_alone = true;
      seen = form_bits(right, bytes[at]);
    }
    before = left;
    left = right.break_class;
    at = next;
  }
  emit(end);
  return {end, end};
}

std::string_view fold_ascii_capitals(std::string_view token, std::string& buffer) {
  // One pass through plain pointers: writes through the string itself could alias its own
  // fields, and were reloaded at every byte.
  buffer.resize(token.size());
  char* out = buffer.data();
  const char* in = token.data();
  for (std::size_t i = 0, n = token.size(); i < n; ++i) {
    const char ch = in[i];
    out[i] = static_cast<char>(ch >= 'A' && ch <= 'Z' ? ch + ('a' - 'A') : ch);
  }
  return buffer;
}

std::string_view latin_normalise(std::string_view token, bool case_fold, bool apostrophes,
                                 std::string& buffer) {
  buffer.clear();
  // A narrow no-break space (U+202F, E2 80 AF) at either end is left out, as TokenNormaliser
  // leaves it out (normalise.cpp, why).
  constexpr std::string_view kNarrowNoBreakSpace = "\xE2\x80\xAF";
  while (token.substr(0, 3) == kNarrowNoBreakSpace) token.remove_prefix(3);
  while (token.size() >= 3 && token.substr(token.size() - 3) == kNarrowNoBreakSpace) token.remove_suffix(3);
  for (std::size_t at = 0; at < token.size();) {
    const auto byte = [&](std::size_t i) { return static_cast<unsigned char>(token[i]); };
    const unsigned char lead = byte(at);
    if (lead < 0x80) {
      const bool upper = lead >= 'A' && lead <= 'Z';
      buffer += static_cast<char>(case_fold && upper ? lead + ('a' - 'A') : lead);
      ++at;
      continue;
    }
    const std::size_t length = lead < 0xE0 ? 2 : 3;
    char32_t c = length == 2 ? ((lead & 0x1F) << 6) | (byte(at + 1) & 0x3F)
                             : ((lead & 0x0F) << 12) | ((byte(at + 1) & 0x3F) << 6) |
                                   (byte(at + 2) & 0x3F);
    at += length;
    if (apostrophes && (c == 0x2018 || c == 0x2019)) c = '\'';
    if (case_fold) {
      // CaseFolding.txt: "00C0; C; 00E0" ... "00DE; C; 00FE" (not 00D7 ×), "00B5; C; 03BC"
      // (micro sign -> Greek mu) and "00DF; F; 0073 0073" (ß -> ss). Nothing else here folds.
      if (c >= 0xC0 && c <= 0xDE && c != 0xD7) c += 0x20;
      else if (c == 0xB5) c = 0x3BC;
      else if (c == 0xDF) {
        buffer += "ss";
        continue;
      }
    }
    append_code_point(c, buffer);
  }
  return buffer;
}

}  // namespace manicule
