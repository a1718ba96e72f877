#include "cli/attribution_cli_options.h"

#include <filesystem>
#include <iostream>
#include <map>
#include <set>

#include "attribution/candidate_ranking.h"
#include "attribution/label_file.h"
#include "cli/number_checks.h"
#include "cli/repeatable_option.h"
#include "cli/text_checks.h"
#include "core/error.h"
#include "core/facade.h"

namespace manicule::cli {

namespace fs = std::filesystem;

void AttributionCommandOptions::add_to(CLI::App& command, AttributionTask task) {
  measuring.analysis.ranks = std::string(kAttributionRanks);
  measuring.add_to(command, {"tsv", "json"}, true);
  add_settings(command, task == AttributionTask::attribute, task != AttributionTask::attribute);
  if (task == AttributionTask::attribute)
    command.add_option("--top", top, "candidates listed per questioned segment (0: all)")->capture_default_str();
  if (task == AttributionTask::verify)
    command.add_option("--candidate", settings.verify_candidate, "verify against this candidate only (default: each)");
  if (task == AttributionTask::evaluate) {
    AttributionOptions& s = settings;
    command.add_flag("--verification", with_verification,
                     "also evaluate General Impostors verification (AUC, c@1, F0.5u)");
    command.add_flag("--author-absent", s.author_absent,
                     "verification: leave a held-out segment's own author out of the impostors, as when the "
                     "true author of a questioned text is not in the run");
    command.add_option("--pairs", s.verification_pairs,
                       "also verify this many same-author and this many different-author segment pairs")
        ->capture_default_str();
    command.add_option("--table", table, "TSV: predictions, candidates, confusion, rules or verification")
        ->check(CLI::IsMember({"predictions", "candidates", "confusion", "rules", "verification"}))
        ->capture_default_str();
  }
}

void AttributionCommandOptions::add_settings(CLI::App& command, bool stability, bool impostors) {
  AttributionOptions& s = settings;
  command.add_option("--labels", labels_file,
                     "CSV file 'segment,label' naming who wrote which segment (overrides the edition; an empty "
                     "label questions the segment)")
      ->check(not_blank());
  command.add_option("--rule", rule,
                     "how a candidate's segments make its profile: weighted-centroid (nearer segments count more), "
                     "centroid, nearest (its single nearest segment)")
      ->check(CLI::IsMember({"weighted-centroid", "centroid", "nearest"}))
      ->capture_default_str();
  command.add_option("--weight-spread", s.weight_spread,
                     "weighted-centroid: a segment this share farther than the candidate's nearest counts e^-1")
      ->check(above_zero())
      ->capture_default_str();
  command.add_option("--z-limit", s.z_limit, "limit z-scores to +-this before measuring (0: no limit)")
      ->check(zero_or_more())
      ->capture_default_str();
  command.add_option("--seed", s.seed, "seed of every random draw (recorded in the output)")->capture_default_str();
  command.add_option("--min-words-warning", s.reliable_words,
                     "warn below this many words (Eder 2015, DSH 30(2): about 5,000 in most languages)")
      ->capture_default_str();
  if (stability) {
    command.add_option("--resamples", s.resamples, "random feature subsets for the stability figure")
        ->capture_default_str();
    command.add_option("--resample-share", s.resample_share, "share of the features in each subset")
        ->check(CLI::Range(0.01, 1.0))
        ->capture_default_str();
  }
  if (impostors) {
    one_value_each_time(command.add_option("--impostors", impostor_inputs,
                                           "TEI files or folders whose texts serve only as impostors (repeatable)"));
    command.add_option("--iterations", s.impostor_iterations, "General Impostors: rounds per problem")
        ->check(CLI::Range(std::size_t{1}, std::size_t{1000000}))
        ->capture_default_str();
    command.add_option("--feature-share", s.impostor_feature_share, "General Impostors: share of features per round")
        ->check(CLI::Range(0.01, 1.0))
        ->capture_default_str();
    command.add_option("--impostors-per-round", s.impostors_per_iteration,
                       "General Impostors: impostors drawn per round")
        ->check(CLI::Range(std::size_t{1}, std::size_t{100000}))
        ->capture_default_str();
    command.add_flag("--leave-out-files", s.leave_out_files,
                     "when a known segment is held out, hold out its whole file (in a teiCorpus, its text), so "
                     "that chapters of one novel never vouch for each other (the band's calibration does so by "
                     "itself when every candidate has texts in two files or texts)");
    command.add_option("--calibration-problems", s.calibration_problems,
                       "known problems (labelled segments left out in turn, each against its own candidate and "
                       "against its nearest rival) that calibrate or evaluate the undecided band")
        ->capture_default_str();
  }
}

Request AttributionCommandOptions::to_request() const {
  // Refused before any file is read: the table would be empty, with exit code 0.
  if (table == "verification" && !with_verification)
    throw Error(ErrorKind::usage, "--table verification needs --verification (the verification figures are computed "
                                  "only then)");
  // Likewise: it shapes only verification problems, which evaluate makes with --verification
  // or --pairs; without either it would be recorded and do nothing.
  if (settings.author_absent && !with_verification && settings.verification_pairs == 0)
    throw Error(ErrorKind::usage, "--author-absent shapes the verification figures: give --verification (or --pairs N) "
                                  "with it");
  Request request = measuring.to_request();
  request.compute_distances = false;
  apply_settings(request);
  return request;
}

void AttributionCommandOptions::apply_settings(Request& request) const {
  request.attribution = settings;
  request.attribution.rule = rule_from_option_name(rule);
  if (!labels_file.empty()) request.attribution.labels = load_label_file(labels_file);
  if (!impostor_inputs.empty()) {
    request.attribution.impostor_files = expand_inputs(impostor_inputs);
    // A text among its own impostors beats every candidate: each verdict would turn into
    // "different author". The same file named twice is refused here, the same content
    // under another name once it has been read (assign_roles_noting).
    std::set<std::string> editions;
    for (const auto& f : expand_inputs(request.inputs)) editions.insert(fs::weakly_canonical(f).string());
    for (const auto& f : request.attribution.impostor_files)
      if (editions.count(fs::weakly_canonical(f).string()))
        throw Error(ErrorKind::usage, "--impostors names a file that is also an input: " + f +
                                          " (impostors must be other texts than the edition's)");
    request.inputs.insert(request.inputs.end(), impostor_inputs.begin(), impostor_inputs.end());
  }
}

AttributionRun run_attribution(const Request& request, AttributionTask task) {
  AttributionRun run{run_analysis(request), {}};
  run.roles = assign_roles_noting(run.analysis, request,
                                  {task == AttributionTask::attribute, task != AttributionTask::attribute,
                                   task == AttributionTask::evaluate});
  return run;
}

void apply_measuring_options(const AnalysisOptions& options, const CLI::App& command, bool attributing,
                             Request& request) {
  AnalysisOptions measuring = options;
  if (attributing && command.count("--ranks") == 0) measuring.ranks = kAttributionRanks;
  measuring.apply_to(request);
}

SegmentRoles assign_roles_noting(Analysis& analysis, const Request& request, AttributionSteps steps) {
  const AttributionOptions& s = request.attribution;
  if (!s.impostor_files.empty()) {
    const std::set<std::string> impostors(s.impostor_files.begin(), s.impostor_files.end());
    std::map<std::string, std::string> edition_by_sha;
    for (const auto& in : analysis.provenance.inputs)
      if (!impostors.count(in.path) && !in.sha256.empty()) edition_by_sha.emplace(in.sha256, in.path);
    for (const auto& in : analysis.provenance.inputs) {
      auto same = impostors.count(in.path) ? edition_by_sha.find(in.sha256) : edition_by_sha.end();
      if (same != edition_by_sha.end())
        throw Error(ErrorKind::bad_input,
                    "this impostor file has the same content as the input " + same->second +
                        ": a text cannot be its own impostor",
                    in.path);
    }
  }
  SegmentRoles roles = assign_roles(analysis, s);
  for (const auto& w : roles.warnings) {
    std::cerr << "manicule: note: " << w << '\n';
    analysis.notes.push_back(w);
  }
  auto& p = analysis.provenance.parameters;
  if (analysis.provenance.parameter("measure").empty())
    p.emplace_back("measure", std::string(measure_info(request.measure).name) + " (" +
                                  std::string(measure_info(request.measure).citation) + ")");
  p.emplace_back("candidate rule", rule_name(s.rule) + (s.rule == CandidateRule::weighted_centroid
                                                             ? ", spread " + exact_number(s.weight_spread)
                                                             : std::string()));
  p.emplace_back("z-score limit", s.z_limit > 0 ? "+-" + exact_number(s.z_limit) : "none");
  p.emplace_back("labels", s.labels.empty() ? "from the edition"
                                            : "from the edition, overridden by " + s.labels.front().source);
  p.emplace_back("candidates", std::to_string(roles.candidates.size()));
  p.emplace_back("questioned segments", std::to_string(roles.with_role(SegmentRole::questioned).size()));
  p.emplace_back("seed", std::to_string(s.seed));
  if (steps.ranking) {
    p.emplace_back("stability", std::to_string(s.resamples) + " random subsets of " +
                                    exact_number(s.resample_share * 100) + "% of the features");
  }
  if (steps.impostors) {
    p.emplace_back("general impostors", std::to_string(s.impostor_iterations) + " rounds, " +
                                            exact_number(s.impostor_feature_share * 100) + "% of the features and " +
                                            std::to_string(s.impostors_per_iteration) + " impostors a round");
    if (!s.impostor_files.empty()) p.emplace_back("impostor files", std::to_string(s.impostor_files.size()));
  }
  if (steps.evaluation) {
    p.emplace_back("held out", s.leave_out_files ? "whole files" : "segments");
    p.emplace_back("held-out author among the impostors", s.author_absent ? "no" : "yes");
  }
  return roles;
}

CommandRunner attribution_command(CLI::App& app, const std::string& name, const std::string& description,
                                  AttributionTask task, AttributionStep compute, AttributionWriter write_json,
                                  AttributionWriter write_tsv) {
  auto* command = app.add_subcommand(name, description);
  auto options = std::make_shared<AttributionCommandOptions>();
  options->add_to(*command, task);
  return [=]() -> int {
    const Request request = options->to_request();
    AttributionRun run = run_attribution(request, task);
    compute(run, request, *options);
    write_output(options->measuring.output, [&](std::ostream& out) {
      (options->measuring.format == "json" ? write_json : write_tsv)(out, run.analysis, *options);
    });
    return 0;
  };
}

}  // namespace manicule::cli
