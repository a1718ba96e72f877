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

// The latest unconditional boundary in (floor, at], or `floor` if there is none. Asked only
// when an ineligible code point turns up, which is rare, so the forward scan need not
// track boundaries as it goes.
std::size_t latest_cut(std::string_view text, std::size_t floor, std::size_t at) {
  for (std::size_t q = at; q > floor; --q) {
    if (is_ascii_white_space(static_cast<unsigned char>(text[q - 1])) && is_unconditional_boundary(text, q))
      return q;
  }
  return floor;
}

void plan_stretches(std::string_view text, std::vector<TextStretch>& out) {
  out.clear();
  const auto* bytes = reinterpret_cast<const unsigned char*>(text.data());
  std::size_t stretch_begin = 0;  // start of the stretch being grown
  bool fast = true;
  for (std::size_t at = 0; at < text.size();) {
    if (fast) {
      // Eligible code points, ASCII above all, are skipped in a tight loop.
      const unsigned char lead = bytes[at];
      if (lead < 0x80) {
        if (kAsciiBreakClasses[lead] != LatinBreakClass::ineligible) {
          ++at;
          continue;
        }
      } else {
        const LatinCodePoint cp = decode_latin_multibyte(text, at);
        if (cp.break_class != LatinBreakClass::ineligible) {
          at += cp.length;
          continue;
        }
      }
      // Hand back to ICU from the latest cut: the words before it are settled.
      const std::size_t cut = latest_cut(text, stretch_begin, at);
      append_stretch(out, stretch_begin, cut, true);
      stretch_begin = cut;
      fast = false;
      at += decode_latin(text, at).length;
      continue;
    }
    if (at > 0 && is_ascii_white_space(bytes[at - 1]) && is_unconditional_boundary(text, at)) {
      append_stretch(out, stretch_begin, at, false);
      stretch_begin = at;
      fast = true;
      continue;  // the code point at `at` is looked at again, in fast mode
    }
    ++at;  // cuts fall only before ASCII or after ASCII white space: never mid-character
  }
  append_stretch(out, stretch_begin, text.size(), fast);
}

}  // namespace manicule
