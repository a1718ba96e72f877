// attribute: for every questioned segment of an analysed run, the candidates ranked by
// distance under the run's measure and the chosen CandidateRule, with the distance to each
// candidate's nearest single segment beside it, the margin between the first two, and the
// stability of the first place: the share of `resamples` random subsets of the features
// (each `resample_share` of the columns, drawn once from `seed` and used for every
// questioned segment) in which the same candidate comes first.
// Errors: nothing_selected if fewer than two candidates have a measured segment, or if no
// measured segment is questioned (both messages say how to change that).
#pragma once
#include <vector>

#include "attribution/attribution_options.h"
#include "attribution/attribution_result.h"
#include "attribution/profile_space.h"
#include "attribution/segment_roles.h"
#include "core/analysis.h"

namespace manicule {

std::vector<AttributionResult> attribute_questioned(const Analysis& analysis, const SegmentRoles& roles,
                                                    DistanceMeasure measure, const AttributionOptions& options,
                                                    unsigned threads = 0);

// The random feature subsets of a run: `count` subsets of round(share * features) columns
// (at least 1), each sorted. Shared by stability and recorded by its seed.
std::vector<ColumnSubset> feature_resamples(Eigen::Index features, std::size_t count, double share,
                                            std::uint64_t seed);

// Throws nothing_selected unless at least `needed` candidates are measured.
void require_candidates(const SegmentRoles& roles, std::size_t needed, const std::string& task);

}  // namespace manicule
