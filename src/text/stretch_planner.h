// Stretch planner: cuts UTF-8 text into stretches that the Latin fast path can segment
// and stretches left to ICU. It cuts only where a word boundary holds whatever comes
// before or after, so that segmenting each stretch alone gives the boundaries and rule
// statuses that segmenting the whole text would (ICU too restarts its rules at every
// boundary). Stretches cover the text in order, without gaps; neighbours differ in kind.
#pragma once
#include <cstddef>
#include <string_view>
#include <vector>

namespace manicule {

struct TextStretch {
  std::size_t begin = 0;  // byte offsets into the text
  std::size_t end = 0;
  bool fast = false;      // every code point is eligible for the Latin fast path
};

// Whether UAX #29 puts a word boundary before text[at] (0 < at < text.size()) whatever the
// rest of the text: after ASCII white space, unless the next character is Extend, Format
// or ZWJ (WB4), a space after a WSegSpace (WB3d) or LF after CR (WB3).
bool is_unconditional_boundary(std::string_view text, std::size_t at);

// Replaces `out` with the stretches of `text` (none for empty text).
void plan_stretches(std::string_view text, std::vector<TextStretch>& out);

}  // namespace manicule
