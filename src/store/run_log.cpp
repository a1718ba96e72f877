#include "store/run_log.h"

#include "core/provenance.h"
#include "core/utf8_text.h"
#include "manicule_version.h"

namespace manicule::store {

std::int64_t begin_run(Database& db, const std::string& kind, std::int64_t settings_id,
                       const nlohmann::json& parameters) {
  Statement insert = db.prepare(
      "INSERT INTO runs (kind, settings_id, started, status, tool, parameters) VALUES (?1, ?2, ?3, 'running', ?4, ?5)");
  insert.bind(1, kind);
  if (settings_id) insert.bind(2, settings_id); else insert.bind_null(2);
  insert.bind(3, current_time_iso8601()).bind(4, std::string("manicule ") + MANICULE_VERSION_STRING);
  insert.bind(5, json_text(parameters));
  insert.step_to_end();
  return db.last_insert_id();
}

void update_run(Database& db, std::int64_t run_id, const RunCounters& c) {
  db.prepare(
        "UPDATE runs SET files_found = ?2, files_unchanged = ?3, files_hashed = ?4, files_read = ?5, "
        "files_failed = ?6, bytes_read = ?7 WHERE run_id = ?1")
      .run(run_id, c.files_found, c.files_unchanged, c.files_hashed, c.files_read, c.files_failed, c.bytes_read);
}

void finish_run(Database& db, std::int64_t run_id, const std::string& status) {
  db.prepare("UPDATE runs SET status = ?2, finished = ?3 WHERE run_id = ?1").run(run_id, status, current_time_iso8601());
}

bool any_run_unfinished(Database& db) {
  return db.prepare("SELECT 1 FROM runs WHERE status = 'running' LIMIT 1").step();
}

bool any_run_recorded(Database& db) { return db.prepare("SELECT 1 FROM runs LIMIT 1").step(); }

void mark_interrupted_runs(Database& db) {
  db.exec("UPDATE runs SET status = 'interrupted' WHERE status = 'running'");
}

}  // namespace manicule::store
