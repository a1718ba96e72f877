// The separate results file (--standoff-file): a TEI document of its own, with a
// teiHeader (title, what it was computed from, our application and change) and our
// standOff only (TEI = teiHeader, model.resource+; standOff is a model.resource). Its
// pointers reach into the editions as relative URIs with a fragment ("edition.xml#L07"),
// as tei-conventions.md section 5 recommends; never bare "#id" plus xml:base.
#pragma once
#include <string>
#include <vector>

#include "core/analysis.h"
#include "standoff/standoff_builder.h"

namespace manicule {

std::string results_document(const StandoffBuilder& builder, const Analysis& analysis,
                             const std::vector<std::string>& inputs);

// Refuses (Error(usage)) to overwrite an existing file that is not a results file of
// ours, so that a mistyped --standoff-file never replaces an edition.
void refuse_foreign_results_file(const std::string& path);

}  // namespace manicule
