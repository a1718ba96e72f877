// `manicule merge OUT IN...`: folds stores (e.g. the shard stores of an array job) into
// one; OUT is created when missing. Contents held by several stores are kept once.
#include <filesystem>
#include <iostream>
#include <memory>
#include <set>
#include <string>

#include "cli/commands.h"
#include "cli/store_report.h"
#include "core/error.h"
#include "store/store_merge.h"
#include "store/store_schema.h"

namespace manicule::cli {

CommandRunner add_merge_command(CLI::App& app) {
  auto* command = app.add_subcommand("merge", "Merge archive stores (e.g. the shards of an array job) into one");
  auto out = std::make_shared<std::string>();
  auto inputs = std::make_shared<std::vector<std::string>>();
  command->add_option("output", *out, "the store to merge into (created if missing)")->required();
  command->add_option("inputs", *inputs, "stores to merge in")->required();
  return [=]() -> int {
    for (const auto& in : *inputs)
      if (in == *out) throw Error(ErrorKind::usage, "cannot merge " + in + " into itself");
    // Every input is checked to be a store before the output is created, so that a
    // mistyped input does not leave a new, empty store behind.
    for (const auto& in : *inputs) store::open_store(in, false);
    const bool created = !std::filesystem::exists(*out);
    auto target = store::open_store(*out, true);
    std::set<std::string> held_before;  // OUT's files before the merge
    if (!created) held_before = store::stored_file_paths(*target);
    try {
      for (const auto& in : *inputs) {
        auto source = store::open_store(in, false);
        const store::MergeSummary merged = store::merge_store(*target, *source);
        report_merge(std::cout, in, merged);
        for (const auto& path : merged.input_files) held_before.erase(path);
      }
    } catch (...) {
      // Each input is merged in one transaction, so an existing output keeps what it had
      // and the inputs reported merged; an output this merge created goes again.
      if (created) {
        target.reset();
        store::remove_store_files(*out);
      }
      throw;
    }
    // A file deleted or renamed since an earlier merge is gone from the shares but not
    // from OUT: merge adds and updates, it never removes, so the curator is told.
    if (!held_before.empty())
      std::cerr << "manicule: note: " << *out << " holds " << held_before.size()
                << " file(s) that none of the merged stores has, such as " << *held_before.begin()
                << ": merge adds and updates files but never removes one; to hold just what the inputs hold, "
                   "merge them into a new store (docs/store.md)\n";
    return 0;
  };
}

}  // namespace manicule::cli
