// Stretch planner: cuts UTF-8 text into stretches that the Latin fast path can segment
// and stretches left to ICU, in the same pass as the fast path segments (the fast path
// reads every byte anyway; a separate planning pass read them twice). It cuts only where a
// word boundary holds whatever comes before or after, so that segmenting each stretch alone
// gives the boundaries and rule statuses that segmenting the whole text would (ICU too
// restarts its rules at every boundary).
#pragma once
#include <cstddef>
#include <functional>
#include <string_view>
#include <vector>

#include "text/word_segment.h"

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

// The end of the stretch left to ICU that begins at the ineligible code point at
// text[ineligible]: the first boundary after it that holds whatever the context, else the
// end of the text.
std::size_t end_of_icu_stretch(std::string_view text, std::size_t ineligible);

// The latest boundary in (floor, at] that holds whatever the context, or `floor`.
std::size_t latest_cut(std::string_view text, std::size_t floor, std::size_t at);

// Segments `text` in one pass: the Latin fast path appends the segments of its stretches to
// `segments` (see latin_segment) and, where it meets an ineligible code point, hands the
// stretch from the latest cut to the next one to icu_stretch(begin, end), which must append
// that stretch's segments; then the fast path goes on. Stretches come in text order.
void segment_in_stretches(std::string_view text, std::vector<WordSegment>& segments, bool letters_only,
                          const std::function<void(std::size_t, std::size_t)>& icu_stretch);

// Replaces `out` with the stretches segment_in_stretches makes of `text` (none for empty
// text), neighbours merged when of one kind: what tests and diagnostics look at.
void plan_stretches(std::string_view text, std::vector<TextStretch>& out);

}  // namespace manicule
