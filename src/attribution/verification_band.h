// The "undecided" band of verification scores, calibrated on problems whose answer the run
// knows. Method: over every band [low, high] with low <= high on a grid of 0.01 in [0, 1],
// map the known problems' scores (below low -> different author, above high -> same
// author, within -> undecided) and keep the band with the highest c@1 (verification_
// metrics.h); c@1 rewards leaving a problem unanswered exactly when the answers given are
// right less often than not. Ties go to the narrower band, then to the one nearer 0.5.
// Fewer than `minimum_each` problems of either answer: no calibration; the band is
// [0.5, 0.5] and `calibrated` is false.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "attribution/attribution_result.h"

namespace manicule {

struct KnownProblem {
  double score = 0;
  bool same = false;
};

VerificationBand calibrate_band(const std::vector<KnownProblem>& problems, std::size_t minimum_each = 10);

// The score on the PAN scale: the band becomes exactly 0.5; scores below `low` are spread
// over [0, 0.5), scores above `high` over (0.5, 1].
double calibrated_score(double score, const VerificationBand& band);

// "same-author", "different-author" or "undecided" (one spelling in every output: TSV,
// JSON, TEI's symbol values, show).
std::string verification_decision(double score, const VerificationBand& band);

}  // namespace manicule
