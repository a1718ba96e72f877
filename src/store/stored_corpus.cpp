#include "store/stored_corpus.h"

#include <algorithm>
#include <unordered_map>
#include <unordered_set>

#include <nlohmann/json.hpp>

#include "core/error.h"
#include "store/count_blob.h"
#include "store/store_vocabulary.h"

namespace manicule::store {

namespace {

Authorship parse_authorship(const std::string& s) {
  return s == "known" ? Authorship::known : s == "conjectured" ? Authorship::conjectured : Authorship::unknown;
}

}  // namespace

StoredSelection select_stored_files(Database& db, std::int64_t settings_id, const ArchiveFilter& filter) {
  StoredSelection out;
  Statement files = db.prepare(
      "SELECT f.path, f.relative_path, f.sha256, r.status, r.title, r.author, r.date, r.year, r.language "
      "FROM files f LEFT JOIN readings r ON r.sha256 = f.sha256 AND r.settings_id = ?1 ORDER BY f.path");
  files.bind(1, settings_id);
  while (files.step()) {
    ++out.files_in_store;
    std::string path = files.text_at(0);
    if (files.is_null(3)) {
      ++out.files_not_read;
      continue;
    }
    if (files.text_at(3) == "failed") {
      ++out.files_failed;
      continue;
    }
    FileMetadata m{files.text_at(4), files.text_at(5), files.text_at(6), static_cast<int>(files.int64_at(7)),
                   files.text_at(8)};
    // Language is tested per segment (a segment may be in another language than its file).
    if (!in_folder(filter, path, files.text_at(1)) || !header_matches(filter, m, false)) {
      ++out.files_filtered_out;
      continue;
    }
    out.paths.push_back(path);
    out.sha256.push_back(files.text_at(2));
  }
  return out;
}

StoredCorpus load_stored_corpus(Database& db, std::int64_t settings_id, const FeatureSpec& spec,
                                const ArchiveFilter& filter, const StoredSelection& selection,
                                std::size_t min_tokens, FreshCounts* fresh) {
  StoredCorpus out;
  std::unordered_set<std::string> included(selection.paths.begin(), selection.paths.end());
  Statement segments = db.prepare(
      "SELECT f.path, f.stem, f.sha256, s.ordinal, s.local_id, s.unit, s.label, s.language, s.author, s.authorship, "
      "s.pointers, s.warnings, s.tokens, s.types, s.feature_total, s.counts, r.language "
      // CROSS JOIN keeps this join order (SQLite's rule for CROSS JOIN): files in path
      // order, each file's segments by their key, so that no temporary B-tree has to sort
      // every row with its counts (0.09 to 0.03 s over the stored plays in the sqlite3 shell).
      "FROM files f CROSS JOIN readings r ON r.sha256 = f.sha256 AND r.settings_id = ?1 AND r.status = 'ok' "
      "CROSS JOIN segments s ON s.settings_id = ?1 AND s.sha256 = f.sha256 ORDER BY f.path, s.ordinal");
  segments.bind(1, settings_id);
  CountProfile& profile = out.corpus.counts;
  profile.spec = spec;
  std::unordered_map<std::string, std::string> id_owner;  // segment id -> path
  std::size_t id_bound = 0;  // one past the largest store feature id counted
  std::string last_path;
  while (segments.step()) {
    std::string path = segments.text_at(0);
    if (!included.count(path)) continue;
    const std::string segment_language = segments.text_at(7);
    if (!filter.language.empty() && !language_matches(filter, segment_language) &&
        !language_matches(filter, segments.text_at(16)))
      continue;
    if (static_cast<std::size_t>(segments.int64_at(12)) < min_tokens) {
      ++out.segments_too_short;
      continue;
    }
    const std::string file_sha256 = segments.text_at(2);
    if (path != last_path) {
      out.corpus.files.push_back(path);
      out.corpus.file_sha256.push_back(file_sha256);
      last_path = path;
    }
    SegmentRecord record;
    Segment& seg = record.segment;
    seg.local_id = segments.text_at(4);
    seg.id = segments.text_at(1) + "#" + seg.local_id;
    seg.file = path;
    seg.unit = segments.text_at(5);
    seg.label = segments.text_at(6);
    seg.language = segment_language;
    seg.author = segments.text_at(8);
    seg.authorship = parse_authorship(segments.text_at(9));
    seg.pointers = nlohmann::json::parse(segments.text_at(10)).get<std::vector<std::string>>();
    seg.warnings = nlohmann::json::parse(segments.text_at(11)).get<std::vector<std::string>>();
    record.tokens = static_cast<std::size_t>(segments.int64_at(12));
    record.types = static_cast<std::size_t>(segments.int64_at(13));
    auto [owner, new_id] = id_owner.emplace(seg.id, path);
    if (!new_id)
      throw Error(ErrorKind::usage, "segment id " + seg.id + " occurs in two files (" + owner->second + ", " + path +
                                        "): files of the same name in different folders; narrow the analysis with --folder");
    SegmentCounts counts;
    counts.id = seg.id;
    counts.tokens = record.tokens;
    counts.feature_total = static_cast<std::size_t>(segments.int64_at(14));
    const std::size_t ordinal = static_cast<std::size_t>(segments.int64_at(3));
    FeatureCounts* kept = fresh ? fresh->find(file_sha256, ordinal) : nullptr;
    counts.counts = kept ? std::move(*kept) : decode_counts(segments.blob_at(15));
    // Counts are sorted by id: the last is the largest.
    if (!counts.counts.empty()) id_bound = std::max<std::size_t>(id_bound, counts.counts.back().first + std::size_t{1});
    profile.segments.push_back(std::move(counts));
    out.sources.push_back(SegmentSource{path, file_sha256, ordinal});
    out.corpus.segments.push_back(std::move(record));
  }

  if (fresh && id_bound <= fresh->forms.size()) {
    // The store's vocabulary itself, just handed over: the counts are in its ids already.
    // (Forms no segment here uses have no occurrences and are never selected.)
    profile.vocabulary = std::move(fresh->forms);
    *fresh = FreshCounts();  // used up
    return out;
  }
  if (fresh) *fresh = FreshCounts();

  // A compact vocabulary of the features these segments use, in store-id order, so the
  // remapping keeps every segment's counts sorted.
  std::vector<char> used(id_bound, 0);  // by store feature id
  for (const auto& s : profile.segments)
    for (const auto& entry : s.counts) used[entry.first] = 1;
  constexpr FeatureId kMissing = UINT32_MAX;
  std::vector<FeatureId> compact(used.size(), kMissing);
  {
    std::size_t used_count = 0;
    for (char u : used) used_count += u != 0;
    profile.vocabulary.reserve(used_count);
    for_each_stored_form(db, settings_id, [&](FeatureId id, std::string_view form) {
      if (id < used.size() && used[id]) compact[id] = profile.vocabulary.intern(form);
    });
  }
  for (auto& s : profile.segments)
    for (auto& entry : s.counts) {
      entry.first = compact[entry.first];
      if (entry.first == kMissing)
        throw Error(ErrorKind::bad_input, "the store " + db.path() + " has a damaged vocabulary (a counted feature has no form)");
    }
  return out;
}

}  // namespace manicule::store
