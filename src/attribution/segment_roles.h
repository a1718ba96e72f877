// Segment roles: which segments of a run are candidates' known texts (and whose), which
// are questioned, and which only serve as impostors.
// Labels come from the edition (SegmentSummary::author: speaker ids, letter senders from
// correspDesc, titleStmt/author for whole texts) unless a labels file overrides them.
//  - known authorship -> the segment is a known text of that candidate;
//  - conjectured or no authorship, or an empty label in the labels file -> questioned (the
//    edition's conjecture is kept to be shown beside the result);
//  - a segment from an impostor file -> impostor only.
// Speaker ids are local to their play (TEI @who points into the play's own particDesc), so
// speaker labels taken from the edition are qualified by file: "<file stem>#<id>".
// Only measured segments (in the feature table) take part; a candidate none of whose
// segments reached the minimum size is left out with a warning.
// Errors: bad_input (with file:line) for a labels row naming a segment the run does not
// have.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "attribution/attribution_options.h"
#include "core/analysis.h"

namespace manicule {

enum class SegmentRole { known, questioned, impostor, unmeasured };

struct SegmentRoles {
  std::vector<SegmentRole> role;        // per Analysis::segments index
  std::vector<std::string> label;       // candidate label of known segments, else ""
  std::vector<std::string> conjecture;  // the edition's conjectured author, if any
  std::vector<std::string> candidates;  // measured candidates, sorted
  std::vector<std::size_t> table_row;   // per segment: row in Analysis::table, or npos
  std::vector<std::string> warnings;    // candidates left out and why
  std::size_t questioned_too_short = 0;  // questioned segments below the minimum size
  std::size_t largest_too_short = 0;     // words of the largest of them
  bool labels_option = true;             // AttributionOptions::labels_option, for messages

  // How a user labels segments, for the end of a message saying none is labelled.
  std::string how_to_label_known() const;

  std::vector<std::size_t> with_role(SegmentRole r) const;
};

SegmentRoles assign_roles(const Analysis& analysis, const AttributionOptions& options);

// Throws nothing_selected when no measured segment is questioned, saying why: questioned
// segments too short for --min-tokens, or none questioned at all.
void require_questioned(const SegmentRoles& roles);

// The measured candidates with their known segments, as table rows and as segments.
struct CandidateSet {
  std::vector<std::string> names;                  // = SegmentRoles::candidates
  std::vector<std::vector<std::size_t>> rows;      // rows of Analysis::table
  std::vector<std::vector<std::size_t>> segments;  // the same, as Analysis::segments indices
  std::vector<std::size_t> words;                  // words of all their known segments

  std::size_t index_of(const std::string& name) const;  // npos if not a candidate
};

CandidateSet collect_candidates(const Analysis& analysis, const SegmentRoles& roles);

}  // namespace manicule
