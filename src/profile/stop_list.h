// Stop lists: words an editor wants left out of the features (names, topic words).
// Text format: one word per line, UTF-8; '#' starts a comment that runs to the end of the
// line; spaces, tabs and CR around a word are ignored; blank lines are skipped. Words are
// compared with feature forms exactly, so list them as the tokenizer normalises them.
#pragma once
#include <string>
#include <string_view>
#include <vector>

namespace manicule {

std::vector<std::string> parse_stop_list(std::string_view text);

// Reads and parses a stop-list file; Error(bad_input) if it cannot be read.
std::vector<std::string> load_stop_list(const std::string& path);

}  // namespace manicule
