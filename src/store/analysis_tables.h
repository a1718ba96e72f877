// An analysis computed from the store, kept in it as an 'analysis' run: the segments it
// took in (analysis_segments), the features it used with their totals, means and standard
// deviations (features), each segment's k nearest segments (neighbours), PCA components and
// coordinates, and attributions when an attribution step supplies them. Written in one
// transaction: an analysis is in the store whole or not at all.
// The run's analysis_key, the SHA-256 of its parameters and of every (path, SHA-256, stem) used,
// finds an earlier identical analysis, so asking the same question again costs nothing.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/analysis.h"
#include "store/sqlite_db.h"
#include "store/stored_corpus.h"

namespace manicule::store {

// One ranked candidate for a questioned segment (src/attribution's AttributionResult, flat).
struct AttributionRow {
  std::string segment;          // the questioned segment
  std::size_t rank = 1;         // 1 = nearest candidate under the rule
  std::string candidate;
  double distance = 0;          // to the candidate's profile under the rule
  std::string nearest_segment;  // the candidate's nearest single segment
  double nearest_distance = 0;
  double margin = 0;            // of the questioned segment: second minus first distance
  double stability = 0;         // share of resampled feature sets keeping the first first
  std::string rule;
  std::string warnings;         // JSON array
};

std::string analysis_key(const nlohmann::json& parameters, const StoredSelection& selection);

// The finished analysis run with this key, if any.
std::optional<std::int64_t> find_analysis(Database& db, const std::string& key);

// `notes` are kept with the run's parameters, so that a later run that reuses the analysis
// says them again. `files_failed`: the failing files the selection left out, the run's own.
std::int64_t write_analysis(Database& db, std::int64_t settings_id, const nlohmann::json& parameters,
                            const std::string& key, const Analysis& analysis, const StoredCorpus& stored,
                            const std::vector<std::string>& notes, std::size_t files_failed,
                            const std::vector<AttributionRow>& attributions = {});

}  // namespace manicule::store
