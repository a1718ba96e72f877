#include "attribution/general_impostors.h"

#include <algorithm>
#include <cmath>

#include "attribution/candidate_ranking.h"
#include "attribution/seeded_sampler.h"

namespace manicule {

ImpostorSettings impostor_settings(const AttributionOptions& options) {
  ImpostorSettings s;
  s.iterations = options.impostor_iterations;
  s.feature_share = options.impostor_feature_share;
  s.per_iteration = options.impostors_per_iteration;
  s.rule = options.rule;
  s.spread = options.weight_spread;
  return s;
}

namespace {

double distance_to_group(const ProfileSpace& space, const double* q, const RowGroup& rows,
                         const ImpostorSettings& settings, const ColumnSubset& columns, std::vector<double>& scratch) {
  scratch.resize(rows.size());
  for (std::size_t j = 0; j < rows.size(); ++j) scratch[j] = profile_distance(space, q, space.row(rows[j]), columns);
  return distance_to_candidate(space, q, rows, scratch, settings.rule, settings.spread, columns);
}

}  // namespace

double impostors_score(const ProfileSpace& space, const double* questioned, const RowGroup& known,
                       const std::vector<RowGroup>& impostors, const ImpostorSettings& settings, std::uint64_t seed) {
  if (settings.iterations == 0 || known.empty() || impostors.empty()) return 0.0;
  SeededSampler sampler(seed);
  const auto n = static_cast<std::size_t>(space.features());
  const auto k = std::clamp<std::size_t>(
      static_cast<std::size_t>(std::llround(settings.feature_share * static_cast<double>(n))), 1, n);
  double wins = 0;
  std::vector<double> scratch;
  for (std::size_t round = 0; round < settings.iterations; ++round) {
    ColumnSubset columns;
    for (std::size_t c : sampler.choose(n, k)) columns.push_back(static_cast<Eigen::Index>(c));
    std::sort(columns.begin(), columns.end());
    const auto drawn = sampler.choose(impostors.size(), std::min(settings.per_iteration, impostors.size()));
    const double to_candidate = distance_to_group(space, questioned, known, settings, columns, scratch);
    double to_impostor = INFINITY;
    for (std::size_t i : drawn)
      to_impostor = std::min(to_impostor, distance_to_group(space, questioned, impostors[i], settings, columns, scratch));
    if (to_candidate < to_impostor) {
      wins += 1;
    } else if (to_candidate == to_impostor) {
      wins += 0.5;
    }
  }
  return wins / static_cast<double>(settings.iterations);
}

}  // namespace manicule
