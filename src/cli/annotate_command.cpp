// `manicule annotate`: writes a run's results into the editions as TEI standoff (or into
// a separate results file), changing nothing else. The work is in src/standoff
// (edition_annotator.h); this file reads the options and reports. With --attribute and
// --verify the run also ranks the candidates of each questioned segment and verifies them
// (as the attribute and verify commands do, with their settings and their 2,000-word
// default), and the results with their caution go into the same standOff.
// Test hook (used only by tests/cli/test_annotate_safety.py): the environment variable
// MANICULE_TEST_PAUSE_BEFORE_WRITE=<seconds> waits that long after the results are
// computed and before anything is written, so that a test can change the edition on disk
// in between and see the run refuse (exit 6).
#include <iostream>

#include "attribution/attribute.h"
#include "attribution/verify.h"
#include "cli/analysis_options.h"
#include "cli/attribution_cli_options.h"
#include "cli/commands.h"
#include "cli/selection_options.h"
#include "cli/test_pause.h"
#include "cli/text_checks.h"
#include "core/corpus.h"
#include "core/error.h"
#include "core/facade.h"
#include "standoff/edition_annotator.h"

namespace manicule::cli {

CommandRunner add_annotate_command(CLI::App& app) {
  auto* command = app.add_subcommand(
      "annotate", "Write profiles, distances and PCA into the editions as TEI standoff, changing nothing else");
  auto selection = std::make_shared<SelectionOptions>();
  auto analysis_options = std::make_shared<AnalysisOptions>();
  auto settings = std::make_shared<AnnotateSettings>();
  auto in_place = std::make_shared<bool>(false);
  auto output = std::make_shared<std::string>();
  auto standoff_file = std::make_shared<std::string>();
  auto components = std::make_shared<std::size_t>(2);
  selection->add_to(*command);
  analysis_options->add_to(*command);
  auto* in_place_flag = command->add_flag("--in-place", *in_place, "write the results into each edition itself");
  auto* output_option = command->add_option("--output,-o", *output, "write the annotated edition to this file instead");
  auto* standoff_option = command->add_option(
      "--standoff-file", *standoff_file,
      "write the results to a separate TEI file pointing into the editions (edition.xml#id); the editions stay untouched");
  in_place_flag->excludes(output_option)->excludes(standoff_option);
  output_option->excludes(standoff_option);
  command->add_flag("--add-ids", settings->add_ids,
                    "give xml:ids to segment elements that have none, so results point at #id (the only change "
                    "inside <text>)");
  command->add_flag("--backup", settings->backup, "keep the edition as it was in FILE.bak (with --in-place)")
      ->needs(in_place_flag);
  command->add_flag("--all-pairs", settings->standoff.all_pairs,
                    "write a distance link for every pair of segments (default: each segment's nearest, see "
                    "--neighbours)");
  command->add_option("--who", settings->standoff.who,
                      "pointer to the person responsible, for the revisionDesc change entry (e.g. #ed)")
      ->check(not_blank());
  command->add_option("--components", *components, "principal components written per segment (0: no PCA)")
      ->capture_default_str();
  auto attribution = std::make_shared<AttributionCommandOptions>();
  auto attribute = std::make_shared<bool>(false);
  auto verify = std::make_shared<bool>(false);
  command->add_flag("--attribute", *attribute,
                    "also rank the candidate authors of each questioned segment (as the attribute command does; "
                    "features default to ranks " + std::string(kAttributionRanks) + ")");
  auto* verify_flag = command->add_flag("--verify", *verify,
                                        "also verify each questioned segment against the candidates by General "
                                        "Impostors (as the verify command does)");
  attribution->add_settings(*command, true, true);
  command->add_option("--candidate", attribution->settings.verify_candidate,
                      "--verify: against this candidate only (default: each)")
      ->needs(verify_flag);
  return [=]() -> int {
    if (!*in_place && output->empty() && standoff_file->empty())
      throw Error(ErrorKind::usage, "say where the results go: --in-place, --output FILE or --standoff-file FILE");
    settings->mode = *in_place ? AnnotateMode::in_place
                     : !output->empty() ? AnnotateMode::output
                                        : AnnotateMode::standoff_file;
    settings->output = *in_place ? std::string() : !output->empty() ? *output : *standoff_file;
    const bool attributing = *attribute || *verify;
    Request request = selection->to_request();
    apply_measuring_options(*analysis_options, *command, attributing, request);
    request.compute_pca = *components > 0;
    request.pca.components = *components;
    check_analysis_options(request);  // before any edition is read

    // The editions written into; impostor files (--impostors) are read, never written.
    std::vector<std::string> files = expand_inputs(request.inputs);
    std::vector<FileSnapshot> editions;
    editions.reserve(files.size());
    for (const auto& f : files) editions.push_back(take_snapshot(f));
    std::vector<std::string> read = files;  // the editions, then any impostor files
    if (attributing) {
      attribution->apply_settings(request);
      const auto& impostors = request.attribution.impostor_files;
      read.insert(read.end(), impostors.begin(), impostors.end());
    }
    Analysis analysis = analyse_for_standoff(request, read);
    for (const auto& note : analysis.notes) std::cerr << "manicule: note: " << note << '\n';
    if (attributing) {
      SegmentRoles roles = assign_roles_noting(analysis, request, {*attribute, *verify, false});
      if (*attribute)
        analysis.attributions =
            attribute_questioned(analysis, roles, request.measure, request.attribution, request.threads);
      if (*verify) {
        VerificationRun verified =
            verify_questioned(analysis, roles, request.measure, request.attribution, request.threads);
        analysis.verifications = std::move(verified.results);
        analysis.verification_band = verified.band;
      }
      std::cerr << "manicule: caution: " << kAttributionCaution << '\n';
    }
    std::vector<PreparedOutput> outputs = prepare_annotation(analysis, editions, *settings);

    pause_for_tests("MANICULE_TEST_PAUSE_BEFORE_WRITE", "before writing");
    for (const PreparedOutput& out : outputs) {
      if (out.replacing) require_unchanged(*out.replacing);
      if (!out.left_as_it_was) check_replaceable(out.path);
    }
    for (const PreparedOutput& out : outputs) {
      if (out.left_as_it_was) {
        for (const auto& note : out.notes) std::cerr << "manicule: note: " << out.path << ": " << note << '\n';
        continue;
      }
      write_prepared(out, *settings);
      for (const auto& note : out.notes) std::cerr << "manicule: note: " << out.path << ": " << note << '\n';
      std::cerr << "manicule: wrote " << out.path;
      if (out.ids_added) std::cerr << " (xml:id given to " << out.ids_added << " elements)";
      std::cerr << '\n';
    }
    return 0;
  };
}

}  // namespace manicule::cli
