// `manicule batch`: brings an archive store up to date with the TEI files under the given
// folders (reading only what changed, on all cores), and with --analyse runs an analysis
// over the stored counts. Exit code 1 when some files failed (each is named on stderr).
#include <filesystem>
#include <future>
#include <iostream>
#include <memory>
#include <optional>

#include "cli/analysis_options.h"
#include "cli/archive_options.h"
#include "cli/attribution_cli_options.h"
#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/error.h"
#include "cli/interrupt_requests.h"
#include "cli/number_checks.h"
#include "cli/progress_display.h"
#include "cli/stop_notice.h"
#include "cli/text_checks.h"
#include "cli/selection_options.h"
#include "cli/store_report.h"
#include "core/facade.h"
#include "store/batch_run.h"
#include "store/run_log.h"
#include "store/store_analysis.h"
#include "store/store_schema.h"

namespace manicule::cli {

namespace {

const char* outcome_word(store::FileOutcome outcome) {
  switch (outcome) {
    case store::FileOutcome::unchanged: return "unchanged";
    case store::FileOutcome::hashed: return "hashed (content known)";
    case store::FileOutcome::copy: return "hashed (the content of another file read in this run)";
    case store::FileOutcome::read: return "read";
    case store::FileOutcome::failed: return "failed";
  }
  return "";
}

}  // namespace

CommandRunner add_batch_command(CLI::App& app) {
  auto* command = app.add_subcommand(
      "batch", "Read an archive of TEI files into a store (only what changed), optionally analyse it there");
  auto selection = std::make_shared<SelectionOptions>();
  auto analysis = std::make_shared<AnalysisOptions>();
  auto filters = std::make_shared<ArchiveFilterOptions>();
  struct Flags {
    std::string store, shard;
    bool verify = false, analyse = false, pca = false, attribute = false, recompute = false, quiet = false,
         verbose = false;
    std::size_t commit_every = store::BatchOptions().commit_files;
  };
  auto flags = std::make_shared<Flags>();
  selection->add_to(*command);
  analysis->add_to(*command);
  filters->add_to(*command);
  command->add_option("--store", flags->store, "the SQLite store to bring up to date (created if missing)")
      ->required()
      ->check(not_blank());
  command->add_option("--shard", flags->shard, "read only share K of N of the files (K/N, e.g. 2/8), for array jobs")
      ->check(not_blank());
  command->add_flag("--verify-hashes", flags->verify,
                    "hash every file, even when its size and modification time are as stored, and check the store "
                    "itself first (a fixity check)");
  command->add_option("--commit-every", flags->commit_every,
                      "files per transaction at most (a transaction also ends every two seconds)")
      ->check(at_least_one())
      ->capture_default_str();
  command->add_flag("--analyse", flags->analyse, "then analyse the stored counts (distances, nearest neighbours)");
  command->add_flag("--pca", flags->pca, "with --analyse: also principal components");
  command->add_flag("--attribute", flags->attribute,
                    "with --analyse: rank the candidate authors of the questioned segments (docs/attribution.md; "
                    "features then default to ranks " + std::string(kAttributionRanks) + ")");
  command->add_flag("--recompute", flags->recompute, "with --analyse: recompute even if an identical analysis is stored");
  command->add_flag("--quiet,-q", flags->quiet, "no progress display (of the reading and of the analysis)");
  command->add_flag("--verbose,-v", flags->verbose, "name each file that had to be opened, and what became of it");

  return [=]() -> int {
    // Options that only the analysis reads were taken without --analyse and did nothing.
    if (!flags->analyse)
      for (const char* name : {"--pca", "--attribute", "--recompute", "--ranks", "--culling", "--stop-words",
                               "--min-tokens", "--measure", "--neighbours", "--author", "--years", "--language",
                               "--title"})
        if (command->count(name) > 0)
          throw Error(ErrorKind::usage, std::string(name) +
                                            " serves the analysis alone: add --analyse, or give it to analyse-store "
                                            "later (batch itself reads and stores every file of the inputs, or of "
                                            "--folder)");
    Request request = selection->to_request();
    // With --attribute the features default to those of the attribute command.
    apply_measuring_options(*analysis, *command, flags->attribute, request);
    request.compute_pca = flags->pca;
    // Before an hour of reading, not after it.
    if (flags->analyse) check_analysis_options(request);
    store::BatchOptions options;
    options.filter = filters->to_filter();
    options.verify_hashes = flags->verify;
    options.commit_files = flags->commit_every;
    if (!flags->shard.empty()) options.shard = parse_shard(flags->shard);
    if (flags->analyse) options.keep_counts_of_segments_from = request.feature_space.min_segment_tokens;

    // When files are read, the analysis' BLAS is opened meanwhile rather than waited for
    // after (its loading and thread start took 1-19 ms of the plays' analysis). A re-run
    // that reads nothing, whose analysis is most often stored already, does not load it.
    std::future<void> blas;
    // A stop signal (Ctrl-C, SIGTERM at a cluster's time limit) is only noted from before the
    // store is opened until it is closed: the process then never ends by the signal with its
    // last commits in the log beside the store, which a copy of the store's file alone (the
    // job-array script's) would miss. Declared before the store, so destroyed after it.
    std::optional<InterruptRequests> interrupts(std::in_place);
    const bool store_is_new = !std::filesystem::exists(flags->store);
    std::unique_ptr<store::Database> db;
    try {
      // A Ctrl-C while another program holds the store ends the wait for it at once.
      db = store::open_store(flags->store, true, [&] { return interrupts->requested(); });
    } catch (const store::StoreInUse&) {
      if (!interrupts->requested()) throw;
      std::cerr << "manicule: interrupted while waiting for the store " << flags->store
                << ", which another program holds; nothing read or written\n";
      return interrupts->exit_code();
    }
    ProgressDisplay display(flags->quiet);
    store::BatchSummary summary;
    store::BatchProgress last;
    try {
      summary = store::run_batch(
          *db, request, options, [&](const store::BatchProgress& p, const std::string& path, store::FileOutcome outcome) {
            if (flags->analyse && !blas.valid() && outcome != store::FileOutcome::unchanged)
              blas = store::open_blas_ahead(request);
            if (flags->verbose && !path.empty()) {
              display.clear();
              std::cerr << outcome_word(outcome) << ": " << path << '\n';
            }
            display.update(p);
            last = p;
            if (interrupts->requested()) throw store::BatchInterrupted();
          });
    } catch (const Error&) {
      // Refused before any run was recorded (a --folder naming nothing, an input that does
      // not exist): a store this run created holds nothing, and goes again. One that holds
      // a run keeps it, so that the next run goes on from its commits.
      bool holds_nothing = false;
      try {
        holds_nothing = store_is_new && !store::any_run_recorded(*db);
      } catch (const Error&) {  // a store that cannot even say so is kept; the first error is the one told
      }
      if (holds_nothing) store::discard_new_store(std::move(db));
      throw;
    } catch (const store::BatchInterrupted&) {
      display.clear();
      std::cerr << "manicule: interrupted: this run stored " << last.files_done << " of " << last.files_total
                << " file(s); the others keep what the store held for them before, if anything; run the same "
                   "command again to go on\n";
      db->close();
      return interrupts->exit_code();
    }
    display.clear();
    // A stop that came after the last file: the run is complete, and says so.
    const auto stopped_after_last_file = [&](bool analysis_dropped) {
      std::cerr << "manicule: interrupted after every file was stored" << (analysis_dropped ? "; no analysis made" : "")
                << '\n';
      return interrupts->exit_code();
    };
    if (interrupts->requested()) {
      report_batch(std::cout, flags->store, summary);
      db->close();
      return stopped_after_last_file(flags->analyse);
    }
    // An analysis may take long: from here on Ctrl-C ends it at once, as usual (what the
    // batch committed is in the store or its log, which SQLite takes in at the next opening).
    if (flags->analyse) interrupts.reset();
    report_batch(std::cout, flags->store, summary);
    // Most often a mistyped folder; with --shard, a share of a small archive may be empty.
    if (summary.counters.files_found == 0)
      std::cerr << "manicule: note: no TEI file (*.xml, *.tei) found under the inputs"
                << (flags->shard.empty() ? "" : " in share " + flags->shard) << '\n';
    report_left_aside(std::cerr, summary);
    report_files_without_segments(std::cerr, summary, request.unit);
    if (summary.files_maybe_twice)
      std::cerr << "manicule: note: " << summary.files_maybe_twice
                << " file(s) new to the store match stored ones by name, size and time under another path, such as "
                << summary.maybe_twice_new << " and " << summary.maybe_twice_stored
                << ": if they are the same files given another way (another working folder, a relative path "
                   "against an absolute one), the store now holds them twice, for it keeps files by their path "
                   "as given; give the inputs as before, or always as absolute paths\n";
    if (summary.files_found_twice)
      std::cerr << "manicule: note: the inputs reach " << summary.files_found_twice
                << " file(s) a second time, under another input or another spelling of one (such as "
                << summary.found_twice_passed << ", found as " << summary.found_twice_kept
                << "): each file is read once, under the path found first\n";
    report_failures(std::cerr, summary, flags->verbose);
    if (flags->verbose)
      for (const std::string& path : summary.removed) std::cerr << "removed: " << path << '\n';
    // During the analysis a stop ends the run at once, saying what it leaves (until the
    // store is closed: the notice outlives the closing).
    std::optional<StopNotice> notice;
    if (flags->analyse) {
      report_unfinished_work(std::cerr, *db, summary.settings_id);
      notice.emplace("manicule: interrupted during the analysis: every file is stored, no analysis\n",
                     display.enabled());
      if (blas.valid()) blas.get();
      store::StoreAnalysisOptions how{options.filter, flags->attribute, flags->recompute,
                                      display.analysis_progress()};
      store::StoreAnalysisResult result = store::analyse_store(*db, summary.settings_id, request, how, summary.fresh.get());
      if (!result.reused)
        notice->work_kept(stored_before_stop_notice("analysis run " + std::to_string(result.run_id), db->path()));
      summary.fresh.reset();
      display.clear();
      report_analysis(std::cout, std::cerr, result);
    }
    db->close();  // its log taken in (or an error), before a stop noted meanwhile is answered
    notice.reset();
    if (interrupts && interrupts->requested()) return stopped_after_last_file(false);
    return summary.failures.empty() && summary.unlisted.empty() ? kExitOk : kExitSomeFilesFailed;
  };
}

}  // namespace manicule::cli
