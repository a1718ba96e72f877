#include "store/store_settings.h"

#include <algorithm>

#include "core/error.h"
#include "core/file_reading.h"
#include "core/provenance.h"
#include "core/sha256.h"
#include "core/utf8_text.h"
#include "manicule_version.h"
#include "store/store_schema.h"

namespace manicule::store {

namespace {

std::vector<std::string> sorted(std::vector<std::string> names) {
  std::sort(names.begin(), names.end());
  names.erase(std::unique(names.begin(), names.end()), names.end());
  return names;
}

}  // namespace

ReadingSettings reading_settings(const Request& request) {
  const TokenizerOptions& t = request.tokenizer;
  nlohmann::json options = {
      {"unit", request.unit},
      {"preset", request.preset == Preset::diplomatic ? "diplomatic" : "reading"},
      {"keep", sorted(request.keep)},
      {"drop", sorted(request.drop)},
      {"joint", request.joint == JointSpeech::drop ? "drop" : "each"},
      {"base_witness", request.base_witness},
      {"default_language", request.default_language},
      {"tokenizer", {{"case_fold", t.case_fold}, {"keep_numbers", t.keep_numbers},
                     {"keep_punctuation", t.keep_punctuation}, {"long_s", t.long_s},
                     {"ligatures", t.ligatures}, {"apostrophes", t.apostrophes}}},
      {"features", {{"kind", std::string(feature_kind_name(request.features.kind))}, {"n", request.features.n}}},
  };
  ReadingSettings s;
  s.request = options;
  s.unit = request.unit;
  s.selection = request.selection_rules().describe();
  s.tokenizer = describe_tokenizer(request.tokenizer);
  s.features = describe(request.features);
  nlohmann::json keyed = {{"options", options}, {"reader", std::string("manicule ") + MANICULE_VERSION_STRING},
                          {"reading_revision", kReadingRevision},
                          {"store_format", kStoreFormat}};
  s.key = sha256_hex(json_text(keyed));
  return s;
}

std::int64_t find_settings(Database& db, const ReadingSettings& s) {
  Statement find = db.prepare("SELECT settings_id FROM settings WHERE key = ?1");
  find.bind(1, s.key);
  return find.step() ? find.int64_at(0) : 0;
}

std::int64_t ensure_settings(Database& db, const ReadingSettings& s, bool* inserted) {
  if (inserted) *inserted = false;
  if (const std::int64_t known = find_settings(db, s)) return known;
  db.prepare("INSERT INTO settings (key, unit, selection, tokenizer, features, request) VALUES (?1, ?2, ?3, ?4, ?5, ?6)")
      .run(s.key, s.unit, s.selection, s.tokenizer, s.features, json_text(s.request));
  if (inserted) *inserted = true;
  return db.last_insert_id();
}

std::string settings_key(Database& db, std::int64_t settings_id) {
  Statement find = db.prepare("SELECT key FROM settings WHERE settings_id = ?1");
  find.bind(1, settings_id);
  return find.step() ? find.text_at(0) : std::string();
}

std::vector<StoredSettings> list_settings(Database& db) {
  std::vector<StoredSettings> out;
  Statement all = db.prepare(
      "SELECT settings_id, key, unit, selection, tokenizer, features, request, "
      "(SELECT count(*) FROM files f WHERE EXISTS (SELECT 1 FROM readings r WHERE r.settings_id = s.settings_id "
      "AND r.sha256 = f.sha256)) FROM settings s ORDER BY settings_id");
  while (all.step()) {
    StoredSettings row;
    row.id = all.int64_at(0);
    row.settings.key = all.text_at(1);
    row.settings.unit = all.text_at(2);
    row.settings.selection = all.text_at(3);
    row.settings.tokenizer = all.text_at(4);
    row.settings.features = all.text_at(5);
    row.settings.request = nlohmann::json::parse(all.text_at(6));
    row.files = static_cast<std::size_t>(all.int64_at(7));
    // Counts from an earlier manicule keep their key: the same options give another key now.
    Request request;
    apply_settings(row.settings.request, request);
    row.this_reader = reading_settings(request).key == row.settings.key;
    out.push_back(std::move(row));
  }
  return out;
}

std::int64_t latest_batch_settings(Database& db) {
  Statement latest = db.prepare(
      "SELECT settings_id FROM runs WHERE kind = 'batch' AND settings_id IS NOT NULL ORDER BY run_id DESC LIMIT 1");
  if (latest.step()) return latest.int64_at(0);
  auto all = list_settings(db);
  if (all.empty()) throw Error(ErrorKind::nothing_selected, "the store " + db.path() + " holds no counts yet (run batch)");
  // A store made by merge alone has no batch run to say which counts are meant: with one
  // settings that is clear; with several, taking one by the order of the merge's inputs
  // would analyse a part of the archive nobody asked for.
  if (all.size() > 1)
    throw Error(ErrorKind::usage, "the store " + db.path() + " holds counts read under " + std::to_string(all.size()) +
                                      " reading settings and no batch run says which to take (a store made by merge): "
                                      "choose them with --settings (see --list-settings)");
  return all.back().id;
}

void apply_settings(const nlohmann::json& o, Request& r) {
  r.unit = o.at("unit").get<std::string>();
  r.preset = o.at("preset") == "diplomatic" ? Preset::diplomatic : Preset::reading;
  r.keep = o.at("keep").get<std::vector<std::string>>();
  r.drop = o.at("drop").get<std::vector<std::string>>();
  r.joint = o.at("joint") == "drop" ? JointSpeech::drop : JointSpeech::each;
  r.base_witness = o.at("base_witness").get<std::string>();
  r.default_language = o.at("default_language").get<std::string>();
  const auto& t = o.at("tokenizer");
  r.tokenizer.case_fold = t.at("case_fold");
  r.tokenizer.keep_numbers = t.at("keep_numbers");
  r.tokenizer.keep_punctuation = t.at("keep_punctuation");
  r.tokenizer.long_s = t.at("long_s");
  r.tokenizer.ligatures = t.at("ligatures");
  r.tokenizer.apostrophes = t.at("apostrophes");
  r.features.kind = parse_feature_kind(o.at("features").at("kind").get<std::string>());
  r.features.n = o.at("features").at("n");
}

}  // namespace manicule::store
