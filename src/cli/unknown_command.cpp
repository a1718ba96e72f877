#include "cli/unknown_command.h"

#include <algorithm>

namespace manicule::cli {

namespace {

// Levenshtein distance over bytes: command names are ASCII.
std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

}  // namespace

std::string unknown_command_message(const std::string& word, const std::vector<std::string>& commands) {
  // A near one: two edits at most (a spelling, a slip), one for a word of four letters or
  // fewer ("an" is two edits from map, and means annotate or analyse-store as much), else
  // one the word begins ("analyse" for analyse-store); only when exactly one is that near.
  const std::size_t most_edits = word.size() <= 4 ? 1 : 2;
  std::vector<std::string> near;
  for (const auto& name : commands)
    if (edit_distance(word, name) <= most_edits) near.push_back(name);
  if (near.empty())
    for (const auto& name : commands)
      if (word.size() >= 2 && name.compare(0, word.size(), word) == 0) near.push_back(name);
  std::string out = "manicule: no command '" + word + "'";
  out += near.size() == 1 ? "; did you mean " + near.front() + "?" : std::string(".");
  out += " The commands are:";
  for (const auto& name : commands) out += " " + name;
  out += " (manicule --help says what each does)\n";
  return out;
}

}  // namespace manicule::cli
