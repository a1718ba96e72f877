#include "store/stored_corpus.h"

#include <algorithm>
#include <optional>
#include <unordered_map>
#include <unordered_set>

#include <nlohmann/json.hpp>

#include "core/corpus.h"
#include "core/error.h"
#include "core/segment_id_prefixes.h"
#include "store/count_blob.h"
#include "store/store_schema.h"
#include "store/store_vocabulary.h"
#include "text/language_tags.h"

namespace manicule::store {

namespace {

Authorship parse_authorship(const std::string& s) {
  return s == "known" ? Authorship::known : s == "conjectured" ? Authorship::conjectured : Authorship::unknown;
}

// Rows that name one file under two spellings of its path (arch/x.xml and ./arch/x.xml,
// stored by runs from different working directories before batch replaced such rows): the
// file is taken once, under its first spelling in path order, lest an analysis find each
// of its segments nearest to itself.
void drop_respelled(StoredSelection& s) {
  std::unordered_set<std::string> seen;
  std::size_t kept = 0;
  for (std::size_t i = 0; i < s.paths.size(); ++i) {
    if (!seen.insert(resolved_path(s.paths[i])).second) continue;
    if (kept != i) {  // (a string moved onto itself may be left empty)
      s.paths[kept] = std::move(s.paths[i]);
      s.sha256[kept] = std::move(s.sha256[i]);
      s.languages[kept] = std::move(s.languages[i]);
      s.years[kept] = s.years[i];
      s.texts_apart[kept] = s.texts_apart[i];
    }
    ++kept;
  }
  s.paths.resize(kept);
  s.sha256.resize(kept);
  s.languages.resize(kept);
  s.years.resize(kept);
  s.texts_apart.resize(kept);
}

// A text's heading as stored from column `first` on: text_title, text_author,
// collection_titles (a JSON array), text_number.
TextHeading stored_heading(Statement& row, int first) {
  TextHeading heading{row.text_at(first), row.text_at(first + 1), {}, static_cast<int>(row.int64_at(first + 3))};
  if (!row.is_null(first + 2))
    heading.collection_titles = nlohmann::json::parse(row.text_at(first + 2)).get<std::vector<std::string>>();
  return heading;
}

}  // namespace

StoredSelection select_stored_files(Database& db, std::int64_t settings_id, const ArchiveFilter& asked) {
  // Relative stored paths are relative to where batch ran: the latest batch run's folder
  // (a merged store, whose files come from other machines, has none: the working folder).
  ArchiveFilter filter = asked;
  if (!filter.folder.empty() && filter.stored_paths_base.empty()) {
    Statement base = db.prepare(
        "SELECT json_extract(parameters, '$.working_folder') FROM runs WHERE kind = 'batch' AND "
        "json_extract(parameters, '$.working_folder') IS NOT NULL ORDER BY run_id DESC LIMIT 1");
    if (base.step()) filter.stored_paths_base = base.text_at(0);
  }
  const FolderFilter in_folder(filter);
  StoredSelection out;
  Statement files = db.prepare(
      "SELECT f.path, f.relative_path, f.sha256, r.status, r.title, r.author, r.date, r.year, r.language, "
      "r.first_segment_year, r.last_segment_year, r.segments, r.texts_apart "
      "FROM files f LEFT JOIN readings r ON r.sha256 = f.sha256 AND r.settings_id = ?1 ORDER BY f.path");
  files.bind(1, settings_id);
  // The headings of a file's texts, where it holds several (a teiCorpus).
  Statement text_headings = db.prepare(
      "SELECT DISTINCT text_title, text_author, collection_titles, text_number FROM segments WHERE settings_id = ?1 AND "
      "sha256 = ?2 AND text_title IS NOT NULL");
  const auto some_text_matches = [&](const std::string& sha256) {
    bool found = false;
    text_headings.bind(1, settings_id).bind(2, sha256);
    while (!found && text_headings.step())
      found = text_matches(filter, stored_heading(text_headings, 0));
    text_headings.reset();
    return found;
  };
  std::vector<std::string> every_path;  // of the whole store, for the segment id prefixes
  while (files.step()) {
    ++out.files_in_store;
    std::string path = files.text_at(0);
    every_path.push_back(path);
    // The folder first: a file outside it is no concern of this analysis, read or not,
    // failed or not (its counts would otherwise be reported as missing from a sub-corpus
    // it was never part of).
    if (!in_folder.holds(path, files.text_at(1))) {
      ++out.files_filtered_out;
      continue;
    }
    // A file that failed has no header, so no author, title, year or language to pass; nor
    // has one unreadable when last listed (a link to nothing, no permission: no content),
    // which batch with these settings would not read either.
    const bool unreadable = files.is_null(2);
    if (!unreadable && files.is_null(3)) {  // not read with these settings: its header may yet pass
      ++out.files_not_read;
      continue;
    }
    if (unreadable || files.text_at(3) == "failed") {
      ++(filter.selects_by_header() ? out.files_filtered_out : out.files_failed);
      continue;
    }
    FileMetadata m{files.text_at(4), files.text_at(5), files.text_at(6), static_cast<int>(files.int64_at(7)),
                   files.text_at(8)};
    // Language and years are tested per segment (a letter may be in another language than
    // its file, or dated apart from it); here a file is passed by when none of its
    // segments can be in the years asked: neither the file's year nor any of its own.
    // A file of several texts, each with its own header, is passed by when none of its
    // texts' headings passes; its segments are then tested one by one.
    const bool texts_apart = files.int64_at(12) != 0;
    bool chosen = texts_apart && filter.selects_by_heading() ? some_text_matches(files.text_at(2))
                                                             : header_matches(filter, m);
    if (chosen && !filter.year_matches(m.year)) {
      const int first_own = static_cast<int>(files.int64_at(9)), last_own = static_cast<int>(files.int64_at(10));
      if (!filter.years_overlap(first_own, last_own)) {
        chosen = false;
        if (m.year == 0 && first_own == 0) ++out.files_undated;
      }
    }
    if (!chosen) {
      ++out.files_filtered_out;
      continue;
    }
    if (files.int64_at(11) == 0) ++out.files_without_segments;
    out.paths.push_back(path);
    out.sha256.push_back(files.text_at(2));
    out.languages.push_back(std::move(m.language));
    out.years.push_back(m.year);
    out.texts_apart.push_back(texts_apart);
  }
  drop_respelled(out);
  // An archive often holds files of one name in several folders (1850/letters.xml,
  // 1851/letters.xml): theirs get longer prefixes than the bare name. Worked out over every
  // file of the store, as files.stem is (file_stems.h), so that a segment has one id in all
  // analyses of the store, whatever the sub-corpus, and in the segment_list view.
  const std::vector<std::string> prefixes = segment_id_prefixes(every_path);
  std::unordered_map<std::string, std::string> prefix_of;
  for (std::size_t i = 0; i < every_path.size(); ++i) prefix_of.emplace(every_path[i], prefixes[i]);
  out.stems.clear();
  for (const auto& path : out.paths) out.stems.push_back(prefix_of.at(path));
  return out;
}

StoredCorpus load_stored_corpus(Database& db, std::int64_t settings_id, const FeatureSpec& spec,
                                const ArchiveFilter& filter, const StoredSelection& selection,
                                std::size_t min_tokens, FreshCounts* fresh, const AnalysisProgress& progress) {
  StoredCorpus out;
  // Each selected file's segments in ordinal order, from what the batch just stored when
  // it is at hand, else from the store (the index on the segments' key gives that order).
  Statement stored_segments = db.prepare(kSegmentsOfContent);
  CountProfile& profile = out.corpus.counts;
  profile.spec = spec;
  // The counts, read from the store or handed over by the batch, are cut from one arena,
  // so that the analysis can give them back whole once its feature table is built.
  profile.count_memory = fresh ? fresh->count_memory : std::make_shared<CountArena>();
  std::unordered_map<std::string, std::string> id_owner;  // segment id -> path
  std::size_t id_bound = 0;  // one past the largest store feature id counted
  // Files sharing a content share its fresh segments: each but the last takes a copy.
  std::unordered_map<std::string, std::size_t> uses_left;
  const LanguageRange language(filter.language);
  if (fresh)
    for (const auto& sha256 : selection.sha256) ++uses_left[sha256];

  const std::size_t files = selection.paths.size();
  report_step(progress, "stored counts", 0.0);
  for (std::size_t f = 0; f < files; ++f) {
    if (f > 0) report_step(progress, "stored counts", static_cast<double>(f) / static_cast<double>(files));
    const std::string& path = selection.paths[f];
    const std::string& file_sha256 = selection.sha256[f];
    bool file_listed = false;
    // A segment's year as --years takes it: its own where the edition dates it (a letter),
    // else its file's.
    const auto year_of = [&](int own_year) { return own_year ? own_year : selection.years[f]; };
    // A segment's language as --language and the count by language take it: its own where
    // its text says it readably (xml:lang), else its file's.
    const auto language_of = [&](const std::string& own_language) -> const std::string& {
      return language.readable(own_language) ? own_language : selection.languages[f];
    };
    const bool by_own_text = selection.texts_apart[f] && filter.selects_by_heading();
    const auto passes = [&](const TextHeading* own_text, const std::string& segment_language, int segment_year,
                            std::size_t tokens) {
      if (by_own_text && !(own_text && text_matches(filter, *own_text))) {
        ++out.segments_other_texts;
        return false;
      }
      if (!filter.language.empty() && !language.holds(language_of(segment_language))) {
        ++out.segments_other_language;
        return false;
      }
      const int year = year_of(segment_year);
      if (!filter.year_matches(year)) {
        ++(year ? out.segments_other_years : out.segments_undated);
        return false;
      }
      if (tokens < min_tokens) {
        ++out.segments_too_short;
        return false;
      }
      return true;
    };
    const auto add = [&](SegmentRecord&& record, std::size_t ordinal, std::size_t feature_total,
                         FeatureCounts&& counts) {
      if (!file_listed) {
        out.corpus.files.push_back(path);
        out.corpus.file_sha256.push_back(file_sha256);
        file_listed = true;
      }
      Segment& seg = record.segment;
      seg.id = selection.stems[f] + "#" + seg.local_id;
      seg.file = path;
      auto [owner, new_id] = id_owner.emplace(seg.id, path);
      if (!new_id)
        throw Error(ErrorKind::usage, "segment id " + seg.id + " occurs in two files (" + owner->second + ", " + path +
                                          "): files of the same name in different folders; narrow the analysis with --folder");
      // Move-constructed, so that the list stays where it was cut from (assigned, it
      // would be copied to the heap).
      SegmentCounts segment_counts{seg.id, record.tokens, feature_total, std::move(counts)};
      // Counts are sorted by id: the last is the largest.
      if (!segment_counts.counts.empty())
        id_bound = std::max<std::size_t>(id_bound, segment_counts.counts.back().first + std::size_t{1});
      profile.segments.push_back(std::move(segment_counts));
      out.sources.push_back(SegmentSource{path, file_sha256, ordinal, year_of(seg.year),
                                          std::string(primary_subtag(language.canonical(language_of(seg.language))))});
      out.corpus.segments.push_back(std::move(record));
    };

    if (FreshContent* content = fresh ? fresh->find(file_sha256, min_tokens) : nullptr) {
      const bool last_use = --uses_left[file_sha256] == 0;
      std::size_t next_kept = 0;
      for (std::size_t ordinal = 0; ordinal < content->tokens.size(); ++ordinal) {
        const bool kept = next_kept < content->kept.size() && content->kept[next_kept].ordinal == ordinal;
        FreshSegment* segment = kept ? &content->kept[next_kept++] : nullptr;
        // One that passes has at least min_tokens words, so it was kept (find() said so).
        const TextHeading* own_text = ordinal < content->own_texts.size() ? &content->own_texts[ordinal] : nullptr;
        if (!passes(own_text, content->languages[ordinal], content->years[ordinal], content->tokens[ordinal])) continue;
        if (last_use) {
          add(std::move(segment->record), ordinal, segment->feature_total, std::move(segment->counts));
        } else {
          add(SegmentRecord(segment->record), ordinal, segment->feature_total,
              FeatureCounts(segment->counts, profile.count_memory.get()));
        }
      }
      continue;
    }
    stored_segments.bind(1, settings_id).bind(2, file_sha256);
    while (stored_segments.step()) {
      const std::string segment_language = stored_segments.text_at(4);
      const int segment_year = static_cast<int>(stored_segments.int64_at(14));
      std::optional<TextHeading> own_text;
      if (!stored_segments.is_null(15)) own_text = stored_heading(stored_segments, 15);
      if (!passes(own_text ? &*own_text : nullptr, segment_language, segment_year,
                  static_cast<std::size_t>(stored_segments.int64_at(9))))
        continue;
      SegmentRecord record;
      Segment& seg = record.segment;
      seg.local_id = stored_segments.text_at(1);
      seg.unit = stored_segments.text_at(2);
      seg.label = stored_segments.text_at(3);
      seg.language = segment_language;
      seg.date = stored_segments.text_at(13);
      seg.year = segment_year;
      seg.own_text = std::move(own_text);
      seg.author = stored_segments.text_at(5);
      seg.authorship = parse_authorship(stored_segments.text_at(6));
      seg.pointers = nlohmann::json::parse(stored_segments.text_at(7)).get<std::vector<std::string>>();
      seg.warnings = nlohmann::json::parse(stored_segments.text_at(8)).get<std::vector<std::string>>();
      record.tokens = static_cast<std::size_t>(stored_segments.int64_at(9));
      record.types = static_cast<std::size_t>(stored_segments.int64_at(10));
      const auto ordinal = static_cast<std::size_t>(stored_segments.int64_at(0));
      add(std::move(record), ordinal, static_cast<std::size_t>(stored_segments.int64_at(11)),
          decode_stored_counts(stored_segments.blob_at(12), db.path(),
                               "segment " + std::to_string(ordinal) + " of " + path, profile.count_memory.get()));
    }
    stored_segments.reset();
  }

  report_step(progress, "stored counts", 1.0);

  if (fresh && id_bound <= fresh->forms.size()) {
    // The store's vocabulary itself, just handed over: the counts are in its ids already.
    // (Forms no segment here uses have no occurrences and are never selected.)
    profile.vocabulary = std::move(fresh->forms);
    fresh->clear();  // used up
    return out;
  }
  if (fresh) fresh->clear();

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
