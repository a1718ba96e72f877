// A first word that names no command ("analyze-store", "analyse"): said with the word, the
// closest command's name where one is near, and the list, instead of CLI11's "A subcommand
// is required", which left a user who typed the American spelling guessing.
#pragma once
#include <string>
#include <vector>

namespace manicule::cli {

// The message for `word` (with its newline), given the commands' names in help order.
std::string unknown_command_message(const std::string& word, const std::vector<std::string>& commands);

}  // namespace manicule::cli
