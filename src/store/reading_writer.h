// Writing what a batch found, inside the caller's transaction: a file's row (where a
// content lives now), and what was read from a content under one settings (its readings
// row with header metadata or error, and its segments with their counts in store ids).
// A content already stored under these settings is left as it is, so writing twice is
// harmless: a batch restarted after being killed adds no duplicate. Construct it after any
// rollback of the store's vocabulary (it keeps the vocabulary in memory, see StoreVocabulary).
#pragma once
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "core/file_reading.h"
#include "store/archive_files.h"
#include "store/count_blob.h"
#include "store/fresh_counts.h"
#include "store/sqlite_db.h"
#include "store/store_vocabulary.h"

namespace manicule::store {

class ReadingWriter {
 public:
  ReadingWriter(Database& db, std::int64_t settings_id);

  // `sha256` empty: the file could not be read at all (`read_error` says why).
  void write_file(const ArchiveFile& file, const std::string& sha256, const std::string& read_error);
  void write_reading(const FileReading& reading, std::int64_t run_id);
  // The bytes of XML about to be read, so that the store's vocabulary is sized for the
  // new forms they will bring at once instead of growing step by step.
  void expect_bytes(std::uint64_t bytes) { expected_bytes_ = bytes; }
  // Keeps, besides writing them, the counts of segments of at least `min_tokens` words,
  // for an analysis after the run (FreshCounts).
  void keep_counts(std::size_t min_tokens);
  // What was kept, with the store's vocabulary; null when no reading was written. The
  // writer writes nothing more afterwards.
  std::unique_ptr<FreshCounts> take_fresh_counts();

 private:
  // Fills rank_of_file_id_ and store_id_of_rank_ from to_store_.
  void rank_file_ids_by_store_id();

  Database& db_;
  std::int64_t settings_id_;
  std::unique_ptr<StoreVocabulary> vocabulary_;  // loaded when first needed: a re-run may need none
  std::uint64_t expected_bytes_ = 0;
  Statement upsert_file_;
  Statement insert_reading_;
  Statement insert_segment_;
  std::vector<FeatureId> to_store_;      // file's feature id -> store's
  std::vector<std::uint64_t> store_id_bits_;    // by store id, all zero between files
  std::vector<FeatureId> file_id_of_store_id_;  // valid where the bit is set
  // The file's feature ids ranked in store-id order: a segment's counts are put in that
  // order by marking their ranks in a bitmap and reading the set bits back.
  std::vector<std::uint32_t> rank_of_file_id_;
  std::vector<FeatureId> store_id_of_rank_;
  std::vector<std::uint64_t> rank_bits_;         // a segment's ranks, all zero between uses
  std::vector<std::uint32_t> count_of_rank_;     // valid where the rank's bit is set
  FeatureCounts mapped_;
  std::unique_ptr<FreshCounts> kept_;  // when keep_counts() was asked for
};

}  // namespace manicule::store
