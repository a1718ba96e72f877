// Stop lists: words an editor wants left out of the features (names, topic words).
// Text format: one word per line, UTF-8; '#' starts a comment that runs to the end of the
// line; spaces, tabs and CR around a word are ignored; blank lines are skipped. Words are
// compared with feature forms once normalised as the counted tokens were
// (normalised_stop_words): "Mr" in a list leaves out "mr" where the tokens were case-folded.
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "text/tokenizer_options.h"

namespace manicule {

std::vector<std::string> parse_stop_list(std::string_view text);

// The words as the tokenizer with `options` normalises a token (case folding, NFC,
// apostrophes), so that they compare with the forms counted; a word that normalises to
// nothing is dropped.
std::vector<std::string> normalised_stop_words(const std::vector<std::string>& words, const TokenizerOptions& options);

// Reads and parses a stop-list file; Error(bad_input) if it cannot be read.
std::vector<std::string> load_stop_list(const std::string& path);

}  // namespace manicule
