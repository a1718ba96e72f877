// The TEI reader: one call that turns one edition (a file or a host's buffer) into the
// segments selected by the rules. Streams the XML; builds a tree only for xpath: units,
// where the editor's XPath has to be evaluated once before streaming.
#pragma once
#include <string>
#include <vector>

#include "core/segment.h"
#include "tei/header_info.h"
#include "tei/selection_rules.h"
#include "tei/xml_events.h"

namespace manicule {

// Throws Error(bad_input) with file, line and column for unreadable, malformed, hostile
// or non-TEI input, and Error(usage) for an XPath that does not compile. Segments without
// any text are returned (with a warning) so that callers can report them.
// `digest`, when given, receives the size and SHA-256 of the source bytes; `header`, when
// given, the file's header (TeiWalker::file_header: title, authors, date, declared language).
std::vector<Segment> read_segments(const XmlSource& source, const SelectionRules& rules,
                                   SourceDigest* digest = nullptr, HeaderInfo* header = nullptr);

}  // namespace manicule
