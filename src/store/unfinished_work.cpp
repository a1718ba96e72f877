#include "store/unfinished_work.h"

#include <map>
#include <tuple>

#include <nlohmann/json.hpp>

namespace manicule::store {

namespace {

// What makes two batch runs the same command, as far as what they bring into the store goes.
std::string batch_scope(const nlohmann::json& p) {
  nlohmann::json scope = nlohmann::json::object();
  for (const char* key : {"inputs", "settings_key", "folder", "shard"})
    if (p.contains(key)) scope[key] = p[key];
  return scope.dump();
}

}  // namespace

std::vector<std::string> unfinished_work(Database& db, std::int64_t settings_id) {
  // Latest first: a later complete run of a scope settles the earlier ones.
  Statement runs = db.prepare(
      "SELECT run_id, kind, status, COALESCE(started, ''), COALESCE(files_found, 0), COALESCE(files_read, 0) + "
      "COALESCE(files_hashed, 0) + COALESCE(files_unchanged, 0), COALESCE(parameters, '{}') "
      "FROM runs WHERE kind = 'merge' OR (kind = 'batch' AND (?1 = 0 OR settings_id = ?1)) ORDER BY run_id DESC");
  runs.bind(1, settings_id);
  std::map<std::string, bool> settled;  // scope -> a later complete run exists
  std::vector<std::string> notes;
  while (runs.step()) {
    const std::string kind = runs.text_at(1), status = runs.text_at(2);
    nlohmann::json p = nlohmann::json::parse(runs.text_at(6), nullptr, false);
    if (p.is_discarded() || !p.is_object()) p = nlohmann::json::object();
    const std::string run = kind + " run " + std::to_string(runs.int64_at(0)) + " (" + runs.text_at(3) + ")";
    if (kind == "batch") {
      const std::string scope = batch_scope(p);
      if (status == "done") {
        settled[scope] = true;
      } else if (!settled[scope]) {
        settled[scope] = true;  // said once, for its latest run
        std::string note = run + " was " + (status == "failed" ? "stopped by an error" : "interrupted");
        const std::int64_t found = runs.int64_at(4), dealt = runs.int64_at(5);
        if (found > 0) note += " after " + std::to_string(dealt) + " of " + std::to_string(found) + " file(s)";
        note += "; run the same batch command again to complete it";
        notes.push_back(note);
      }
    } else {  // merge: one run per input
      const std::string scope = "merge " + p.value("input", std::string());
      if (settled[scope]) continue;
      settled[scope] = true;
      if (p.contains("input_unfinished") && p["input_unfinished"].is_array() && !p["input_unfinished"].empty())
        notes.push_back(run + " took in " + p.value("input", std::string("a store")) + ", whose own work was unfinished (" +
                        p["input_unfinished"][0].get<std::string>() + "); merge it again once that is complete");
    }
  }
  return notes;
}

}  // namespace manicule::store
