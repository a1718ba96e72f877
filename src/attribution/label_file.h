// Labels files: who wrote which segment, as the editor states it, overriding the edition.
// Format: CSV (RFC 4180) with two fields a row, `segment,label`; an optional header row
// `segment,label`; fields may be quoted ("..." with "" for a quote); blank lines and lines
// starting with '#' are skipped; a UTF-8 byte-order mark is ignored. An empty label marks
// the segment as questioned even if the edition names its author.
// Errors: bad_input with file:line for an unreadable file, a row without exactly two
// fields, an empty segment id, an unclosed quote, or one segment listed twice.
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "attribution/attribution_options.h"

namespace manicule {

std::vector<LabelOverride> parse_label_file(std::string_view text, const std::string& source);

std::vector<LabelOverride> load_label_file(const std::string& path);

}  // namespace manicule
