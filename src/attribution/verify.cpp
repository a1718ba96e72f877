#include "attribution/verify.h"

#include <map>
#include <set>

#include "attribution/seeded_sampler.h"
#include "attribution/size_warnings.h"
#include "attribution/verification_band.h"
#include "attribution/verification_problems.h"
#include "core/error.h"

namespace manicule {

namespace {

std::vector<std::string> tested_candidates(const SegmentRoles& roles, const AttributionOptions& options) {
  if (options.verify_candidate.empty()) return roles.candidates;
  for (const auto& c : roles.candidates)
    if (c == options.verify_candidate) return {c};
  std::string known;
  for (std::size_t i = 0; i < roles.candidates.size() && i < 20; ++i)
    known += (i ? ", '" : "'") + roles.candidates[i] + "'";
  throw Error(ErrorKind::usage, "no measured candidate '" + options.verify_candidate + "'; the candidates are " +
                                    (known.empty() ? std::string("none") : known));
}

bool every_candidate_in_two_files(const Analysis& analysis, const SegmentRoles& roles) {
  std::map<std::string, std::set<std::string>> files_of;
  for (std::size_t i = 0; i < roles.role.size(); ++i)
    if (roles.role[i] == SegmentRole::known) files_of[roles.label[i]].insert(analysis.segments[i].work);
  if (files_of.empty()) return false;
  for (const auto& [candidate, files] : files_of)
    if (files.size() < 2) return false;
  return true;
}

}  // namespace

VerificationRun verify_questioned(const Analysis& analysis, const SegmentRoles& roles, DistanceMeasure measure,
                                  const AttributionOptions& options, unsigned threads) {
  const std::vector<std::size_t> questioned = roles.with_role(SegmentRole::questioned);
  require_questioned(roles);
  if (roles.candidates.empty()) {
    throw Error(ErrorKind::nothing_selected,
                "verification needs a candidate with a measured segment; none is labelled (" +
                    roles.how_to_label_known() + ")");
  }
  if (roles.candidates.size() < 2 && roles.with_role(SegmentRole::impostor).empty()) {
    throw Error(ErrorKind::nothing_selected,
                "verification against the single candidate '" + roles.candidates.front() +
                    "' needs impostors: label texts of other authors, or name a folder of them with --impostors");
  }
  const std::vector<std::string> tested = tested_candidates(roles, options);
  const ProfileSpace space = make_profile_space(analysis.table, measure, options.z_limit);
  const ImpostorSettings settings = impostor_settings(options);
  const ProblemBuilder builder(analysis, roles, space, options);
  AttributionOptions strict = options;
  strict.author_absent = true;
  // A known problem holds out its segment's whole file when every candidate has known texts
  // in two files or more, so that chapters of one novel (speeches of one play) never vouch
  // for each other and the band is not fitted on problems easier than a questioned work;
  // in a one-file edition (letters) only the segment can be held out. A text of a
  // teiCorpus counts as a file of its own (SegmentSummary::work): a collection of letters
  // is many works, whose calibration would otherwise lose most known letters at once.
  strict.leave_out_files = options.leave_out_files || every_candidate_in_two_files(analysis, roles);
  const ProblemBuilder calibrating(analysis, roles, space, strict);

  VerificationRun run;
  const auto known = calibrating.known_problems(options.calibration_problems / 2, derived_seed(options.seed, 1));
  const auto known_scores = score_problems(space, known, settings, threads);
  std::vector<KnownProblem> calibration;
  for (std::size_t i = 0; i < known.size(); ++i) calibration.push_back({known_scores[i], known[i].same});
  run.band = calibrate_band(calibration);
  run.band.method += strict.leave_out_files ? "; each known segment held out with its whole file (in a teiCorpus, its text)"
                                            : "; each known segment held out alone";

  std::vector<ImpostorProblem> problems;
  for (std::size_t q : questioned) {
    for (const auto& candidate : tested) {
      ImpostorProblem p;
      if (builder.build(q, candidate, false, "", p)) problems.push_back(std::move(p));
    }
  }
  // Each problem's seed depends on the segment and candidate only, not on what else is tested.
  for (auto& p : problems) {
    std::uint64_t h = p.segment;
    for (unsigned char ch : p.candidate) h = h * 1099511628211ULL + ch;
    p.seed = derived_seed(options.seed, h);
  }
  const auto scores = score_problems(space, problems, settings, threads);

  const CandidateSet& candidates = builder.candidates();
  for (std::size_t i = 0; i < problems.size(); ++i) {
    const ImpostorProblem& p = problems[i];
    VerificationResult r;
    r.segment = p.segment;
    r.candidate = p.candidate;
    r.score = scores[i];
    r.calibrated_score = calibrated_score(r.score, run.band);
    r.decision = verification_decision(r.score, run.band);
    r.iterations = settings.iterations;
    r.feature_share = settings.feature_share;
    r.impostors_per_iteration = settings.per_iteration;
    r.impostor_pool = p.impostors.size();
    r.impostor_segments = p.impostor_rows;
    r.seed = p.seed;
    r.edition_conjecture = roles.conjecture[p.segment];
    std::vector<std::size_t> candidate_words;
    const std::size_t c = candidates.index_of(p.candidate);
    for (std::size_t s : candidates.segments[c]) candidate_words.push_back(analysis.segments[s].tokens);
    r.warnings = questioned_size_warnings(analysis.segments[p.segment].tokens, candidate_words, options.reliable_words);
    std::string little = candidate_size_warning(p.candidate, candidates.words[c], candidates.segments[c].size(),
                                                options.reliable_words);
    if (!little.empty()) r.warnings.push_back(little);
    // No more rivals than a round draws: every round then draws them all, and beating two or
    // three texts says little (General Impostors relies on many; common practice, no fixed
    // number published).
    if (r.impostor_pool <= settings.per_iteration)
      r.warnings.push_back("only " + std::to_string(r.impostor_pool) + " impostor(s) to draw from, no more than the " +
                           std::to_string(settings.per_iteration) +
                           " a round (--impostors-per-round), so every round draws them all: a score against so few "
                           "rivals says little; --impostors FOLDER adds other texts as impostors");
    // An uncalibrated band's method begins "not calibrated: ", with the counts that fell short.
    if (!run.band.calibrated) r.warnings.push_back("the undecided band is " + run.band.method);
    run.results.push_back(std::move(r));
  }
  return run;
}

}  // namespace manicule
