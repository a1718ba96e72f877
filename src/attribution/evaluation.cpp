#include "attribution/evaluation.h"

#include <map>
#include <set>

#include "attribution/attribute.h"
#include "attribution/candidate_ranking.h"
#include "attribution/seeded_sampler.h"
#include "attribution/verification_band.h"
#include "attribution/verification_metrics.h"
#include "attribution/verification_problems.h"
#include "core/parallel_items.h"
#include "measure/pairwise_distances.h"

namespace manicule {

namespace {

constexpr CandidateRule kRules[] = {CandidateRule::weighted_centroid, CandidateRule::centroid, CandidateRule::nearest};

// The held-out prediction of one known segment under each rule (npos: no candidate left).
std::vector<std::size_t> predict_held_out(const ProfileSpace& space, const Eigen::MatrixXd& distances,
                                          const CandidateSet& candidates, const std::vector<std::size_t>& file_of_row,
                                          std::size_t row, bool leave_out_files, double spread,
                                          std::vector<double>& margin_of_rule) {
  std::vector<std::size_t> predicted(std::size(kRules), std::string::npos);
  std::vector<double> best(std::size(kRules), 0), second(std::size(kRules), 0);
  std::vector<bool> has_best(std::size(kRules), false), has_second(std::size(kRules), false);
  for (std::size_t c = 0; c < candidates.rows.size(); ++c) {
    std::vector<std::size_t> rows;
    std::vector<double> d;
    for (std::size_t r : candidates.rows[c]) {
      if (r == row || (leave_out_files && file_of_row[r] == file_of_row[row])) continue;
      rows.push_back(r);
      d.push_back(distances(static_cast<Eigen::Index>(row), static_cast<Eigen::Index>(r)));
    }
    if (rows.empty()) continue;
    for (std::size_t k = 0; k < std::size(kRules); ++k) {
      const double dist = distance_to_candidate(space, space.row(row), rows, d, kRules[k], spread, {});
      if (!has_best[k] || dist < best[k]) {
        second[k] = best[k];
        has_second[k] = has_best[k];
        best[k] = dist;
        has_best[k] = true;
        predicted[k] = c;
      } else if (!has_second[k] || dist < second[k]) {
        second[k] = dist;
        has_second[k] = true;
      }
    }
  }
  margin_of_rule.assign(std::size(kRules), 0);
  for (std::size_t k = 0; k < std::size(kRules); ++k)
    if (has_second[k]) margin_of_rule[k] = second[k] - best[k];
  return predicted;
}

VerificationEvaluation cross_fitted(const std::vector<ImpostorProblem>& problems, const std::vector<double>& scores,
                                    const std::string& what, std::uint64_t seed) {
  VerificationEvaluation e;
  e.problems = what;
  std::vector<KnownProblem> halves[2];
  std::vector<int> fold(problems.size());
  for (std::size_t i = 0; i < problems.size(); ++i) {
    fold[i] = static_cast<int>(derived_seed(seed, problems[i].group) & 1U);
    halves[fold[i]].push_back({scores[i], problems[i].same});
  }
  const VerificationBand bands[2] = {calibrate_band(halves[1]), calibrate_band(halves[0])};
  std::vector<double> calibrated;
  std::vector<bool> same;
  for (std::size_t i = 0; i < problems.size(); ++i) {
    calibrated.push_back(calibrated_score(scores[i], bands[fold[i]]));
    same.push_back(problems[i].same);
    e.scores.push_back({problems[i].segment, problems[i].candidate, problems[i].known_segment, problems[i].same,
                        scores[i], calibrated.back(), bands[fold[i]].calibrated});
    (problems[i].same ? e.same : e.different) += 1;
    if (calibrated.back() == 0.5) ++e.undecided;
  }
  e.auc = roc_auc(calibrated, same);
  e.raw_auc = roc_auc(scores, same);
  e.c_at_1 = c_at_1(calibrated, same);
  e.f05u = f05u(calibrated, same);
  const auto band_text = [](const VerificationBand& b) {
    return b.calibrated ? "[" + std::to_string(b.low).substr(0, 4) + ", " + std::to_string(b.high).substr(0, 4) + "]"
                        : std::string("not calibrated (0.5)");
  };
  // Said as it happened: with one file, or too few problems, there is one half or no band.
  if (problems.empty()) {
    e.calibration = "no problems to cross-fit";
  } else if (halves[0].empty() || halves[1].empty()) {
    std::set<std::size_t> files;
    for (const auto& p : problems) files.insert(p.group);
    e.calibration = "not cross-fitted: the halves are drawn by file (a teiCorpus's texts apart), and the problems' " + std::to_string(files.size()) +
                    " file(s) all fell into one; scores read against 0.5";
  } else if (!bands[0].calibrated && !bands[1].calibrated)
    e.calibration = "not calibrated: neither random half of the files had enough known problems for a band; "
                    "scores read against 0.5";
  else
    e.calibration = "two halves of the files drawn at random; each half read with the band calibrated on the other (" +
                    band_text(bands[0]) + " and " + band_text(bands[1]) + ")";
  return e;
}

}  // namespace

EvaluationResult evaluate_labelled(const Analysis& analysis, const SegmentRoles& roles, DistanceMeasure measure,
                                   const AttributionOptions& options, bool with_verification, unsigned threads) {
  require_candidates(roles, 2, "evaluation");
  EvaluationResult result;
  result.held_out = options.leave_out_files ? "file" : "segment";
  const ProfileSpace space = make_profile_space(analysis.table, measure, options.z_limit);
  const CandidateSet candidates = collect_candidates(analysis, roles);
  result.candidates = candidates.names;
  DistanceOptions distance_options;
  distance_options.threads = threads;
  const Eigen::MatrixXd distances = pairwise_distances(space.values, measure, distance_options);

  std::map<std::string, std::size_t> files;
  std::vector<std::size_t> file_of_row(analysis.table_rows.size());
  for (std::size_t r = 0; r < analysis.table_rows.size(); ++r)
    file_of_row[r] = files.emplace(analysis.segments[analysis.table_rows[r]].work, files.size()).first->second;

  const std::vector<std::size_t> known = roles.with_role(SegmentRole::known);
  std::vector<std::vector<std::size_t>> predictions(known.size());
  std::vector<std::vector<double>> margins(known.size());
  parallel_items(known.size(), threads, [&](std::size_t k) {
    predictions[k] = predict_held_out(space, distances, candidates, file_of_row, roles.table_row[known[k]],
                                      options.leave_out_files, options.weight_spread, margins[k]);
  });

  std::size_t chosen = 0;
  for (std::size_t k = 0; k < std::size(kRules); ++k)
    if (kRules[k] == options.rule) chosen = k;
  const std::size_t n = candidates.names.size();
  result.confusion.assign(n, std::vector<std::size_t>(n, 0));
  for (CandidateRule rule : kRules) result.rules.push_back({rule_option_name(rule), 0, known.size()});
  for (std::size_t k = 0; k < known.size(); ++k) {
    const std::size_t truth = candidates.index_of(roles.label[known[k]]);
    for (std::size_t r = 0; r < std::size(kRules); ++r)
      if (predictions[k][r] == truth) ++result.rules[r].correct;
    const std::size_t predicted = predictions[k][chosen];
    EvaluatedSegment e;
    e.segment = known[k];
    e.truth = candidates.names[truth];
    e.predicted = predicted == std::string::npos ? "" : candidates.names[predicted];
    e.margin = margins[k][chosen];
    e.truth_had_other_text = false;
    for (std::size_t r : candidates.rows[truth])
      if (r != roles.table_row[known[k]] && !(options.leave_out_files && file_of_row[r] == file_of_row[roles.table_row[known[k]]]))
        e.truth_had_other_text = true;
    if (predicted != std::string::npos) ++result.confusion[truth][predicted];
    if (predicted == truth) ++result.correct;
    result.segments.push_back(e);
  }
  result.evaluated = known.size();
  result.accuracy = known.empty() ? 0.0 : static_cast<double>(result.correct) / static_cast<double>(known.size());
  for (std::size_t c = 0; c < n; ++c) {
    CandidateEvaluation ce;
    ce.candidate = candidates.names[c];
    for (std::size_t p = 0; p < n; ++p) {
      ce.segments += result.confusion[c][p];
      ce.predicted += result.confusion[p][c];
    }
    for (const auto& e : result.segments)
      if (e.truth == ce.candidate && e.predicted.empty()) ++ce.segments;
    ce.correct = result.confusion[c][c];
    ce.precision = ce.predicted ? static_cast<double>(ce.correct) / static_cast<double>(ce.predicted) : 0.0;
    ce.recall = ce.segments ? static_cast<double>(ce.correct) / static_cast<double>(ce.segments) : 0.0;
    result.per_candidate.push_back(ce);
  }
  std::size_t alone = 0;
  for (const auto& e : result.segments)
    if (!e.truth_had_other_text) ++alone;
  if (alone > 0) {
    // With --leave-out-files, a candidate whose texts lie in one file has none left when one
    // of them is held out: said, with the remedy, since a whole run of such errors otherwise
    // reads as a failure of the method.
    std::string why;
    if (options.leave_out_files)
      why = files.size() == 1 ? ": --leave-out-files holds out a segment's whole file (in a teiCorpus, its text), "
                                "and this run has one file; give each candidate's texts in two files or more, or "
                                "leave the option out"
                              : ": --leave-out-files holds out a segment's whole file (in a teiCorpus, its text), and "
                                "their candidate's texts all lie in that one";
    result.warnings.push_back(std::to_string(alone) + " held-out segment(s) had no other text of their candidate left " +
                              "in; they count as errors" + why);
  }

  if (with_verification || options.verification_pairs > 0) {
    const ProblemBuilder builder(analysis, roles, space, options);
    const ImpostorSettings settings = impostor_settings(options);
    if (with_verification) {
      const auto problems = builder.known_problems(options.calibration_problems / 2, derived_seed(options.seed, 2));
      const auto scores = score_problems(space, problems, settings, threads);
      result.verification.push_back(cross_fitted(problems, scores, "segment against candidate", options.seed));
    }
    if (options.verification_pairs > 0) {
      const auto problems = builder.pair_problems(options.verification_pairs, derived_seed(options.seed, 3));
      const auto scores = score_problems(space, problems, settings, threads);
      result.verification.push_back(cross_fitted(problems, scores, "segment pairs", options.seed));
    }
    for (const VerificationEvaluation& v : result.verification)
      if (v.same == 0 || v.different == 0)
        result.warnings.push_back(v.problems + ": " + std::to_string(v.same) + " same-author and " +
                                  std::to_string(v.different) +
                                  " different-author problem(s); AUC needs both (and pairs need segments in "
                                  "different files), so it is not given");
  }
  return result;
}

}  // namespace manicule
