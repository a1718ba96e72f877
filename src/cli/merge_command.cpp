// `manicule merge OUT IN...`: folds stores (e.g. the shard stores of an array job) into
// one; OUT is created when missing. Contents held by several stores are kept once.
#include <filesystem>
#include <iostream>
#include <memory>

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
    try {
      for (const auto& in : *inputs) {
        auto source = store::open_store(in, false);
        report_merge(std::cout, in, store::merge_store(*target, *source));
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
    return 0;
  };
}

}  // namespace manicule::cli
