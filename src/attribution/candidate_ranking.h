// Candidate ranking: how far a questioned profile is from each candidate, under one of the
// CandidateRules (attribution_options.h), on every feature or a subset.
// Ties are broken by candidate order, so rankings are repeatable.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "attribution/attribution_options.h"
#include "attribution/profile_space.h"

namespace manicule {

struct CandidateMeasure {
  std::size_t candidate = 0;     // index into the candidate list given
  double distance = 0;           // to the candidate's profile under the rule
  double nearest_distance = 0;   // to its nearest single row
  std::size_t nearest_row = 0;   // that row of the ProfileSpace
};

// The distance from `q` to the profile that `rule` makes of `rows`, given the distances
// from q to each of those rows on the same columns (`row_distances`, same order).
// `rows` must not be empty.
double distance_to_candidate(const ProfileSpace& space, const double* q, const std::vector<std::size_t>& rows,
                             const std::vector<double>& row_distances, CandidateRule rule, double spread,
                             const ColumnSubset& columns);

// Every candidate with at least one row, nearest first under the rule.
std::vector<CandidateMeasure> rank_candidates(const ProfileSpace& space, const double* q,
                                              const std::vector<std::vector<std::size_t>>& candidate_rows,
                                              CandidateRule rule, double spread, const ColumnSubset& columns);

std::string rule_name(CandidateRule rule);  // "weighted centroid", "centroid", "nearest segment"
// The rule as the command line names it: "weighted-centroid", "centroid", "nearest".
std::string rule_option_name(CandidateRule rule);
// The rule an option name stands for (weighted centroid for any other name).
CandidateRule rule_from_option_name(const std::string& name);

}  // namespace manicule
