// The `manicule` command: parses arguments, runs one subcommand, maps errors to exit codes.
// Only src/cli prints to the terminal.
#include <algorithm>
#include <iostream>
#include <string>

#include <CLI/CLI.hpp>

#include "cli/allocator_settings.h"
#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "cli/message_stream.h"
#include "cli/number_checks.h"
#include "cli/unknown_command.h"
#include "core/error.h"
#include "manicule_version.h"
#include "measure/blas_library.h"
#include "measure/cosine_gram.h"
#include "store/sqlite_db.h"

int main(int argc, char** argv) {
  using namespace manicule;
  // Process-wide settings that are the program's to choose, before any thread starts (the
  // library leaves them to a host that embeds it).
  let_blas_threads_sleep_when_idle();
  store::skip_sqlite_memory_statistics();
  cli::keep_freed_memory_for_reuse();
  cli::back_main_heap_with_huge_pages();
  cli::back_thread_heaps_with_huge_pages();
  const cli::EscapedStderr escaped_stderr;
  CLI::App app{"manicule: measure style inside TEI editions"};
  app.set_version_flag("--version", std::string("manicule ") + MANICULE_VERSION_STRING);
  app.require_subcommand(1);
  // Only the command named first is built when there is one (building every command's
  // options took some 2 ms, a tenth of an unchanged archive's re-run); anything else
  // (--help, --version, a mistyped name) gets them all, for CLI11's lists and messages.
  const std::vector<cli::CommandEntry> entries = cli::all_commands();
  const std::string first = argc > 1 ? argv[1] : "";
  const bool named = std::any_of(entries.begin(), entries.end(), [&](const auto& e) { return first == e.name; });
  if (!named && !first.empty() && first.front() != '-') {
    std::vector<std::string> names;
    for (const auto& entry : entries) names.emplace_back(entry.name);
    std::cerr << cli::unknown_command_message(first, names);
    return cli::kExitUsage;
  }
  std::vector<std::pair<CLI::App*, cli::CommandRunner>> commands;
  for (const auto& entry : entries) {
    if (named && first != entry.name) continue;
    cli::CommandRunner runner = entry.add(app);
    commands.emplace_back(app.get_subcommands(nullptr).back(), std::move(runner));
    if (commands.back().first->get_name() != entry.name) {
      std::cerr << "manicule: internal error: the command listed as " << entry.name << " is named "
                << commands.back().first->get_name() << '\n';
      return static_cast<int>(ErrorKind::internal);
    }
  }
  cli::refuse_signs_on_unsigned_options(app);
  // Usage errors begin like every other message, so that a log line says whose it is.
  app.failure_message([](const CLI::App*, const CLI::Error& e) {
    return "manicule: " + std::string(e.what()) + "\nRun with --help for more information.\n";
  });
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int code = app.exit(e);
    return code == 0 ? 0 : cli::kExitUsage;
  }
  try {
    for (auto& [command, runner] : commands) {
      if (!command->parsed()) continue;
      // --threads, where a command reads files, limits the analysis' BLAS too: a user who
      // asks for one thread on a shared node gets one, where the search's products took two.
      if (const CLI::Option* threads = command->get_option_no_throw("--threads"); threads && threads->count())
        limit_blas_threads(threads->as<unsigned>());
      return runner();
    }
    std::cerr << "manicule: no command given\n";
    return cli::kExitUsage;
  } catch (const Error& e) {
    std::cerr << "manicule: " << e.what() << '\n';
    return static_cast<int>(e.kind());
  } catch (const std::exception& e) {
    std::cerr << "manicule: internal error: " << e.what() << '\n';
    return static_cast<int>(ErrorKind::internal);
  }
}
