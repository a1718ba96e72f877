// Verification problems: a questioned profile, the known segments of the candidate it is
// tested against, and the impostors. Built here for questioned segments (`verify`) and for
// problems whose answer is known (calibration, `evaluate`).
// Impostors (general_impostors.h) are the other candidates, each with all its known
// segments, and the impostor files, each file with its segments; never questioned
// segments (their authors are unknown, and two texts of one hand would push each other
// down). A known segment posing as questioned is left out of every group, and with
// leave_out_files so is every other segment of its file.
// Known problems simulate both answers as an editor meets them: a held-out segment against
// its own candidate (same author), and against its rival, the candidate attribution would
// rank first without its own (different author). With author_absent, its own candidate is
// also left out of the rival problem's impostors: the case where the true author is not in
// the run at all, the one that misleads.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "attribution/attribution_options.h"
#include "attribution/general_impostors.h"
#include "attribution/segment_roles.h"
#include "core/analysis.h"

namespace manicule {

struct ImpostorProblem {
  std::size_t segment = 0;         // the questioned (or held-out) segment
  std::size_t questioned_row = 0;  // its row in the ProfileSpace
  std::string candidate;           // tested candidate (pairs: the known segment's label)
  std::size_t known_segment = 0;   // pairs: the known segment; else = segment
  RowGroup known;
  std::vector<RowGroup> impostors;
  std::size_t impostor_rows = 0;   // segments in all impostor groups
  bool same = false;               // the true answer, for known problems
  std::size_t group = 0;           // the questioned segment's file, numbered (for folds)
  std::uint64_t seed = 0;
};

class ProblemBuilder {
 public:
  ProblemBuilder(const Analysis& analysis, const SegmentRoles& roles, const ProfileSpace& space,
                 const AttributionOptions& options);

  // `segment` against `candidate`, impostors grouped by author (label) or impostor file;
  // held_out: `segment` is a known segment posing as questioned; `absent`: a candidate to
  // leave out of the impostors as well. False if no known row or no impostor is left.
  bool build(std::size_t segment, const std::string& candidate, bool held_out, const std::string& absent,
             ImpostorProblem& problem) const;

  // Up to `max_segments` known segments (a seeded choice if there are more), each against
  // its own candidate and against the nearest other one (see above).
  std::vector<ImpostorProblem> known_problems(std::size_t max_segments, std::uint64_t seed) const;

  // `each` same-label and `each` different-label pairs of known segments from different
  // files, drawn at random. The known side is the other segment alone; impostors are single
  // segments from neither file and not of the known side's label (with author_absent, of
  // neither label).
  std::vector<ImpostorProblem> pair_problems(std::size_t each, std::uint64_t seed) const;

  const CandidateSet& candidates() const { return candidates_; }

 private:
  bool excluded(std::size_t other, std::size_t segment, bool held_out) const;
  std::string nearest_other_candidate(std::size_t segment) const;

  const Analysis& analysis_;
  const SegmentRoles& roles_;
  const ProfileSpace& space_;
  const AttributionOptions& options_;
  CandidateSet candidates_;
  std::vector<std::size_t> file_of_;  // per segment: its file, numbered
};

// Scores every problem (General Impostors), in parallel; problem i draws from its seed.
std::vector<double> score_problems(const ProfileSpace& space, const std::vector<ImpostorProblem>& problems,
                                   const ImpostorSettings& settings, unsigned threads);

}  // namespace manicule
