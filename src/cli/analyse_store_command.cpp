// `manicule analyse-store`: analyses the counts an archive store holds (reads no XML):
// distances with each segment's nearest segments, PCA and attribution on request, over the
// whole archive or a sub-corpus chosen by header metadata; the result goes into the store.
#include <iostream>
#include <memory>

#include "cli/analysis_options.h"
#include "cli/archive_options.h"
#include "cli/attribution_cli_options.h"
#include "cli/commands.h"
#include "cli/progress_display.h"
#include "cli/stop_notice.h"
#include "cli/text_checks.h"
#include "cli/store_report.h"
#include "core/error.h"
#include "store/store_analysis.h"
#include "store/store_schema.h"
#include "store/store_settings.h"

namespace manicule::cli {

CommandRunner add_analyse_store_command(CLI::App& app) {
  auto* command = app.add_subcommand(
      "analyse-store", "Analyse the counts an archive store holds (no XML read): nearest segments, PCA, sub-corpora");
  auto analysis = std::make_shared<AnalysisOptions>();
  auto filters = std::make_shared<ArchiveFilterOptions>();
  struct Flags {
    std::string store;
    std::int64_t settings = 0;
    bool pca = false, attribute = false, recompute = false, list = false, quiet = false;
    std::string unit;  // taken only to be refused (below)
  };
  auto flags = std::make_shared<Flags>();
  command->add_option("--store", flags->store, "the SQLite store made by batch")->required()->check(not_blank());
  command->add_option("--settings", flags->settings,
                      "which reading settings' counts (see --list-settings; default: those of the latest batch run, or a merged store's only ones)");
  command->add_flag("--list-settings", flags->list, "list the reading settings the store holds, and stop");
  analysis->add_to(*command);
  filters->add_to(*command);
  command->add_flag("--pca", flags->pca, "also principal components");
  command->add_flag("--attribute", flags->attribute,
                    "rank the candidate authors of the questioned segments (docs/attribution.md; features then default "
                    "to ranks " + std::string(kAttributionRanks) + ")");
  command->add_flag("--recompute", flags->recompute, "recompute even if an identical analysis is stored");
  command->add_flag("--quiet,-q", flags->quiet, "no progress display");
  // Not an option of this command (the unit is the store's, read by batch), but one a user
  // of the other commands gives by habit: taken, unlisted, to say so rather than CLI11's
  // "not expected".
  command->add_option("--unit,-u", flags->unit)->group("");

  return [=]() -> int {
    if (command->count("--unit"))
      throw Error(ErrorKind::usage, "analyse-store takes the unit of the counts the store holds, read by batch --unit: "
                                    "see --list-settings, and --settings N for a store read with several");
    auto db = store::open_store(flags->store, false);
    if (flags->list) {
      // One settings a line, tab-separated under a header line: which reader made the
      // counts matters when a store holds the same options twice, before and after an update.
      std::cout << "settings\tfiles\treader\tselection\ttokenizer\tfeatures\n";
      for (const auto& s : store::list_settings(*db))
        std::cout << s.id << '\t' << s.files << '\t'
                  << (s.this_reader ? "this version" : "another version (batch reads the files again)") << '\t'
                  << s.settings.selection << '\t' << s.settings.tokenizer << '\t' << s.settings.features << '\n';
      return 0;
    }
    std::int64_t settings_id = flags->settings ? flags->settings : store::latest_batch_settings(*db);
    const store::StoredSettings* chosen = nullptr;
    auto all = store::list_settings(*db);
    for (const auto& s : all)
      if (s.id == settings_id) chosen = &s;
    if (!chosen) throw Error(ErrorKind::usage, "the store has no settings " + std::to_string(settings_id) + " (see --list-settings)");
    if (!chosen->this_reader)
      std::cerr << "manicule: note: the counts and headers of settings " << settings_id
                << " were read by another version of manicule, whose dates and counts may differ;"
                   " batch with the same options reads the files again\n";

    Request request;
    // With --attribute the features default to those of the attribute command.
    apply_measuring_options(*analysis, *command, flags->attribute, request);
    const FeatureSpec asked = request.features;
    store::apply_settings(chosen->settings.request, request);
    bool features_given = command->get_option("--features")->count() + command->get_option("--n")->count() > 0;
    if (features_given && (asked.kind != request.features.kind || asked.n != request.features.n))
      throw Error(ErrorKind::usage, "the store's counts under settings " + std::to_string(settings_id) + " are " +
                                        chosen->settings.features + "; count those asked with batch --features " +
                                        analysis->features + (asked.n > 1 ? " --n " + std::to_string(asked.n) : "") +
                                        " (into this store or another), then analyse them");
    request.compute_pca = flags->pca;
    report_unfinished_work(std::cerr, *db, settings_id);
    ProgressDisplay display(flags->quiet);
    StopNotice notice("manicule: interrupted: no analysis stored; the store is as it was\n", display.enabled());
    store::StoreAnalysisOptions how{filters->to_filter(), flags->attribute, flags->recompute,
                                    display.analysis_progress()};
    auto result = store::analyse_store(*db, settings_id, request, how);
    if (!result.reused)
      notice.work_kept(stored_before_stop_notice("analysis run " + std::to_string(result.run_id), db->path()));
    display.clear();
    report_analysis(std::cout, std::cerr, result);
    db->close();  // its log taken in (or an error), while a stop still says what is kept
    return 0;
  };
}

}  // namespace manicule::cli
