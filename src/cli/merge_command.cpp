// `manicule merge OUT IN...`: folds stores (e.g. the shard stores of an array job) into
// one; OUT is created when missing. Contents held by several stores are kept once. The
// whole merge is one transaction on OUT, under OUT's lock: a merge stopped or failing part
// way leaves OUT as it was, and no other run can use OUT meanwhile.
#include <filesystem>
#include <iostream>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "cli/commands.h"
#include "cli/stop_notice.h"
#include "cli/store_report.h"
#include "cli/text_checks.h"
#include "core/error.h"
#include "store/run_log.h"
#include "store/store_merge.h"
#include "store/store_schema.h"

namespace manicule::cli {

namespace {

// Whether two spellings name one file ("a.sqlite" and "./a.sqlite", a link): merging a
// store into itself would wait on its own lock.
bool same_file(const std::string& a, const std::string& b) {
  std::error_code ec;
  return a == b || std::filesystem::equivalent(a, b, ec);
}

}  // namespace

CommandRunner add_merge_command(CLI::App& app) {
  auto* command = app.add_subcommand("merge", "Merge archive stores (e.g. the shards of an array job) into one");
  auto out = std::make_shared<std::string>();
  auto inputs = std::make_shared<std::vector<std::string>>();
  auto exact = std::make_shared<bool>(false);
  command->add_option("output", *out, "the store to merge into (created if missing)")->required()->check(not_blank());
  command->add_option("inputs", *inputs, "stores to merge in")->required()->check(not_blank());
  command->add_flag("--exact", *exact,
                    "OUT ends holding just the files the inputs hold: files of OUT that no input has (deleted or "
                    "renamed since an earlier merge) are removed, as batch removes vanished files");
  return [=]() -> int {
    for (const auto& in : *inputs)
      if (same_file(in, *out)) throw Error(ErrorKind::usage, "cannot merge " + in + " into itself");
    // Every input is checked to be a store before the output is created, so that a
    // mistyped input does not leave a new, empty store behind.
    for (const auto& in : *inputs) store::open_store(in, false);
    const bool was_missing = !std::filesystem::exists(*out);
    auto target = store::open_store(*out, true);
    // Asked again under OUT's lock: another merge started at the same moment may have
    // created OUT and merged into it first, and what it merged must not go with this one.
    const bool created = was_missing && !store::any_run_recorded(*target);
    store::MergeOutcome merged;
    bool committed = false;
    try {
      StopNotice notice(created ? "manicule: interrupted: nothing merged; " + *out + ", made by this merge, removed\n"
                                : "manicule: interrupted: " + *out + " is left as it was before this merge\n",
                        false, created ? *out : "");
      merged = store::merge_stores(*target, *inputs, *exact);
      committed = true;
      notice.work_kept(stored_before_stop_notice("the merge", *out));
      target->close();  // OUT whole in its one file, or an error (a full disk)
    } catch (...) {
      // Nothing was committed: an existing output is as it was; one this merge created goes.
      // (Once committed, OUT holds the merge, whatever closing it said.)
      if (created && !committed) store::discard_new_store(std::move(target));
      throw;
    }
    for (const auto& [in, summary] : merged.inputs) {
      report_merge(std::cout, in, summary);
      for (const auto& note : summary.input_unfinished)
        std::cerr << "manicule: note: " << in << ": " << note
                  << "; the merged store lacks what that run did not bring in\n";
    }
    if (merged.files_removed) std::cout << "removed " << merged.files_removed << " file(s) that no input holds\n";
    // Shares read with different options (one task given --no-fold) hold counts that no
    // analysis takes together: each analysis takes one settings' counts.
    if (merged.settings_keys.size() > 1) {
      // Which input holds which, so that the task started with other options is found; an
      // input that holds several itself is said to (it was read with several options).
      std::map<std::string, std::string> inputs_of;  // settings key -> the inputs holding it alone
      std::string several;                          // "two.sqlite holds 2"
      for (const auto& [in, summary] : merged.inputs) {
        if (summary.settings_keys.size() > 1) {
          several += (several.empty() ? "" : "; ") + in + " holds " + std::to_string(summary.settings_keys.size());
          continue;
        }
        for (const auto& key : summary.settings_keys) inputs_of[key] += (inputs_of[key].empty() ? "" : ", ") + in;
      }
      std::string one_each;
      for (const auto& [key, names] : inputs_of) one_each += (one_each.empty() ? "one each: " : "; ") + names;
      const std::string held = several + (several.empty() || one_each.empty() ? "" : "; ") + one_each;
      std::cerr << "manicule: note: the merged stores hold counts read under " << merged.settings_keys.size()
                << " different reading settings (" << held
                << "), and an analysis takes the counts of one (see analyse-store --list-settings and --settings)\n";
    }
    // A task of the array that never saved its share (merge --exact refuses such inputs).
    if (!merged.missing_shares.empty())
      std::cerr << "manicule: note: the inputs are shares by the --shard of their batch runs, but none is share "
                << store::join_shares(merged.missing_shares) << ": " << *out
                << " holds of it only what an earlier merge brought\n";
    if (merged.files_maybe_twice)
      std::cerr << "manicule: note: " << merged.files_maybe_twice << " file(s) the merge added match files of " << *out
                << " that no input holds, by name, size and time, under another path, such as "
                << merged.maybe_twice_added << " and " << merged.maybe_twice_held
                << ": if they are the same files given another way (an absolute path in one task, a relative one "
                   "in another), "
                << *out << " now holds them twice; merge --exact keeps the inputs' paths alone\n";
    // A file deleted or renamed since an earlier merge is gone from the shares but not
    // from OUT: without --exact merge adds and updates, it never removes, so the curator is told.
    if (!merged.held_by_no_input.empty())
      std::cerr << "manicule: note: " << *out << " holds " << merged.held_by_no_input.size()
                << " file(s) that none of the merged stores has, such as " << *merged.held_by_no_input.begin()
                << ": merge adds and updates files but never removes one unless given --exact (docs/store.md)\n";
    return 0;
  };
}

}  // namespace manicule::cli
