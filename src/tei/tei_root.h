// The root element a TEI document must have: <TEI> or <teiCorpus> in the TEI namespace
// (TEI P5 1.2). Checked by every reader of TEI on its first start tag.
#pragma once
#include <string>
#include <string_view>

#include "tei/xml_events.h"

namespace manicule {

// Throws Error(bad_input) at `file`:line when `root` is not a TEI root, naming the element
// found and its namespace, followed by `what_then` ("; expected ..." or advice).
void require_tei_root(const StartTag& root, const std::string& file, std::string_view what_then);

}  // namespace manicule
