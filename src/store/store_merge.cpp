#include "store/store_merge.h"

#include <algorithm>
#include <iterator>
#include <map>
#include <optional>
#include <tuple>
#include <unordered_map>

#include "core/error.h"
#include "store/archive_files.h"
#include "store/count_blob.h"
#include "store/file_rows.h"
#include "store/file_stems.h"
#include "store/store_schema.h"
#include "store/run_log.h"
#include "store/store_settings.h"
#include "store/store_vocabulary.h"
#include "store/unfinished_work.h"

namespace manicule::store {

namespace {

// Input feature id -> output feature id, for one settings.
std::vector<FeatureId> map_vocabulary(Database& input, std::int64_t input_settings, StoreVocabulary& out_vocabulary) {
  std::vector<FeatureId> map;
  for_each_stored_form(input, input_settings, [&](FeatureId id, std::string_view form) {
    if (id >= map.size()) map.resize(id + 1, UINT32_MAX);
    map[id] = out_vocabulary.id_of(form);
  });
  out_vocabulary.write_new();
  return map;
}

std::string remap_counts(std::string_view blob, const std::vector<FeatureId>& map, const std::string& store,
                         const std::string& segment) {
  FeatureCounts counts = decode_stored_counts(blob, store, segment);
  for (auto& entry : counts) {
    if (entry.first >= map.size() || map[entry.first] == UINT32_MAX)
      throw Error(ErrorKind::bad_input, "the store " + store + " has a damaged vocabulary (a counted feature has no form)");
    entry.first = map[entry.first];
  }
  std::sort(counts.begin(), counts.end());
  return encode_counts(counts);
}

void merge_settings(Database& out, Database& input, const StoredSettings& in, std::int64_t run, MergeSummary& summary) {
  bool inserted = false;
  std::int64_t out_id = ensure_settings(out, in.settings, &inserted);
  if (inserted) ++summary.settings_added;
  StoreVocabulary out_vocabulary(out, out_id);
  const std::vector<FeatureId> map = map_vocabulary(input, in.id, out_vocabulary);

  Statement readings = input.prepare(
      "SELECT sha256, bytes, status, error, error_kind, title, author, date, year, language, segments, tokens, "
      "first_segment_year, last_segment_year, texts_apart FROM readings WHERE settings_id = ?1 ORDER BY sha256");
  readings.bind(1, in.id);
  Statement insert_reading = out.prepare(kInsertReading);
  Statement segments = input.prepare(kSegmentsOfContent);
  Statement insert_segment = out.prepare(kInsertSegment);
  while (readings.step()) {
    const std::string sha = readings.text_at(0);
    // Columns 1-11 of the query are the statement's ?3-?13; then the run; then 12-14.
    insert_reading.bind(1, out_id).bind(2, sha);
    for (int c = 1; c <= 11; ++c) insert_reading.bind_column(c + 2, readings, c);
    insert_reading.bind(14, run).bind_column(15, readings, 12).bind_column(16, readings, 13);
    insert_reading.bind_column(17, readings, 14);
    insert_reading.step_to_end();
    if (out.changes() == 0) continue;  // the output holds this content already
    ++summary.readings_added;
    segments.bind(1, in.id).bind(2, sha);
    while (segments.step()) {
      insert_segment.bind(1, out_id).bind(2, sha).bind(3, segments.int64_at(0));
      for (int c = 1; c <= 8; ++c) insert_segment.bind(c + 3, segments.text_at(c));
      insert_segment.bind(12, segments.int64_at(9)).bind(13, segments.int64_at(10)).bind(14, segments.int64_at(11));
      insert_segment.bind_blob(15, remap_counts(segments.blob_at(12), map, input.path(),
                                                "segment " + std::to_string(segments.int64_at(0)) +
                                                    " of the content with SHA-256 " + sha));
      insert_segment.bind_column(16, segments, 13).bind_column(17, segments, 14);
      insert_segment.bind_column(18, segments, 15).bind_column(19, segments, 16).bind_column(20, segments, 17);
      insert_segment.bind_column(21, segments, 18);
      insert_segment.step_to_end();
      ++summary.segments_added;
    }
    segments.reset();
  }
}

void merge_files(Database& out, Database& input, MergeSummary& summary) {
  Statement files = input.prepare(
      "SELECT path, relative_path, stem, size, mtime_ns, sha256, read_error FROM files ORDER BY path");
  Statement existing = out.prepare("SELECT mtime_ns FROM files WHERE path = ?1");
  Statement upsert = out.prepare(
      "INSERT OR REPLACE INTO files (path, relative_path, stem, size, mtime_ns, sha256, read_error) "
      "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7)");
  while (files.step()) {
    summary.input_files.insert(files.text_at(0));
    existing.bind(1, files.text_at(0));
    bool present = existing.step();
    bool newer = !present || files.int64_at(4) > existing.int64_at(0);
    existing.reset();
    if (!newer) continue;
    upsert.bind(1, files.text_at(0)).bind(2, files.text_at(1)).bind(3, files.text_at(2));
    upsert.bind(4, files.int64_at(3)).bind(5, files.int64_at(4));
    upsert.bind_column(6, files, 5).bind_column(7, files, 6);
    upsert.step_to_end();
    ++(present ? summary.files_updated : summary.files_added);
    if (!present) summary.files_added_here.push_back({files.text_at(0), files.text_at(1), files.int64_at(3), files.int64_at(4)});
  }
}

}  // namespace

namespace {

// Where every input is one share of one N (its batch runs' --shard K/N), the K/N that none
// of them is, in order; else nothing (a merged store as input, a store read whole).
std::vector<std::string> shares_missing(const std::vector<std::pair<std::string, MergeSummary>>& inputs) {
  std::set<unsigned> found;
  unsigned count = 0;
  for (const auto& [path, summary] : inputs) {
    if (summary.shares.size() != 1) return {};
    const std::optional<Shard> share = shard_from_text(*summary.shares.begin());
    if (!share || share->count < 2 || share->index < 1 || share->index > share->count) return {};
    if (count && share->count != count) return {};
    count = share->count;
    found.insert(share->index);
  }
  std::vector<std::string> missing;
  for (unsigned k = 1; k <= count; ++k)
    if (!found.count(k)) missing.push_back(Shard{k, count}.describe());
  return missing;
}

// Sets outcome.files_maybe_twice (store_merge.h) from the files each input added and those
// of OUT that no input holds.
void note_files_maybe_held_twice(Database& out, MergeOutcome& outcome) {
  if (outcome.held_by_no_input.empty()) return;
  using Identity = std::tuple<std::string, std::int64_t, std::int64_t>;  // relative path, size, time
  std::map<Identity, std::string> unheld;
  Statement row = out.prepare("SELECT relative_path, size, mtime_ns FROM files WHERE path = ?1");
  for (const std::string& path : outcome.held_by_no_input) {
    row.bind(1, path);
    if (row.step()) unheld.emplace(Identity{row.text_at(0), row.int64_at(1), row.int64_at(2)}, path);
    row.reset();
  }
  for (const auto& [input, summary] : outcome.inputs)
    for (const auto& added : summary.files_added_here) {
      const auto match = unheld.find(Identity{added.relative_path, added.size, added.mtime_ns});
      if (match == unheld.end()) continue;
      if (outcome.files_maybe_twice++ == 0) {
        outcome.maybe_twice_added = added.path;
        outcome.maybe_twice_held = match->second;
      }
    }
}

}  // namespace

std::string join_shares(const std::vector<std::string>& shares) {
  std::string out;
  for (const std::string& share : shares) out += (out.empty() ? "" : ", ") + share;
  return out;
}

namespace {

// Merges one input, within the caller's transaction, recording a merge run for it.
MergeSummary merge_one(Database& out, Database& input) {
  MergeSummary summary;
  summary.input_unfinished = unfinished_work(input);
  nlohmann::json parameters = {{"input", input.path()}};
  if (!summary.input_unfinished.empty()) parameters["input_unfinished"] = summary.input_unfinished;
  std::int64_t run = begin_run(out, "merge", 0, parameters);
  for (const auto& settings : list_settings(input)) {
    summary.settings_keys.insert(settings.settings.key);
    merge_settings(out, input, settings, run, summary);
  }
  merge_files(out, input, summary);
  Statement shares = input.prepare("SELECT DISTINCT json_extract(parameters, '$.shard') FROM runs WHERE kind = 'batch'");
  while (shares.step())
    if (!shares.is_null(0)) summary.shares.insert(shares.text_at(0));
  // As a batch counts them: the files the input holds, and those among them that failed.
  RunCounters counters;
  Statement held = input.prepare(
      "SELECT count(DISTINCT f.path), count(DISTINCT CASE WHEN f.read_error IS NOT NULL OR r.status = 'failed' THEN f.path END) "
      "FROM files f LEFT JOIN readings r ON r.sha256 = f.sha256");
  if (held.step()) {
    counters.files_found = static_cast<std::size_t>(held.int64_at(0));
    counters.files_failed = static_cast<std::size_t>(held.int64_at(1));
  }
  counters.files_read = 0;
  update_run(out, run, counters);
  finish_run(out, run, "done");
  return summary;
}

}  // namespace

MergeOutcome merge_stores(Database& out, const std::vector<std::string>& inputs, bool exact) {
  MergeOutcome outcome;
  const std::set<std::string> held_before = stored_file_paths(out);
  std::set<std::string> input_files;
  Transaction t(out);
  mark_interrupted_runs(out);
  for (const std::string& path : inputs) {
    auto input = open_store(path, false);
    MergeSummary summary = merge_one(out, *input);
    // --exact removes what no input holds; an input that has not read all of its share
    // yet would take the rest of the share out of OUT with it.
    if (exact && !summary.input_unfinished.empty())
      throw Error(ErrorKind::nothing_selected,
                  path + ": " + summary.input_unfinished.front() + "; merge --exact would remove from " + out.path() +
                      " the files that run has not reached: complete it first, or merge without --exact");
    input_files.insert(summary.input_files.begin(), summary.input_files.end());
    outcome.settings_keys.insert(summary.settings_keys.begin(), summary.settings_keys.end());
    outcome.inputs.emplace_back(path, std::move(summary));
  }
  outcome.missing_shares = shares_missing(outcome.inputs);
  if (exact && !outcome.missing_shares.empty())
    throw Error(ErrorKind::nothing_selected,
                "the inputs are shares by the --shard of their batch runs, but none is share " +
                    join_shares(outcome.missing_shares) + ": merge --exact would remove the files of " +
                    (outcome.missing_shares.size() > 1 ? "those shares" : "that share") + " from " + out.path() +
                    "; merge every share (a task that saved no store: run it again), or merge without --exact");
  std::set_difference(held_before.begin(), held_before.end(), input_files.begin(), input_files.end(),
                      std::inserter(outcome.held_by_no_input, outcome.held_by_no_input.end()));
  if (!exact) note_files_maybe_held_twice(out, outcome);
  if (exact) {
    remove_files(out, outcome.held_by_no_input);
    outcome.files_removed = outcome.held_by_no_input.size();
    outcome.held_by_no_input.clear();
  }
  refresh_file_stems(out);  // once, over the paths the merge leaves
  t.commit();
  return outcome;
}

}  // namespace manicule::store
