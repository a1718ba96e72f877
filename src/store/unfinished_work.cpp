#include "store/unfinished_work.h"

#include <map>
#include <vector>

#include <nlohmann/json.hpp>

#include "store/archive_filter.h"

namespace manicule::store {

namespace {

struct BatchScope {
  std::vector<std::string> inputs;  // as given
  std::string settings_key, folder, shard;
};

BatchScope scope_of(const nlohmann::json& p) {
  BatchScope s;
  if (p.contains("inputs") && p["inputs"].is_array())
    for (const auto& i : p["inputs"]) if (i.is_string()) s.inputs.push_back(i.get<std::string>());
  s.settings_key = p.value("settings_key", std::string());
  s.folder = p.contains("folder") && p["folder"].is_string() ? p["folder"].get<std::string>() : "";
  s.shard = p.contains("shard") && p["shard"].is_string() ? p["shard"].get<std::string>() : "";
  return s;
}

// Whether a complete run of scope `later` read everything a run of scope `earlier` was about:
// the same settings, no narrower folder or share, and each earlier input among the later
// inputs or below one of them (as spelled on the command line).
bool covers(const BatchScope& later, const BatchScope& earlier) {
  if (later.settings_key != earlier.settings_key) return false;
  if (!later.folder.empty() && later.folder != earlier.folder) return false;
  if (!later.shard.empty() && later.shard != "1/1" && later.shard != earlier.shard) return false;
  for (const std::string& e : earlier.inputs) {
    bool found = false;
    for (const std::string& l : later.inputs)
      if (e == l || (!l.empty() && starts_with_folder(e, l))) found = true;
    if (!found) return false;
  }
  return true;
}

}  // namespace

std::vector<std::string> unfinished_work(Database& db, std::int64_t settings_id) {
  // Latest first: a later complete run of a scope settles the earlier ones.
  Statement runs = db.prepare(
      "SELECT run_id, kind, status, COALESCE(started, ''), COALESCE(files_found, 0), COALESCE(files_read, 0) + "
      "COALESCE(files_hashed, 0) + COALESCE(files_unchanged, 0), COALESCE(parameters, '{}') "
      "FROM runs WHERE kind = 'merge' OR (kind = 'batch' AND (?1 = 0 OR settings_id = ?1)) ORDER BY run_id DESC");
  runs.bind(1, settings_id);
  // Scopes that later runs account for: complete runs, and unfinished ones already noted
  // (the latest unfinished run of a scope is the one to name; running its command again
  // settles the earlier ones too).
  std::vector<BatchScope> accounted;
  std::map<std::string, bool> merged;  // merge input -> its latest merge run seen
  std::vector<std::string> notes;
  while (runs.step()) {
    const std::string kind = runs.text_at(1), status = runs.text_at(2);
    nlohmann::json p = nlohmann::json::parse(runs.text_at(6), nullptr, false);
    if (p.is_discarded() || !p.is_object()) p = nlohmann::json::object();
    const std::string run = kind + " run " + std::to_string(runs.int64_at(0)) + " (" + runs.text_at(3) + ")";
    if (kind == "batch") {
      const BatchScope scope = scope_of(p);
      bool accounted_for = status == "done";
      for (const BatchScope& later : accounted) accounted_for = accounted_for || covers(later, scope);
      accounted.push_back(scope);
      if (accounted_for) continue;
      std::string note = run + " was " + (status == "failed" ? "stopped by an error" : "interrupted");
      const std::int64_t found = runs.int64_at(4), dealt = runs.int64_at(5);
      if (found > 0) note += " after " + std::to_string(dealt) + " of " + std::to_string(found) + " file(s)";
      note += "; run the same batch command again to complete it";
      notes.push_back(note);
    } else {  // merge: one run per input; its latest merge tells
      const std::string input = p.value("input", std::string());
      if (merged[input]) continue;
      merged[input] = true;
      if (p.contains("input_unfinished") && p["input_unfinished"].is_array() && !p["input_unfinished"].empty())
        notes.push_back(run + " took in " + (input.empty() ? std::string("a store") : input) +
                        ", whose own work was unfinished (" + p["input_unfinished"][0].get<std::string>() +
                        "); merge it again once that is complete");
    }
  }
  return notes;
}

}  // namespace manicule::store
