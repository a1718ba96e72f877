// The archive store's tables (described for users in docs/store.md) and how a store is
// opened. A store is one SQLite file in WAL mode with synchronous=NORMAL: a committed
// transaction survives the process being killed at any moment. The connection holds an
// exclusive lock for as long as the store is open (locking_mode=EXCLUSIVE, taken at once),
// so a second run on the same store refuses straight away with a clear message instead of
// interleaving its writes; the sqlite3 shell can query the store when no run holds it.
#pragma once
#include <functional>
#include <memory>
#include <string>

#include "store/sqlite_db.h"

namespace manicule::store {

// Statements that the batch's writer and merge (and, for the last, the loading of an
// analysis) both run, kept beside the schema so that a new column is added in one place.
// A content read under a settings: ?1 settings_id, ?2 sha256, ?3 bytes, ?4 status, ?5 error,
// ?6 error_kind, ?7 title, ?8 author, ?9 date, ?10 year, ?11 language, ?12 segments,
// ?13 tokens, ?14 run_id, ?15 first_segment_year, ?16 last_segment_year, ?17 texts_apart.
extern const char* const kInsertReading;
// A segment: ?1 settings_id, ?2 sha256, ?3 ordinal, ?4 local_id, ?5 unit, ?6 label,
// ?7 language, ?8 author, ?9 authorship, ?10 pointers, ?11 warnings, ?12 tokens, ?13 types,
// ?14 feature_total, ?15 counts, ?16 date, ?17 year, ?18 text_title, ?19 text_author,
// ?20 collection_titles, ?21 text_number.
extern const char* const kInsertSegment;
// The segments of a content (?1 settings_id, ?2 sha256) in document order, columns 0-18:
// ordinal, local_id, unit, label, language, author, authorship, pointers, warnings, tokens,
// types, feature_total, counts, date, year, text_title, text_author, collection_titles,
// text_number.
extern const char* const kSegmentsOfContent;

// Raised whenever a table changes shape or a table, index or view is added: a store of
// an earlier format is brought up to this one where open_store knows how (from 2 or 3), any
// other is refused, and an existing store of this format is not given the schema again
// (open_store runs it on a new store only). 2: the vocabulary in blocks
// (store_vocabulary.h); 3: segments dated apart from their file (segments.date, .year);
// 4: segments named by their own text's header (segments.text_title, .text_author,
// .collection_titles, .text_number, readings.texts_apart).
inline constexpr int kStoreFormat = 4;

// Opens the store (creating file and tables when `create`), locks it and checks its format.
// Without `create`, a file that holds no tables (0 bytes, say) is refused, not made a store.
// A store another program holds is tried again for 1.5 s, then refused (StoreInUse); when
// `stop_waiting` says so (a Ctrl-C noted by the caller), it is refused at the next try.
std::unique_ptr<Database> open_store(const std::string& path, bool create,
                                     const std::function<bool()>& stop_waiting = {});

// Asks SQLite whether the store's pages are whole (PRAGMA quick_check: every page and
// record readable, every index in order); a store found damaged is refused (Error
// bad_input, SQLite's first finding named), before anything is written to it.
void check_store_is_whole(Database& db);

// The endings of the files that make up a store: the store itself, then what SQLite keeps
// beside it (log, shared memory, rollback journal).
inline constexpr const char* kStoreFileSuffixes[] = {"", "-wal", "-shm", "-journal"};

// Removes a store this run created and left empty, then closes it. Its files are unlinked
// while the run still holds the lock, so that a run waiting for it finds no store and makes
// its own; and the closing leaves the log's name alone, which by then may be that run's.
void discard_new_store(std::unique_ptr<Database> db);

}  // namespace manicule::store
