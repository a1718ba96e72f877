// An analysis computed from the store, kept in it as an 'analysis' run: the segments it
// took in (analysis_segments), the features it used with their totals, means and standard
// deviations (features), each segment's k nearest segments (neighbours), PCA components and
// coordinates, and attributions when an attribution step supplies them. Written in one
// transaction: an analysis is in the store whole or not at all.
// The run's analysis_key, the SHA-256 of its parameters and of every (path, SHA-256) used,
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

// One ranked candidate for a questioned segment, as an attribution method reports it.
struct AttributionRow {
  std::string segment;
  std::size_t rank = 1;
  std::string candidate;
  double score = 0;
  std::string method;
  std::string detail;  // free text (e.g. JSON of the method's own figures)
};

std::string analysis_key(const nlohmann::json& parameters, const StoredSelection& selection);

// The finished analysis run with this key, if any.
std::optional<std::int64_t> find_analysis(Database& db, const std::string& key);

std::int64_t write_analysis(Database& db, std::int64_t settings_id, const nlohmann::json& parameters,
                            const std::string& key, const Analysis& analysis, const StoredCorpus& stored,
                            const std::vector<AttributionRow>& attributions = {});

}  // namespace manicule::store
