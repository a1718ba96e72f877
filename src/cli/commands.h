// The command line's subcommands. Each `add_*_command` adds its subcommand (with its
// options) to the app and returns the function that runs it once parsed; main() maps
// errors to exit codes (exit_codes.h). To add a command: write cli/<name>_command.cpp
// with its add function, declare it here and list it in commands.cpp.
#pragma once
#include <functional>
#include <vector>

#include <CLI/CLI.hpp>

namespace manicule::cli {

using CommandRunner = std::function<int()>;
using CommandAdder = CommandRunner (*)(CLI::App&);

CommandRunner add_segments_command(CLI::App& app);
CommandRunner add_profile_command(CLI::App& app);
CommandRunner add_distances_command(CLI::App& app);
CommandRunner add_map_command(CLI::App& app);
CommandRunner add_tree_command(CLI::App& app);
CommandRunner add_annotate_command(CLI::App& app);
CommandRunner add_show_command(CLI::App& app);
CommandRunner add_export_command(CLI::App& app);
CommandRunner add_batch_command(CLI::App& app);
CommandRunner add_analyse_store_command(CLI::App& app);
CommandRunner add_merge_command(CLI::App& app);
CommandRunner add_attribute_command(CLI::App& app);
CommandRunner add_verify_command(CLI::App& app);
CommandRunner add_evaluate_command(CLI::App& app);

// A command's name (as its add function gives it to CLI11) and its add function.
struct CommandEntry {
  const char* name;
  CommandAdder add;
};

// Every command, in the order `manicule --help` lists them.
std::vector<CommandEntry> all_commands();

}  // namespace manicule::cli
