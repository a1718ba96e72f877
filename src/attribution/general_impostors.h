// General Impostors (Koppel & Winter 2014, "Determining if two documents are written by the
// same author", JASIST 65(1): 178-187; as used by Kestemont et al. 2016, "Authenticating the
// writings of Julius Caesar", Expert Systems with Applications 63: 86-96).
// In each of `iterations` rounds: draw `feature_share` of the features and
// `per_iteration` impostors, both at random; the round counts 1 if the questioned profile
// is nearer to the candidate than to every impostor drawn, 1/2 on a tie, else 0. The
// score is the mean over the rounds, in [0, 1].
// An impostor is a group of rows (the texts of one other author, or one text), profiled
// exactly as the candidate is (the CandidateRule over its rows, on the drawn features):
// a candidate summed up from many texts is then never set against lone texts, which would
// favour whoever has written most.
// Rounds draw from `seed` alone, so a score is the same whatever else the run computes.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

#include "attribution/attribution_options.h"
#include "attribution/profile_space.h"

namespace manicule {

struct ImpostorSettings {
  std::size_t iterations = 100;
  double feature_share = 0.5;
  std::size_t per_iteration = 10;
  CandidateRule rule = CandidateRule::weighted_centroid;
  double spread = 0.2;
};

ImpostorSettings impostor_settings(const AttributionOptions& options);

using RowGroup = std::vector<std::size_t>;  // rows of the ProfileSpace

// `known` and every group of `impostors` must not be empty; `impostors` must not be empty.
double impostors_score(const ProfileSpace& space, const double* questioned, const RowGroup& known,
                       const std::vector<RowGroup>& impostors, const ImpostorSettings& settings, std::uint64_t seed);

}  // namespace manicule
