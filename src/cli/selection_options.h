// Options shared by every command that reads editions: inputs, unit, kept and dropped
// elements, preset, tokenizer switches. One definition, so every command spells them alike.
#pragma once
#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "core/request.h"

namespace manicule::cli {

struct SelectionOptions {
  std::vector<std::string> inputs;
  std::string unit = "whole";
  std::string preset = "reading";
  std::vector<std::string> keep, drop;
  std::string joint = "each";
  bool no_fold = false, keep_numbers = false, keep_punctuation = false;
  bool long_s = false, ligatures = false, no_apostrophes = false;
  std::string feature = "word";
  int n = 1;
  unsigned threads = 0;

  void add_to(CLI::App& command, const std::string& default_unit = "whole");
  // Fills a Request; throws Error(usage) for bad values.
  Request to_request() const;
};

}  // namespace manicule::cli
