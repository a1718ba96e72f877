// What a batch run has just stored, kept in memory for an analysis in the same process so
// that it need not read back what was just written: the store's vocabulary as the run left
// it (ids are the store's feature ids) and, for each content read in this run, its
// segments as stored: every segment's language, own year, own text's heading and length
// (what the analysis' filters ask), and the metadata and counts in store ids of those of at least `min_tokens` words
// (an analysis leaves shorter ones out anyway). Contents stored by earlier runs are not
// here: an analysis reads those from the store. On the plays, reading back the counts and
// vocabulary took a quarter of a second of the first run's analysis, and the segment rows
// another 30 ms.
#pragma once
#include <cstddef>
#include <memory>
#include <string>
#include <unordered_map>
#include <vector>

#include "core/corpus.h"
#include "store/count_blob.h"

namespace manicule::store {

// A segment of at least min_tokens words, as stored.
struct FreshSegment {
  std::size_t ordinal = 0;
  SegmentRecord record;  // as read; the corpus loader sets segment.id and .file from the path
  std::size_t feature_total = 0;
  FeatureCounts counts;  // in store ids
};

// One content's segments, by ordinal.
struct FreshContent {
  std::vector<std::string> languages;   // every segment's
  std::vector<int> years;               // every segment's own year (0: dated by its file only)
  std::vector<std::size_t> tokens;      // every segment's
  // Every segment's own text's heading where the file holds several texts (texts_apart);
  // empty otherwise.
  std::vector<TextHeading> own_texts;
  std::vector<FreshSegment> kept;       // those of at least min_tokens words, in ordinal order
};

struct FreshCounts {
  Vocabulary forms;  // every form of the settings, by store id
  // Where the kept segments' counts are cut from (never null); the analysis takes it over
  // with them. Declared before `by_content`, so that it outlives their lists.
  std::shared_ptr<CountArena> count_memory = std::make_shared<CountArena>();
  std::size_t min_tokens = 0;
  std::unordered_map<std::string, FreshContent> by_content;  // by SHA-256

  FreshCounts() = default;
  // Assigned member by member, the arena would be let go before the lists in it: see clear().
  FreshCounts& operator=(const FreshCounts&) = delete;

  // Empties it, the lists before their arena (what an analysis leaves of it once it has
  // taken the segments it wants).
  void clear() {
    by_content.clear();
    forms = Vocabulary();
    count_memory = std::make_shared<CountArena>();
  }

  // The content's segments, or null when they were not read in this run (or when an
  // analysis wants segments shorter than those kept).
  FreshContent* find(const std::string& sha256, std::size_t wanted_min_tokens) {
    if (wanted_min_tokens < min_tokens) return nullptr;
    auto content = by_content.find(sha256);
    return content == by_content.end() ? nullptr : &content->second;
  }
};

}  // namespace manicule::store
