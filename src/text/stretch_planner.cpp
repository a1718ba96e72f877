#include "text/stretch_planner.h"

#include <unicode/uchar.h>
#include <unicode/utf8.h>

#include "text/latin_fast_path.h"

namespace manicule {

namespace {

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
  if (!is_ascii_space(previous)) return false;
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
    if (is_ascii_space(static_cast<unsigned char>(text[q - 1])) && is_unconditional_boundary(text, q))
      return q;
  }
  return floor;
}

std::size_t end_of_icu_stretch(std::string_view text, std::size_t ineligible) {
  const auto* bytes = reinterpret_cast<const unsigned char*>(text.data());
  // Cuts fall only after ASCII white space, so stepping bytewise never stops mid-character.
  for (std::size_t at = ineligible + decode_latin(text, ineligible).length; at < text.size(); ++at) {
    if (is_ascii_space(bytes[at - 1]) && is_unconditional_boundary(text, at)) return at;
  }
  return text.size();
}

void segment_in_stretches(std::string_view text, std::vector<WordSegment>& segments, bool letters_only,
                          const std::function<void(std::size_t, std::size_t)>& icu_stretch) {
  for (std::size_t at = 0; at < text.size();) {
    const LatinRun run = latin_segment(text, at, text.size(), segments, letters_only);
    if (run.ineligible == text.size()) return;
    const std::size_t icu_end = end_of_icu_stretch(text, run.ineligible);
    icu_stretch(run.end, icu_end);
    at = icu_end;
  }
}

void plan_stretches(std::string_view text, std::vector<TextStretch>& out) {
  out.clear();
  std::vector<WordSegment> scratch;
  std::size_t fast_begin = 0;  // where the Latin fast path took over last
  segment_in_stretches(text, scratch, true, [&](std::size_t begin, std::size_t end) {
    append_stretch(out, fast_begin, begin, true);
    append_stretch(out, begin, end, false);
    fast_begin = end;
  });
  append_stretch(out, fast_begin, text.size(), true);
}

}  // namespace manicule
