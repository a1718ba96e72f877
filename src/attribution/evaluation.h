// evaluate: how far to trust the settings on the run's own material. Every known segment is
// held out in turn (with leave_out_files, its whole file: chapters of one novel then never
// vouch for each other) and attributed to the remaining candidates; the report gives
// accuracy, per-candidate precision and recall, the confusion matrix, and the accuracy of
// each CandidateRule on the same problems. A held-out segment whose candidate has nothing
// else left in still counts, as an error (the candidate cannot win): the figure is what an
// editor would have got.
// Verification (optional): up to calibration_problems / 2 known segments, each against its
// own candidate and against its rival (General Impostors; verification_problems.h, with or
// without its own author among the impostors: author_absent), and `verification_pairs`
// same-author and different-author pairs of segments from different files. Bands are cross-fitted: the
// files are split in two halves at random (seeded); each half is read with the band
// calibrated on the other, so no problem is judged by a band that saw its answer. AUC,
// c@1 and F0.5u (verification_metrics.h) are computed on the calibrated scores.
// Errors: nothing_selected with fewer than two candidates.
#pragma once
#include "attribution/attribution_options.h"
#include "attribution/attribution_result.h"
#include "attribution/segment_roles.h"
#include "core/analysis.h"

namespace manicule {

EvaluationResult evaluate_labelled(const Analysis& analysis, const SegmentRoles& roles, DistanceMeasure measure,
                                   const AttributionOptions& options, bool with_verification, unsigned threads = 0);

}  // namespace manicule
