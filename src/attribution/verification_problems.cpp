#include "attribution/verification_problems.h"

#include <map>

#include "attribution/candidate_ranking.h"
#include "attribution/seeded_sampler.h"
#include "core/parallel_items.h"

namespace manicule {

ProblemBuilder::ProblemBuilder(const Analysis& analysis, const SegmentRoles& roles, const ProfileSpace& space,
                               const AttributionOptions& options)
    : analysis_(analysis),
      roles_(roles),
      space_(space),
      options_(options),
      candidates_(collect_candidates(analysis, roles)) {
  std::map<std::string, std::size_t> files;
  for (const auto& s : analysis.segments) file_of_.push_back(files.emplace(s.work, files.size()).first->second);
}

bool ProblemBuilder::excluded(std::size_t other, std::size_t segment, bool held_out) const {
  if (other == segment) return true;
  return held_out && options_.leave_out_files && file_of_[other] == file_of_[segment];
}

bool ProblemBuilder::build(std::size_t segment, const std::string& candidate, bool held_out,
                           const std::string& absent, ImpostorProblem& problem) const {
  const std::size_t c = candidates_.index_of(candidate);
  if (c == std::string::npos) return false;
  ImpostorProblem p;
  p.segment = segment;
  p.known_segment = segment;
  p.questioned_row = roles_.table_row[segment];
  p.candidate = candidate;
  p.group = file_of_[segment];
  p.same = roles_.role[segment] == SegmentRole::known && roles_.label[segment] == candidate;
  std::map<std::string, RowGroup> by_author;  // "l:" + label, or "f:" + impostor file
  for (std::size_t s = 0; s < roles_.role.size(); ++s) {
    if (excluded(s, segment, held_out)) continue;
    if (roles_.role[s] == SegmentRole::known) {
      if (roles_.label[s] == candidate) {
        p.known.push_back(roles_.table_row[s]);
      } else if (roles_.label[s] != absent) {
        by_author["l:" + roles_.label[s]].push_back(roles_.table_row[s]);
      }
    } else if (roles_.role[s] == SegmentRole::impostor) {
      // An impostor is a file (docs/attribution.md), whatever texts it holds.
      by_author["f:" + analysis_.segments[s].file].push_back(roles_.table_row[s]);
    }
  }
  for (auto& [name, rows] : by_author) {
    p.impostor_rows += rows.size();
    p.impostors.push_back(std::move(rows));
  }
  if (p.known.empty() || p.impostors.empty()) return false;
  problem = std::move(p);
  return true;
}

std::string ProblemBuilder::nearest_other_candidate(std::size_t segment) const {
  std::vector<std::vector<std::size_t>> rows(candidates_.names.size());
  for (std::size_t c = 0; c < rows.size(); ++c) {
    if (candidates_.names[c] == roles_.label[segment]) continue;
    for (std::size_t s : candidates_.segments[c])
      if (!excluded(s, segment, true)) rows[c].push_back(roles_.table_row[s]);
  }
  const auto ranked = rank_candidates(space_, space_.row(roles_.table_row[segment]), rows, options_.rule,
                                      options_.weight_spread, {});
  return ranked.empty() ? std::string() : candidates_.names[ranked.front().candidate];
}

std::vector<ImpostorProblem> ProblemBuilder::known_problems(std::size_t max_segments, std::uint64_t seed) const {
  std::vector<std::size_t> known = roles_.with_role(SegmentRole::known);
  if (known.size() > max_segments) {
    SeededSampler sampler(seed);
    std::vector<std::size_t> chosen;
    for (std::size_t i : sampler.choose(known.size(), max_segments)) chosen.push_back(known[i]);
    std::sort(chosen.begin(), chosen.end());
    known = chosen;
  }
  std::vector<std::vector<ImpostorProblem>> built(known.size());
  parallel_items(known.size(), 0, [&](std::size_t k) {
    const std::size_t s = known[k];
    ImpostorProblem p;
    if (build(s, roles_.label[s], true, "", p)) built[k].push_back(std::move(p));
    const std::string rival = nearest_other_candidate(s);
    const std::string absent = options_.author_absent ? roles_.label[s] : std::string();
    if (!rival.empty() && build(s, rival, true, absent, p)) built[k].push_back(std::move(p));
  });
  std::vector<ImpostorProblem> out;
  for (auto& list : built)
    for (auto& p : list) out.push_back(std::move(p));
  for (std::size_t i = 0; i < out.size(); ++i) out[i].seed = derived_seed(seed, i);
  return out;
}

std::vector<ImpostorProblem> ProblemBuilder::pair_problems(std::size_t each, std::uint64_t seed) const {
  const std::vector<std::size_t> known = roles_.with_role(SegmentRole::known);
  std::vector<ImpostorProblem> out;
  if (known.size() < 2) return out;
  SeededSampler sampler(seed);
  std::size_t same = 0, different = 0, tries = 0;
  while ((same < each || different < each) && tries++ < 1000 * (each + 1)) {
    const std::size_t a = known[sampler.below(known.size())], b = known[sampler.below(known.size())];
    if (file_of_[a] == file_of_[b]) continue;
    const bool is_same = roles_.label[a] == roles_.label[b];
    if ((is_same && same >= each) || (!is_same && different >= each)) continue;
    ImpostorProblem p;
    p.segment = a;
    p.known_segment = b;
    p.questioned_row = roles_.table_row[a];
    p.candidate = roles_.label[b];
    p.group = file_of_[a];
    p.same = is_same;
    p.known = {roles_.table_row[b]};
    for (std::size_t s : known) {
      if (roles_.label[s] == roles_.label[b] || (options_.author_absent && roles_.label[s] == roles_.label[a])) continue;
      if (file_of_[s] == file_of_[a] || file_of_[s] == file_of_[b]) continue;
      p.impostors.push_back({roles_.table_row[s]});
    }
    p.impostor_rows = p.impostors.size();
    if (p.impostors.empty()) continue;
    (is_same ? same : different) += 1;
    out.push_back(std::move(p));
  }
  for (std::size_t i = 0; i < out.size(); ++i) out[i].seed = derived_seed(seed, i);
  return out;
}

std::vector<double> score_problems(const ProfileSpace& space, const std::vector<ImpostorProblem>& problems,
                                   const ImpostorSettings& settings, unsigned threads) {
  std::vector<double> scores(problems.size());
  parallel_items(problems.size(), threads, [&](std::size_t i) {
    const ImpostorProblem& p = problems[i];
    scores[i] = impostors_score(space, space.row(p.questioned_row), p.known, p.impostors, settings, p.seed);
  });
  return scores;
}

}  // namespace manicule
