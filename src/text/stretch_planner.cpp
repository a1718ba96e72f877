#include "text/stretch_planner.h"

#include <unicode/uchar.h>
#include <unicode/utf8.h>

#include "text/latin_fast_path.h"

namespace manicule {

namespace {

bool is_ascii_white_space(unsigned char byte) {
  return byte == ' ' || (byte >= '\t' && byte <= '\r');
}

void append_stretch(std::vector<TextStretch>& out, std::size_t begin, std::size_t end,
                    bool fast) {
  if (begin == end) return;
  if (!out.empty() && out.back().fast == fast) {
    out.back().end = end;
  } else {
    out.push_back({begin, end, fast});
  }
}

}  // namespace

bool is_unconditional_boundary(std::string_view text, std::size_t at) {
  const auto previous = static_cast<unsigned char>(text[at - 1]);
  if (!is_ascii_white_space(previous)) return false;
  const auto next = static_cast<unsigned char>(text[at]);
  if (next < 0x80) {
    return !(previous == ' ' && next == ' ') && !(previous == '\r' && next == '\n');
  }
  UChar32 c = 0;
  auto i = static_cast<int32_t>(at);
  U8_NEXT(text.data(), i, static_cast<int32_t>(text.size()), c);
  if (c < 0) return true;  // ill-formed: ICU reads U+FFFD, which is Other
  switch (u_getIntPropertyValue(c, UCHAR_WORD_BREAK)) {
    case U_WB_EXTEND:
    case U_WB_FORMAT:
    case U_WB_ZWJ:
      return false;
    case U_WB_WSEGSPACE:
      return previous != ' ';
    default:
      return true;
  }
}

void plan_stretches(std::string_view text, std::vector<TextStretch>& out) {
  out.clear();
  std::size_t stretch_begin = 0;  // start of the stretch being grown
  std::size_t last_cut = 0;       // latest unconditional boundary in it
  bool fast = true;
  for (std::size_t at = 0; at < text.size();) {
    const bool after_white_space =
        at > 0 && is_ascii_white_space(static_cast<unsigned char>(text[at - 1]));
    if (after_white_space && is_unconditional_boundary(text, at)) {
      if (!fast) {
        append_stretch(out, stretch_begin, at, false);
        stretch_begin = at;
        fast = true;
      }
      last_cut = at;
    }
    if (!fast) {
      ++at;  // cuts fall only before ASCII or after ASCII white space: never mid-character
      continue;
    }
    const LatinCodePoint cp = decode_latin(text, at);
    if (cp.break_class == LatinBreakClass::ineligible) {
      // Hand back to ICU from the latest cut: the words before it are settled.
      append_stretch(out, stretch_begin, last_cut, true);
      stretch_begin = last_cut;
      fast = false;
    }
    at += cp.length;
  }
  append_stretch(out, stretch_begin, text.size(), fast);
}

}  // namespace manicule
