// Titles and captions for the plots, from an Analysis's provenance: what was measured
// (unit, editions), on which features and sizes, by which version and when, so that a
// plot taken out of its context still says how it was made.
#pragma once
#include <string>
#include <vector>

#include "core/analysis.h"

namespace manicule {

// "23 speaker segments of ferry-play" / "... of 2 editions".
std::string describe_measured_segments(const Analysis& analysis);

// Caption lines: features and sizes, `method` (e.g. "PCA on z-scores"), tokenizer, inputs,
// tool and time.
std::vector<std::string> plot_caption(const Analysis& analysis, const std::string& method);

}  // namespace manicule
