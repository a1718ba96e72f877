// Reading settings: the part of a Request that decides what is read from a file (unit and
// selection, tokenizer, features counted). Their key, the SHA-256 of a canonical JSON of
// those options and the tool version, is the same in every store: a store's counts serve
// any later run with equal settings, and merge matches settings across stores by key.
// A newer manicule, or a new reading revision (core/file_reading.h), gets a new key, so
// counts and headers from an older reader are never reused.
#pragma once
#include <cstdint>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/request.h"
#include "store/sqlite_db.h"

namespace manicule::store {

struct ReadingSettings {
  std::string key;
  std::string unit;
  std::string selection;  // SelectionRules::describe()
  std::string tokenizer;  // describe_tokenizer()
  std::string features;   // describe(FeatureSpec)
  nlohmann::json request;  // the options, to rebuild a Request later
};

struct StoredSettings {
  std::int64_t id = 0;
  ReadingSettings settings;
  std::size_t files = 0;         // files of the archive whose content was read under them
  bool this_reader = false;      // keyed as this manicule keys them (else another version's): batch reuses their counts
};

ReadingSettings reading_settings(const Request& request);

// The settings' row id; 0 when the store does not have them.
std::int64_t find_settings(Database& db, const ReadingSettings& settings);

// The settings' row id, inserting the row when the store does not have it yet (and then
// setting *inserted, when given).
std::int64_t ensure_settings(Database& db, const ReadingSettings& settings, bool* inserted = nullptr);

// The key of the settings row `settings_id` ("" when there is none).
std::string settings_key(Database& db, std::int64_t settings_id);

std::vector<StoredSettings> list_settings(Database& db);

// The settings of the latest batch run, else the only ones stored (a store made by merge);
// Error(nothing_selected) when the store holds no counts yet, Error(usage) when it holds
// several settings and no batch run.
std::int64_t latest_batch_settings(Database& db);

// Sets the reading options of `request` from a stored settings JSON.
void apply_settings(const nlohmann::json& stored, Request& request);

}  // namespace manicule::store
