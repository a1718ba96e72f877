// verify: open-set verification of every questioned segment by General Impostors, against
// one named candidate or against each candidate in turn, with the undecided band
// calibrated on the run's own labelled segments (verification_band.h): up to
// `calibration_problems` / 2 known segments, each left out in turn and tested against its
// own candidate and against its rival with its own author absent from the run
// (verification_problems.h), give problems whose answer is known. Calibrating on the case
// where the true author is missing keeps "same author" for scores a mere nearest rival
// rarely reaches.
// Errors: nothing_selected without a questioned segment, without a candidate, or without
// impostors (a single candidate and no impostor files); usage for an unknown
// verify_candidate (the message lists the candidates).
#pragma once
#include <string>
#include <vector>

#include "attribution/attribution_options.h"
#include "attribution/attribution_result.h"
#include "attribution/segment_roles.h"
#include "core/analysis.h"

namespace manicule {

struct VerificationRun {
  std::vector<VerificationResult> results;  // by questioned segment, then candidate
  VerificationBand band;
};

VerificationRun verify_questioned(const Analysis& analysis, const SegmentRoles& roles, DistanceMeasure measure,
                                  const AttributionOptions& options, unsigned threads = 0);

}  // namespace manicule
