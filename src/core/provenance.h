// Provenance: what produced a result: tool and version, when (SOURCE_DATE_EPOCH honoured,
// the reproducible-builds convention), from which files (with their SHA-256), and with
// which selection and tokenizer settings. Every output carries it.
#pragma once
#include <string>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/corpus.h"
#include "core/request.h"

namespace manicule {

struct InputFile {
  std::string path;
  std::string sha256;
};

struct Provenance {
  std::string tool = "manicule";
  std::string version;
  std::string created;    // ISO 8601 UTC, e.g. 2026-03-02T09:30:00Z
  std::string selection;  // SelectionRules::describe()
  std::string tokenizer;  // options in words
  std::string features;   // e.g. "word 1-grams"
  std::vector<InputFile> inputs;
  std::vector<std::pair<std::string, std::string>> parameters;  // added by each analysis

  // The value of a parameter, "" when the run did not record it.
  std::string parameter(const std::string& key) const;
};

// Now, or SOURCE_DATE_EPOCH when set, as ISO 8601 UTC.
std::string current_time_iso8601();

// Input hashes come from the corpus (computed while parsing).
Provenance make_provenance(const Request& request, const Corpus& corpus);
nlohmann::json provenance_json(const Provenance& p);
std::vector<std::pair<std::string, std::string>> provenance_pairs(const Provenance& p);
std::string describe_tokenizer(const TokenizerOptions& options);

}  // namespace manicule
