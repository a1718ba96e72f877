// The runs table: one row per batch, analysis or merge, with its parameters (JSON), its
// counters and its status. A run starts as 'running' and its counters are updated in each
// of its transactions, so a run killed half-way shows how far it got; the next run on the
// store (which holds the store's lock, so no other run can be alive) marks it 'interrupted'.
#pragma once
#include <cstdint>
#include <string>

#include <nlohmann/json.hpp>

#include "store/sqlite_db.h"

namespace manicule::store {

struct RunCounters {
  std::size_t files_found = 0;      // files the run was about
  std::size_t files_unchanged = 0;  // size and time as stored: not even hashed
  std::size_t files_hashed = 0;     // hashed, content already stored: not parsed
  std::size_t files_read = 0;       // parsed (XML read), including those that failed
  std::size_t files_failed = 0;     // failing now (read this time or stored as failed)
  std::size_t bytes_read = 0;       // bytes hashed or parsed
};

// In the caller's transaction. `settings_id` 0 = none.
std::int64_t begin_run(Database& db, const std::string& kind, std::int64_t settings_id,
                       const nlohmann::json& parameters);
void update_run(Database& db, std::int64_t run_id, const RunCounters& counters);
void finish_run(Database& db, std::int64_t run_id, const std::string& status);
// Whether a run was left unfinished (killed); the next run that writes marks it with
// mark_interrupted_runs.
bool any_run_unfinished(Database& db);
// Whether the store records any run at all (a store just made holds none).
bool any_run_recorded(Database& db);
void mark_interrupted_runs(Database& db);

}  // namespace manicule::store
