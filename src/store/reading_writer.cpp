#include "store/reading_writer.h"

#include <algorithm>

#include <nlohmann/json.hpp>

#include "core/segment_id_prefixes.h"
#include "core/utf8_text.h"
#include "store/count_blob.h"
#include "store/store_schema.h"
#include "store/stored_failure.h"

namespace manicule::store {

namespace {

std::string authorship_name(Authorship a) {
  return a == Authorship::known ? "known" : a == Authorship::conjectured ? "conjectured" : "unknown";
}

}  // namespace

ReadingWriter::ReadingWriter(Database& db, std::int64_t settings_id)
    : db_(db),
      settings_id_(settings_id),
      upsert_file_(db.prepare(
          "INSERT INTO files (path, relative_path, stem, size, mtime_ns, sha256, read_error) "
          "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7) ON CONFLICT (path) DO UPDATE SET relative_path = excluded.relative_path, "
          "stem = excluded.stem, size = excluded.size, mtime_ns = excluded.mtime_ns, sha256 = excluded.sha256, "
          "read_error = excluded.read_error")),
      insert_reading_(db.prepare(kInsertReading)),
      insert_segment_(db.prepare(kInsertSegment)) {}

void ReadingWriter::write_file(const ArchiveFile& file, const std::string& sha256, const std::string& read_error) {
  upsert_file_.bind(1, file.path).bind(2, file.relative_path).bind(3, file_stem(file.path));
  upsert_file_.bind(4, static_cast<std::int64_t>(file.size)).bind(5, file.mtime_ns);
  if (sha256.empty()) upsert_file_.bind_null(6); else upsert_file_.bind(6, sha256);
  if (read_error.empty()) upsert_file_.bind_null(7); else upsert_file_.bind(7, read_error);
  upsert_file_.step_to_end();
}

void ReadingWriter::keep_counts(std::size_t min_tokens) {
  kept_ = std::make_unique<FreshCounts>();
  kept_->min_tokens = min_tokens;
}

std::unique_ptr<FreshCounts> ReadingWriter::take_fresh_counts() {
  if (!kept_ || !vocabulary_) return nullptr;
  kept_->forms = std::move(*vocabulary_).take_forms();
  vocabulary_.reset();
  return std::move(kept_);
}

void ReadingWriter::rank_file_ids_by_store_id() {
  // A bitmap over the store's ids instead of a sort: a file's few thousand ids are marked
  // and read back in order, which cost the writer a tenth of what sorting them did.
  // The mapping is one to one (the file's forms are distinct), so no id is marked twice.
  std::size_t top = 0;
  for (FeatureId s : to_store_) top = std::max<std::size_t>(top, s + 1);
  const std::size_t bitmap_words = (top + 63) / 64;
  if (store_id_bits_.size() < bitmap_words) store_id_bits_.resize(bitmap_words, 0);
  if (file_id_of_store_id_.size() < top) file_id_of_store_id_.resize(top);
  for (std::size_t id = 0; id < to_store_.size(); ++id) {
    const FeatureId s = to_store_[id];
    store_id_bits_[s / 64] |= std::uint64_t{1} << (s % 64);
    file_id_of_store_id_[s] = static_cast<FeatureId>(id);
  }
  rank_of_file_id_.resize(to_store_.size());
  store_id_of_rank_.resize(to_store_.size());
  std::uint32_t rank = 0;
  for (std::size_t w = 0; w < bitmap_words; ++w) {
    std::uint64_t bits = store_id_bits_[w];
    store_id_bits_[w] = 0;  // clear for the next file
    while (bits) {
      const auto store_id = static_cast<FeatureId>(w * 64 + static_cast<std::size_t>(__builtin_ctzll(bits)));
      rank_of_file_id_[file_id_of_store_id_[store_id]] = rank;
      store_id_of_rank_[rank++] = store_id;
      bits &= bits - 1;
    }
  }
}

void ReadingWriter::write_reading(const FileReading& r, std::int64_t run_id) {
  std::size_t tokens = 0;
  int first_segment_year = 0, last_segment_year = 0;  // of those dated apart from the file
  bool texts_apart = false;  // its segments named by their own texts' headers (a teiCorpus)
  for (const auto& s : r.segments) {
    tokens += s.tokens;
    texts_apart = texts_apart || s.segment.own_text;
    if (const int year = s.segment.year) {
      first_segment_year = first_segment_year ? std::min(first_segment_year, year) : year;
      last_segment_year = last_segment_year ? std::max(last_segment_year, year) : year;
    }
  }
  auto& q = insert_reading_;
  q.bind(1, settings_id_).bind(2, r.sha256).bind(3, r.bytes).bind(4, r.failed ? "failed" : "ok");
  if (r.failed) q.bind(5, failure_to_store(r.failure.message, r.file)).bind(6, r.failure.kind);
  else q.bind_null(5).bind_null(6);
  q.bind(7, r.metadata.title).bind(8, r.metadata.author).bind(9, r.metadata.date);
  if (r.metadata.year) q.bind(10, r.metadata.year); else q.bind_null(10);
  q.bind(11, r.metadata.language).bind(12, r.failed ? 0 : r.segments.size()).bind(13, r.failed ? 0 : tokens);
  q.bind(14, run_id);
  if (first_segment_year) q.bind(15, first_segment_year).bind(16, last_segment_year);
  else q.bind_null(15).bind_null(16);
  q.bind(17, texts_apart ? 1 : 0);
  q.step_to_end();
  // Nothing inserted: this content is stored already (the same file twice in the archive).
  if (db_.changes() == 0 || r.failed) return;
  if (!vocabulary_) {
    vocabulary_ = std::make_unique<StoreVocabulary>(db_, settings_id_);
    // A guess at the new forms: the play and novel corpora of ../shared/corpora bring one
    // per 600-1,500 bytes of XML; a low guess costs a rehash or two. Capped at a million
    // (a 32 MiB table): vocabulary grows far slower than text, and an archive of many
    // gigabytes must not get a table in proportion; a bigger vocabulary still fits.
    constexpr std::uint64_t kMostExpected = std::uint64_t{1} << 20;
    vocabulary_->expect(vocabulary_->forms().size() +
                        static_cast<std::size_t>(std::min(expected_bytes_ / 1024, kMostExpected)));
  }
  // The file's own feature ids -> the store's, each form looked up once per file.
  vocabulary_->ids_of(r.counts.vocabulary, to_store_);
  // Counts are stored in store-id order. The file's ids are ranked in store-id order once;
  // a segment that uses more than a few of the file's words then marks its ranks in a
  // bitmap (a bit per word of the file) and reads the set bits back in order, a small
  // one is sorted. (Scanning all the file's words for each segment instead cost a
  // novel's chapters a fifth of the writer's time.)
  const std::size_t words = to_store_.size();
  rank_file_ids_by_store_id();
  const std::size_t bitmap_words = (words + 63) / 64;
  rank_bits_.assign(bitmap_words, 0);
  count_of_rank_.resize(words);
  FreshContent* fresh = kept_ ? &kept_->by_content[r.sha256] : nullptr;
  for (std::size_t i = 0; i < r.segments.size(); ++i) {
    const SegmentRecord& record = r.segments[i];
    const Segment& seg = record.segment;
    const SegmentCounts& counts = r.counts.segments[i];
    mapped_.clear();
    if (counts.counts.size() * 8 >= bitmap_words) {
      for (const auto& [local, n] : counts.counts) {
        const std::uint32_t rank = rank_of_file_id_[local];
        rank_bits_[rank / 64] |= std::uint64_t{1} << (rank % 64);
        count_of_rank_[rank] = n;
      }
      for (std::size_t w = 0; w < bitmap_words; ++w) {
        std::uint64_t bits = rank_bits_[w];
        rank_bits_[w] = 0;  // clear for the next segment
        while (bits) {
          const std::size_t rank = w * 64 + static_cast<std::size_t>(__builtin_ctzll(bits));
          mapped_.emplace_back(store_id_of_rank_[rank], count_of_rank_[rank]);
          bits &= bits - 1;
        }
      }
    } else {
      for (const auto& [local, n] : counts.counts) mapped_.emplace_back(to_store_[local], n);
      std::sort(mapped_.begin(), mapped_.end());
    }
    auto& w = insert_segment_;
    w.bind(1, settings_id_).bind(2, r.sha256).bind(3, i).bind(4, seg.local_id).bind(5, seg.unit).bind(6, seg.label);
    w.bind(7, seg.language).bind(8, seg.author).bind(9, authorship_name(seg.authorship));
    w.bind(10, json_text(nlohmann::json(seg.pointers))).bind(11, json_text(nlohmann::json(seg.warnings)));
    w.bind(12, record.tokens).bind(13, record.types).bind(14, counts.feature_total);
    w.bind_blob(15, encode_counts(mapped_));
    if (seg.date.empty()) w.bind_null(16); else w.bind(16, seg.date);
    if (seg.year) w.bind(17, seg.year); else w.bind_null(17);
    if (seg.own_text) {
      w.bind(18, seg.own_text->title).bind(19, seg.own_text->author);
      w.bind(20, json_text(nlohmann::json(seg.own_text->collection_titles))).bind(21, seg.own_text->number);
    } else {
      w.bind_null(18).bind_null(19).bind_null(20).bind_null(21);
    }
    w.step_to_end();
    if (fresh) {
      if (texts_apart) fresh->own_texts.push_back(seg.own_text.value_or(TextHeading{}));
      fresh->languages.push_back(seg.language);
      fresh->years.push_back(seg.year);
      fresh->tokens.push_back(record.tokens);
      if (record.tokens >= kept_->min_tokens) {
        fresh->kept.push_back(
            FreshSegment{i, record, counts.feature_total, FeatureCounts(mapped_, kept_->count_memory.get())});
      }
    }
  }
  vocabulary_->write_new();
}

}  // namespace manicule::store
