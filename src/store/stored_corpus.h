// A Corpus built from the store, for analyses that read no XML: the segments of the files
// the store knows (its files table, the archive as batch runs last saw it) that were read
// under one settings, inside a filter (a teiCorpus's segments tested by their own text's
// header), in path order and then document order, with their
// counts. Segments shorter than `min_tokens` words are left out here already (the feature
// space would leave them out first anyway; they are counted), which keeps memory and time
// in proportion to what is measured. Files stored as failed are left out and counted.
// With `fresh` (what a batch run in this process just stored), the segments, counts and
// vocabulary it holds are used instead of reading them back (the corpus is the same), and
// `fresh` is emptied.
#pragma once
#include <cstdint>
#include <string>
#include <vector>

#include "core/analysis_progress.h"
#include "core/corpus.h"
#include "store/archive_filter.h"
#include "store/fresh_counts.h"
#include "store/sqlite_db.h"

namespace manicule::store {

struct SegmentSource {
  std::string path;
  std::string sha256;
  std::size_t ordinal = 0;
  int year = 0;  // what --years took it by: its own year, else its file's (0: none)
  // The primary subtag of its own language where its text says it readably, else its
  // file's ("" when neither does), canonical ("ger" -> "de").
  std::string language;
};

// The files an analysis takes in: stored, read without error under the settings, inside
// the filter's folder and header tests (language is tested per segment, when loading).
struct StoredSelection {
  std::vector<std::string> paths;   // in path order
  std::vector<std::string> sha256;  // of each path
  std::vector<std::string> stems;   // of each path: segment ids begin with it
                                    // (core/segment_id_prefixes.h)
  std::vector<std::string> languages;  // each file's header language
  std::vector<int> years;              // each file's year (0: none)
  // Each file's: whether it holds several texts with headers of their own (a teiCorpus),
  // whose segments --author and --title then take by their own text's heading.
  std::vector<char> texts_apart;
  std::size_t files_in_store = 0;       // rows of the files table
  std::size_t files_not_read = 0;       // no reading under these settings (run batch)
  std::size_t files_failed = 0;         // stored as failed under these settings
  std::size_t files_filtered_out = 0;   // outside the filter
  std::size_t files_without_segments = 0;  // chosen, but holding no segment of the unit at all
  std::size_t files_undated = 0;        // of those, passing but for a year range: no year known,
                                        // neither the file's nor any of its segments'
};

struct StoredCorpus {
  Corpus corpus;                        // files and file_sha256: the files with segments used
  std::vector<SegmentSource> sources;   // one per corpus segment
  std::size_t segments_too_short = 0;   // fewer than min_tokens words
  std::size_t segments_other_language = 0;  // outside the filter's language
  std::size_t segments_other_years = 0;     // dated (own year, else the file's) outside the years
  std::size_t segments_undated = 0;         // no year, in a file chosen for its segments' years
  std::size_t segments_other_texts = 0;     // of a text whose own heading fails --author or --title
};

StoredSelection select_stored_files(Database& db, std::int64_t settings_id, const ArchiveFilter& filter);

// Throws Error(usage) when two files' segment ids clash (a safety net: the prefixes that
// select_stored_files gives are distinct). `progress` hears of the share of the selected
// files loaded (step "stored counts").
StoredCorpus load_stored_corpus(Database& db, std::int64_t settings_id, const FeatureSpec& spec,
                                const ArchiveFilter& filter, const StoredSelection& selection,
                                std::size_t min_tokens, FreshCounts* fresh = nullptr,
                                const AnalysisProgress& progress = {});

}  // namespace manicule::store
