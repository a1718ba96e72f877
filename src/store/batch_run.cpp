#include "store/batch_run.h"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <map>
#include <memory>
#include <mutex>
#include <optional>
#include <set>
#include <unordered_map>
#include <unordered_set>

#include "core/corpus_stream.h"
#include "core/error.h"
#include "core/regular_file.h"
#include "store/file_rows.h"
#include "store/file_stems.h"
#include "store/reading_writer.h"
#include "store/store_settings.h"
#include "store/store_schema.h"
#include "store/stored_failure.h"
#include "store/unfinished_work.h"

namespace manicule::store {

namespace {

// Files modified less than this before a run are not trusted by their time next time
// (coarse file-system timestamps; the same reasoning as git's "racily clean" entries).
constexpr std::int64_t kRacyWindowNs = 2'000'000'000;

// What the store holds for a path: the file as last seen, and whether its content has
// been read under this run's settings (and failed). One pass over the files table serves
// the plan and, at the end, the removal of files that are gone.
struct StoredFile {
  std::string relative_path;
  std::uint64_t size = 0;
  std::int64_t mtime_ns = 0;
  std::string sha256;
  bool read = false;  // a reading of this content under these settings is stored (so sha256 is set)
  bool failed = false;
  std::string error;
  std::string read_error;  // why it could not be read at all when last listed (no sha256 then)
};

// Whether a file that could not be opened when last listed still cannot: a link to nothing,
// a file without permission to read it. Such a file as it was is no change, so that a
// re-run over an archive holding one writes nothing (the open is tried, not assumed: a
// link whose target comes back, or a permission granted, leaves its stat as it was).
bool still_unreadable(const std::string& path) {
  try {
    std::fclose(open_regular_file(path));  // (a named pipe put there meanwhile is refused, not waited on)
    return false;
  } catch (const Error&) {
    return true;
  }
}

std::unordered_map<std::string, StoredFile> stored_files(Database& db, std::int64_t settings_id) {
  std::unordered_map<std::string, StoredFile> out;
  Statement all = db.prepare(
      "SELECT f.path, f.relative_path, f.size, f.mtime_ns, f.sha256, r.status, r.error, f.read_error "
      "FROM files f LEFT JOIN readings r ON r.sha256 = f.sha256 AND r.settings_id = ?1");
  all.bind(1, settings_id);
  while (all.step()) {
    StoredFile& f = out[all.text_at(0)];
    f.relative_path = all.text_at(1);
    f.size = static_cast<std::uint64_t>(all.int64_at(2));
    f.mtime_ns = all.int64_at(3);
    f.sha256 = all.text_at(4);
    f.read = !all.is_null(5);
    f.failed = f.read && all.text_at(5) == "failed";
    f.error = all.text_at(6);
    f.read_error = all.is_null(4) ? all.text_at(7) : std::string();
  }
  return out;
}

struct StoredReading {
  bool failed = false;
  std::string error;
};

// Every content read under these settings (also of files no longer in the archive: a file
// moved or copied is then hashed, not parsed), and the sizes those contents had.
std::unordered_map<std::string, StoredReading> stored_readings(Database& db, std::int64_t settings_id,
                                                               std::unordered_set<std::uint64_t>& sizes) {
  std::unordered_map<std::string, StoredReading> out;
  Statement all = db.prepare("SELECT sha256, bytes, status, error FROM readings WHERE settings_id = ?1");
  all.bind(1, settings_id);
  while (all.step()) {
    out[all.text_at(0)] = StoredReading{all.text_at(2) == "failed", all.text_at(3)};
    sizes.insert(static_cast<std::uint64_t>(all.int64_at(1)));
  }
  return out;
}

// What a batch over `inputs` finds: the files named, and what lies below the folders named
// (each folder as a prefix ending in '/'), as spelled and as resolved (absolute and
// normal), so that a file stored under another spelling of its folder (`archive/` then
// `./archive`) is still known to be in scope when it is gone. Worked out once, not for
// every stored file.
struct InputScope {
  std::unordered_set<std::string> files;
  std::vector<std::string> folder_prefixes;
  std::vector<std::string> resolved_folder_prefixes;

  explicit InputScope(const std::vector<std::string>& inputs) {
    const auto as_prefix = [](const std::string& folder) {
      return folder.empty() || folder.back() == '/' ? folder : folder + "/";
    };
    for (const auto& input : inputs) {
      files.insert(input);
      files.insert(resolved_path(input));
      std::error_code ec;
      if (std::filesystem::is_directory(input, ec)) {
        folder_prefixes.push_back(as_prefix(input));
        resolved_folder_prefixes.push_back(as_prefix(resolved_path(input)));
      }
    }
  }
  // Called for stored files not found in this run alone: resolving costs a few microseconds.
  bool covers(const std::string& path) const {
    if (files.count(path)) return true;
    for (const auto& prefix : folder_prefixes)
      if (path.rfind(prefix, 0) == 0) return true;
    const std::string resolved = resolved_path(path);
    if (files.count(resolved)) return true;
    for (const auto& prefix : resolved_folder_prefixes)
      if (resolved.rfind(prefix, 0) == 0) return true;
    return false;
  }
};

// A stored file that leaves the files table in this run.
struct VanishedFile {
  std::string path;
  bool respelled = false;  // found in this run under another spelling of its path
  std::string sha256;      // its content as stored (empty if it was never read)
};

// Files stored before this run that are no longer under the inputs (within the folder
// filter and the shard) leave the files table; so does a file found in this run under
// another spelling of its path, which would otherwise be in the archive twice. Worked out
// before anything is written, so that a run can tell whether it has anything to write.
std::vector<VanishedFile> vanished_files(const Request& request, const BatchOptions& options,
                                         const std::vector<ArchiveFile>& files,
                                         const std::unordered_set<std::string>& found,
                                         const std::unordered_map<std::string, StoredFile>& stored,
                                         const std::vector<UnlistedFolder>& unlisted) {
  const auto under_unlisted = [&unlisted](const std::string& path) {
    return std::any_of(unlisted.begin(), unlisted.end(),
                       [&path](const UnlistedFolder& folder) { return starts_with_folder(path, folder.path); });
  };
  const InputScope scope(request.inputs);
  const FolderFilter in_folder(options.filter);
  std::unordered_set<std::string> found_resolved;  // made at the first stored path not found
  const auto respelled = [&](const std::string& path) {
    if (found_resolved.empty())
      for (const auto& f : files) found_resolved.insert(resolved_path(f.path));
    return found_resolved.count(resolved_path(path)) != 0;
  };
  std::vector<VanishedFile> out;
  for (const auto& [path, f] : stored) {
    if (found.count(path)) continue;
    if (respelled(path))
      out.push_back({path, true, f.sha256});
    else if (scope.covers(path) && !under_unlisted(path) && in_folder.holds(path, f.relative_path) &&
             in_shard(f.relative_path, options.shard))
      out.push_back({path, false, f.sha256});
  }
  return out;
}

// Files new to the store that look like stored ones under another path (same name below
// their input, same size and time to the nanosecond, the stored path not found by this run).
// The store keys files by the path as given, so "arch" from one working folder and
// "/data/arch" from another make two rows of each file; the command line says so.
// (A stored path that this run found under another spelling, "./examples" for "examples",
// is no such case: its row goes, see vanished_files.)
void note_files_maybe_stored_twice(const std::vector<ArchiveFile>& files, const std::unordered_set<std::string>& found,
                                   const std::unordered_map<std::string, StoredFile>& previous,
                                   const std::vector<VanishedFile>& vanished, BatchSummary& summary) {
  std::unordered_set<std::string> respelled;
  for (const VanishedFile& v : vanished)
    if (v.respelled) respelled.insert(v.path);
  std::unordered_map<std::string, const std::string*> unfound_by_name;  // relative path -> stored path
  for (const auto& [path, stored] : previous)
    if (!found.count(path) && !respelled.count(path)) unfound_by_name.emplace(stored.relative_path, &path);
  if (unfound_by_name.empty()) return;
  for (const ArchiveFile& f : files) {
    if (previous.count(f.path)) continue;
    auto match = unfound_by_name.find(f.relative_path);
    if (match == unfound_by_name.end()) continue;
    const StoredFile& stored = previous.at(*match->second);
    if (stored.size != f.size || stored.mtime_ns != f.mtime_ns) continue;
    if (summary.files_maybe_twice++ == 0) {
      summary.maybe_twice_new = f.path;
      summary.maybe_twice_stored = *match->second;
    }
  }
}

// The paths of the files that leave the store in this run (not those found under another
// spelling), in path order: named by --verbose, and kept with the run (up to a bound).
std::vector<std::string> removed_paths(const std::vector<VanishedFile>& vanished) {
  std::vector<std::string> out;
  for (const VanishedFile& f : vanished)
    if (!f.respelled) out.push_back(f.path);
  std::sort(out.begin(), out.end());
  return out;
}

void remove_vanished(Database& db, const std::vector<VanishedFile>& vanished, BatchSummary& summary) {
  std::set<std::string> paths;
  for (const VanishedFile& f : vanished) {
    paths.insert(f.path);
    if (f.respelled) ++summary.files_respelled;
  }
  remove_files(db, paths);
  summary.removed = removed_paths(vanished);
  // A file whose content another path of the store holds now was most often moved or
  // renamed: said, so that a folder renamed does not read as files lost.
  Statement held = db.prepare("SELECT 1 FROM files WHERE sha256 = ?1 LIMIT 1");
  for (const VanishedFile& f : vanished) {
    if (f.respelled || f.sha256.empty()) continue;
    held.bind(1, f.sha256);
    if (held.step()) ++summary.removed_content_kept;
    held.reset();
  }
}

// Kept with the run once the files are removed (a run stopped before keeps them): their
// rows go, so the run is where a curator finds what left. The first 1,000 in path order.
void record_removed(Database& db, std::int64_t run_id, const std::vector<std::string>& removed) {
  if (removed.empty()) return;
  constexpr std::size_t kRemovedKept = 1000;
  const std::size_t kept = std::min(removed.size(), kRemovedKept);
  const nlohmann::json paths(std::vector<std::string>(removed.begin(), removed.begin() + static_cast<std::ptrdiff_t>(kept)));
  db.prepare("UPDATE runs SET parameters = json_set(parameters, '$.removed', json(?1), '$.removed_more', ?2) "
             "WHERE run_id = ?3")
      .bind(1, paths.dump())
      .bind(2, static_cast<std::int64_t>(removed.size() - kept))
      .bind(3, run_id)
      .step_to_end();
}

nlohmann::json run_parameters(const Request& request, const BatchOptions& options, const ReadingSettings& settings) {
  return {{"inputs", request.inputs},      {"settings_key", settings.key},  {"unit", settings.unit},
          {"selection", settings.selection}, {"tokenizer", settings.tokenizer}, {"features", settings.features},
          {"folder", options.filter.folder}, {"shard", options.shard.describe()},
          {"verify_hashes", options.verify_hashes},
          // what relative paths in the files table are relative to (--folder in analyse-store)
          {"working_folder", std::filesystem::current_path().string()}};
}

}  // namespace

BatchSummary run_batch(Database& db, const Request& request, const BatchOptions& options,
                       const BatchListener& listener) {
  const ReadingSettings settings = reading_settings(request);
  // A fixity check of the archive checks the store that holds its hashes too.
  if (options.verify_hashes) check_store_is_whole(db);
  BatchSummary summary;
  std::vector<std::string> empty_inputs;  // no TEI file under them at all
  std::vector<ArchiveFile> listed = list_archive_files(request.inputs, options.filter, options.shard, summary.unlisted,
                                                       summary.left_aside, empty_inputs);
  std::vector<ArchiveFile> files;
  {
    // One file under two inputs, or under two spellings of one (arch and ./arch), is read
    // once, under the path found first: twice, it was each copy's nearest at distance 0.
    std::unordered_map<std::string, std::string> first_path;  // resolved -> as found first
    for (auto& f : listed) {
      auto [at, first] = first_path.emplace(resolved_path(f.path), f.path);
      if (first) {
        files.push_back(std::move(f));
      } else if (at->second != f.path && summary.files_found_twice++ == 0) {
        summary.found_twice_kept = at->second;
        summary.found_twice_passed = f.path;
      }
    }
  }

  // Plan, before anything is written: which files need opening. A file whose size and
  // time are as stored, and whose content was read under these settings, is not opened at
  // all. (The store's lock is held from its first read on, so nothing changes meanwhile.)
  RunCounters& counters = summary.counters;
  counters.files_found = files.size();
  const std::int64_t known_settings = find_settings(db, settings);  // 0: none stored yet
  const auto previous = stored_files(db, known_settings);
  std::vector<std::size_t> to_open;
  std::map<std::string, std::string> failing;  // path -> message, reported in path order
  BatchProgress progress;
  progress.files_total = files.size();
  for (std::size_t i = 0; i < files.size(); ++i) {
    const ArchiveFile& f = files[i];
    auto p = previous.find(f.path);
    if (!options.verify_hashes && p != previous.end() && p->second.size == f.size &&
        p->second.mtime_ns == f.mtime_ns && p->second.read) {
      ++counters.files_unchanged;
      if (p->second.failed) failing[f.path] = failure_for(p->second.error, f.path);
      continue;
    }
    if (!options.verify_hashes && known_settings && p != previous.end() && !p->second.read_error.empty() &&
        p->second.size == f.size && p->second.mtime_ns == f.mtime_ns && still_unreadable(f.path)) {
      ++counters.files_unchanged;
      failing[f.path] = p->second.read_error;
      continue;
    }
    to_open.push_back(i);
    progress.bytes_total += f.size;
  }
  std::unordered_set<std::string> found;  // the paths this run lists
  for (const ArchiveFile& f : files) found.insert(f.path);
  const std::vector<VanishedFile> vanished = vanished_files(request, options, files, found, previous, summary.unlisted);
  note_files_maybe_stored_twice(files, found, previous, vanished, summary);
  // A --folder with no file on disk and none in the store is most often a slip of the
  // keyboard, which a job script would otherwise take for success. (A folder removed from
  // the archive still has stored files, and the run removes them; a share of a small
  // archive may be empty.)
  if (!options.filter.folder.empty() && files.empty() && vanished.empty() && summary.unlisted.empty() &&
      options.shard.count <= 1) {
    throw Error(ErrorKind::nothing_selected,
                "--folder " + options.filter.folder + ": no TEI file under the inputs lies in that folder, and the " +
                    "store holds none from it; nothing read or recorded (is the folder spelled as below the input " +
                    "folder, e.g. 1850/letters?)");
  }
  // Inputs that hold no TEI file at all where the store holds files from them: most often
  // an archive not mounted (an empty mount point), which would otherwise empty the store,
  // and a job array's merge after it. (A --folder removed from the archive, above, is
  // taken at its word; a share whose last file was deleted, under an input that holds
  // others, is not an archive missing.)
  if (options.filter.folder.empty() && summary.unlisted.empty() && !vanished.empty()) {
    for (const std::string& input : empty_inputs) {
      // In any spelling: files stored from "arch" are under "./arch" or "/data/arch" too.
      const InputScope scope({input});
      std::vector<const VanishedFile*> gone;
      for (const VanishedFile& v : vanished)
        if (!v.respelled && scope.covers(v.path)) gone.push_back(&v);
      if (gone.empty()) continue;
      throw Error(ErrorKind::nothing_selected,
                  "no TEI file (*.xml, *.tei) found under " + input + ", where the store holds " +
                      std::to_string(gone.size()) + " file(s) from it, such as " + gone.front()->path +
                      ": is the archive mounted? Nothing read or removed; to drop them from the store, batch "
                      "with --folder naming that folder, or delete the store");
    }
  }
  // A share's task whose inputs hold no TEI file at all, in any share: on a cluster most
  // often the archive not mounted on that task's machine. Its empty share would pass for
  // the share of a small archive, and a `merge --exact` of the shares would then drop the
  // archive's files from the merged store. (A share left empty by the rule, its inputs
  // holding files of other shares, is taken as it is.)
  if (options.shard.count > 1 && summary.unlisted.empty() && empty_inputs.size() == request.inputs.size()) {
    std::string inputs;
    for (const std::string& input : request.inputs) inputs += (inputs.empty() ? "" : ", ") + input;
    throw Error(ErrorKind::nothing_selected,
                "share " + options.shard.describe() + ": no TEI file (*.xml, *.tei) found under " + inputs +
                    " at all, in any share" +
                    (summary.left_aside.count ? " (" + std::to_string(summary.left_aside.count) +
                                                    " file(s) of other names, such as " + summary.left_aside.first + ")"
                                              : std::string()) +
                    ": is the archive mounted on this machine? Nothing read");
  }
  progress.files_done = counters.files_unchanged;
  const auto report_failing = [&] {
    for (auto& [path, message] : failing) summary.failures.push_back(BatchFailure{path, message});
  };

  // Nothing to do: every file as stored, none gone, every folder listed, no run left
  // unfinished. Nothing is written, so the store keeps its bytes and its time (a backup or
  // a version control system sees no change), and no run is recorded.
  // (A run left unfinished before, noted by unfinished_work, is settled only by a run
  // recorded as complete: then this one is recorded, though it reads nothing.)
  if (known_settings && !files.empty() && to_open.empty() && vanished.empty() && summary.unlisted.empty() &&
      !any_run_unfinished(db) && unfinished_work(db, known_settings).empty()) {
    summary.settings_id = known_settings;
    counters.files_failed = failing.size();
    if (listener) listener(progress, "", FileOutcome::unchanged);
    report_failing();
    return summary;
  }

  {
    Transaction t(db);
    mark_interrupted_runs(db);
    summary.settings_id = ensure_settings(db, settings);
    nlohmann::json parameters = run_parameters(request, options, settings);
    for (const auto& folder : summary.unlisted)  // kept with the run, for whoever reads the table later
      parameters["unlisted_folders"].push_back({{"path", folder.path}, {"reason", folder.reason}});
    if (summary.left_aside.count || summary.left_aside.hidden)
      parameters["left_aside"] = {{"files", summary.left_aside.count}, {"first", summary.left_aside.first},
                                  {"hidden", summary.left_aside.hidden}, {"first_hidden", summary.left_aside.first_hidden}};
    summary.run_id = begin_run(db, "batch", summary.settings_id, parameters);
    t.commit();
  }

  // Largest files first: the readers then end together instead of one of them finishing
  // a long novel alone while the other core idles (longest-processing-time-first order).
  std::stable_sort(to_open.begin(), to_open.end(),
                   [&files](std::size_t a, std::size_t b) { return files[a].size > files[b].size; });
  if (listener && counters.files_unchanged) listener(progress, "", FileOutcome::unchanged);

  // Of the files to open, only one whose size some stored content has, or another file to
  // open has, can turn out to be known: those are hashed before parsing. (Nothing to open,
  // nothing to look up: a re-run over an unchanged archive skips this.)
  std::unordered_set<std::uint64_t> known_sizes;
  std::unordered_map<std::string, StoredReading> readings;
  if (!to_open.empty()) readings = stored_readings(db, summary.settings_id, known_sizes);
  std::unordered_map<std::uint64_t, std::size_t> files_of_size;
  for (std::size_t i : to_open) ++files_of_size[files[i].size];
  std::vector<char> hash_first;
  for (std::size_t i : to_open)
    hash_first.push_back(known_sizes.count(files[i].size) || files_of_size[files[i].size] > 1 ? 1 : 0);

  std::vector<std::string> paths;
  for (std::size_t i : to_open) paths.push_back(files[i].path);
  StreamOptions stream;
  stream.hash_first = hash_first;
  // A content new to the store is parsed under the first of its paths to be hashed, which
  // claims it; copies of it in this run are then known, stored as its other paths. (Asked on
  // the reading threads: `readings` is only read meanwhile, the claims are locked.)
  std::mutex claims_mutex;
  std::unordered_set<std::string> claimed;
  stream.known = [&](std::size_t, const std::string& sha) {
    if (readings.count(sha)) return true;
    const std::lock_guard<std::mutex> lock(claims_mutex);
    return !claimed.insert(sha).second;
  };
  // A copy may be stored before the file parsed for its content has failed: its failure is
  // told once the reading is over.
  std::vector<std::pair<std::string, std::string>> copies_of_new;  // path, sha256
  std::unordered_map<std::string, std::string> failed_in_run;      // sha256 -> failure as stored
  const auto add_failing_copies = [&] {
    for (const auto& [path, sha] : copies_of_new)
      if (auto failed = failed_in_run.find(sha); failed != failed_in_run.end())
        failing[path] = failure_for(failed->second, path);
  };

  ReadingWriter writer(db, summary.settings_id);
  writer.expect_bytes(progress.bytes_total);
  if (options.keep_counts_of_segments_from) writer.keep_counts(*options.keep_counts_of_segments_from);
  const std::int64_t racy_after_ns =
      std::chrono::duration_cast<std::chrono::nanoseconds>(std::chrono::system_clock::now().time_since_epoch()).count() -
      kRacyWindowNs;
  auto transaction = std::make_unique<Transaction>(db);
  std::size_t in_transaction = 0;
  auto last_commit = std::chrono::steady_clock::now();
  auto commit = [&] {
    update_run(db, summary.run_id, counters);
    transaction->commit();
    transaction = std::make_unique<Transaction>(db);
    in_transaction = 0;
    last_commit = std::chrono::steady_clock::now();
  };

  try {
    read_files_streaming(request, paths, stream, [&](std::size_t k, FileReading&& reading) {
      ArchiveFile f = files[to_open[k]];
      // Racily clean: a file changed within a timestamp tick of being read could change
      // again without its time changing; record no time, so the next run hashes it.
      if (f.mtime_ns > racy_after_ns) f.mtime_ns = 0;
      FileOutcome outcome;
      if (!reading.parsed) {
        writer.write_file(f, reading.sha256, "");
        ++counters.files_hashed;
        auto r = readings.find(reading.sha256);
        if (r == readings.end()) {
          copies_of_new.emplace_back(f.path, reading.sha256);
          outcome = FileOutcome::copy;
        } else {
          if (r->second.failed) failing[f.path] = failure_for(r->second.error, f.path);
          outcome = FileOutcome::hashed;
        }
      } else {
        ++counters.files_read;
        if (reading.sha256.empty()) {
          writer.write_file(f, "", reading.failure.message);  // not even readable
        } else {
          writer.write_file(f, reading.sha256, "");
          writer.write_reading(reading, summary.run_id);
        }
        outcome = reading.failed ? FileOutcome::failed : FileOutcome::read;
        if (reading.failed) {
          failing[f.path] = reading.failure.message;
          if (!reading.sha256.empty()) failed_in_run[reading.sha256] = failure_to_store(reading.failure.message, f.path);
        } else {
          ++summary.files_read_cleanly;
          if (reading.segments.empty()) ++summary.files_without_segments;
        }
      }
      counters.bytes_read += reading.bytes;
      progress.bytes_done += f.size;
      ++progress.files_done;
      if (++in_transaction >= options.commit_files ||
          std::chrono::steady_clock::now() - last_commit > std::chrono::duration<double>(options.commit_seconds))
        commit();
      if (listener) listener(progress, f.path, outcome);
    });

    remove_vanished(db, vanished, summary);
    record_removed(db, summary.run_id, summary.removed);
    refresh_file_stems(db);
    add_failing_copies();
    counters.files_failed = failing.size();
    update_run(db, summary.run_id, counters);
    finish_run(db, summary.run_id, "done");
    transaction->commit();
  } catch (const BatchInterrupted&) {
    refresh_file_stems(db);
    add_failing_copies();
    counters.files_failed = failing.size();
    update_run(db, summary.run_id, counters);
    finish_run(db, summary.run_id, "interrupted");
    transaction->commit();
    throw;
  } catch (...) {
    transaction.reset();  // rolls back the open batch; what was committed stays
    try {
      Transaction t(db);
      refresh_file_stems(db);  // for the files committed before the failure
      finish_run(db, summary.run_id, "failed");
      t.commit();
    } catch (...) {
    }
    throw;
  }
  report_failing();
  if (summary.files_without_segments && summary.files_without_segments == summary.files_read_cleanly) {
    Statement any = db.prepare("SELECT EXISTS (SELECT 1 FROM segments WHERE settings_id = ?1)");
    any.bind(1, summary.settings_id);
    summary.store_holds_segments = any.step() && any.int64_at(0) != 0;
  }
  summary.fresh = writer.take_fresh_counts();
  return summary;
}

}  // namespace manicule::store
