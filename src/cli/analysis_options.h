// Options shared by every command that measures: which features (kind, n, rank range,
// culling, stop list, minimum segment size), which distance measure, PCA settings.
// Fills the analysis part of a Request; one definition so every command spells them alike.
#pragma once
#include <string>

#include <CLI/CLI.hpp>

#include "core/request.h"

namespace manicule::cli {

struct AnalysisOptions {
  std::string features = "word";
  int n = 1;
  std::string ranks = "1-1000";
  double culling = 0;
  std::string stop_words_file;
  std::size_t min_tokens = kDefaultMinSegmentTokens;
  std::string measure = "cosine-delta";
  std::size_t neighbours = 5;

  // --neighbours only for commands whose output lists nearest segments (an option that
  // changes nothing would mislead).
  void add_to(CLI::App& command, bool with_measure = true, bool with_neighbours = true);
  // Sets the analysis fields of `request`; throws Error(usage) for bad values.
  void apply_to(Request& request) const;
};

}  // namespace manicule::cli
