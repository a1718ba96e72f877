#include "attribution/attribute.h"

#include <algorithm>
#include <cmath>

#include "attribution/candidate_ranking.h"
#include "attribution/seeded_sampler.h"
#include "attribution/size_warnings.h"
#include "core/error.h"
#include "core/parallel_items.h"

namespace manicule {

std::vector<ColumnSubset> feature_resamples(Eigen::Index features, std::size_t count, double share,
                                            std::uint64_t seed) {
  SeededSampler sampler(seed);
  const auto n = static_cast<std::size_t>(features);
  const auto k = std::clamp<std::size_t>(static_cast<std::size_t>(std::llround(share * static_cast<double>(n))), 1, n);
  std::vector<ColumnSubset> out(count);
  for (auto& subset : out) {
    for (std::size_t c : sampler.choose(n, k)) subset.push_back(static_cast<Eigen::Index>(c));
    std::sort(subset.begin(), subset.end());
  }
  return out;
}

void require_candidates(const SegmentRoles& roles, std::size_t needed, const std::string& task) {
  if (roles.candidates.size() >= needed) return;
  std::string found = roles.candidates.empty() ? "none" : "only '" + roles.candidates.front() + "'";
  std::string why;
  for (const auto& w : roles.warnings) why += "; " + w;
  throw Error(ErrorKind::nothing_selected,
              task + " needs at least " + std::to_string(needed) + " candidates with a measured segment; found " +
                  found + why + " (" + roles.how_to_label_known() + ")");
}

std::vector<AttributionResult> attribute_questioned(const Analysis& analysis, const SegmentRoles& roles,
                                                    DistanceMeasure measure, const AttributionOptions& options,
                                                    unsigned threads) {
  require_candidates(roles, 2, "attribution");
  const std::vector<std::size_t> questioned = roles.with_role(SegmentRole::questioned);
  require_questioned(roles);
  const CandidateSet candidates = collect_candidates(analysis, roles);
  const ProfileSpace space = make_profile_space(analysis.table, measure, options.z_limit);
  const std::vector<ColumnSubset> resamples =
      feature_resamples(space.features(), options.resamples, options.resample_share, options.seed);

  std::vector<std::string> candidate_warnings;
  std::vector<std::size_t> segment_words;
  for (std::size_t c = 0; c < candidates.names.size(); ++c) {
    std::string w = candidate_size_warning(candidates.names[c], candidates.words[c], candidates.segments[c].size(),
                                           options.reliable_words);
    if (!w.empty()) candidate_warnings.push_back(w);
    for (std::size_t s : candidates.segments[c]) segment_words.push_back(analysis.segments[s].tokens);
  }

  std::vector<AttributionResult> results(questioned.size());
  parallel_items(questioned.size(), threads, [&](std::size_t k) {
    const std::size_t seg = questioned[k];
    const double* q = space.row(roles.table_row[seg]);
    const auto ranked = rank_candidates(space, q, candidates.rows, options.rule, options.weight_spread, {});
    AttributionResult& r = results[k];
    r.segment = seg;
    r.edition_conjecture = roles.conjecture[seg];
    r.rule = rule_option_name(options.rule);  // as the option and the runs' parameters spell it
    std::vector<std::size_t> by_nearest(ranked.size());
    for (std::size_t i = 0; i < ranked.size(); ++i) by_nearest[i] = i;
    std::stable_sort(by_nearest.begin(), by_nearest.end(), [&](std::size_t a, std::size_t b) {
      return ranked[a].nearest_distance < ranked[b].nearest_distance;
    });
    r.candidates.resize(ranked.size());
    for (std::size_t i = 0; i < ranked.size(); ++i) {
      const CandidateMeasure& m = ranked[i];
      CandidateDistance& d = r.candidates[i];
      d.candidate = candidates.names[m.candidate];
      d.rank = i + 1;
      d.distance = m.distance;
      d.nearest_distance = m.nearest_distance;
      d.nearest_segment = analysis.table_rows[m.nearest_row];
      d.segments = candidates.rows[m.candidate].size();
      d.words = candidates.words[m.candidate];
    }
    for (std::size_t i = 0; i < by_nearest.size(); ++i) r.candidates[by_nearest[i]].nearest_rank = i + 1;
    r.margin = ranked.size() > 1 ? ranked[1].distance - ranked[0].distance : 0.0;

    std::size_t kept = 0;
    for (const ColumnSubset& columns : resamples) {
      const auto again = rank_candidates(space, q, candidates.rows, options.rule, options.weight_spread, columns);
      if (!again.empty() && again.front().candidate == ranked.front().candidate) ++kept;
    }
    r.resamples = resamples.size();
    r.resample_share = options.resample_share;
    r.seed = options.seed;
    r.stability = resamples.empty() ? 0.0 : static_cast<double>(kept) / static_cast<double>(resamples.size());

    r.warnings = questioned_size_warnings(analysis.segments[seg].tokens, segment_words, options.reliable_words);
    r.warnings.insert(r.warnings.end(), candidate_warnings.begin(), candidate_warnings.end());
    if (by_nearest.front() != 0) {
      r.warnings.push_back("the nearest single segment belongs to '" + r.candidates[by_nearest.front()].candidate +
                           "', not to the first candidate");
    }
  });
  return results;
}

}  // namespace manicule
