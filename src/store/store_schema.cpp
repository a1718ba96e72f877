#include "store/store_schema.h"

#include <sqlite3.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <filesystem>
#include <random>
#include <thread>

#include "core/error.h"

namespace manicule::store {

const char* const kInsertReading =
    "INSERT OR IGNORE INTO readings (settings_id, sha256, bytes, status, error, error_kind, title, author, date, "
    "year, language, segments, tokens, run_id, first_segment_year, last_segment_year, texts_apart) "
    "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17)";
const char* const kInsertSegment =
    "INSERT INTO segments (settings_id, sha256, ordinal, local_id, unit, label, language, author, authorship, "
    "pointers, warnings, tokens, types, feature_total, counts, date, year, text_title, text_author, collection_titles, "
    "text_number) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17, ?18, ?19, ?20, ?21)";
const char* const kSegmentsOfContent =
    "SELECT ordinal, local_id, unit, label, language, author, authorship, pointers, warnings, tokens, types, "
    "feature_total, counts, date, year, text_title, text_author, collection_titles, text_number FROM segments WHERE settings_id = ?1 AND sha256 = ?2 ORDER BY ordinal";

namespace {

// Keys: a file's content is known by its SHA-256; what was read from it depends on the
// reading settings as well, so readings and segments are keyed by (settings_id, sha256).
// Paths live in `files` alone, so a moved or copied file is not read again.
constexpr const char* kSchema = R"sql(
CREATE TABLE IF NOT EXISTS store_info (
  key TEXT PRIMARY KEY,
  value TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS settings (
  settings_id INTEGER PRIMARY KEY,
  key TEXT NOT NULL UNIQUE,
  unit TEXT NOT NULL,
  selection TEXT NOT NULL,
  tokenizer TEXT NOT NULL,
  features TEXT NOT NULL,
  request TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS files (
  path TEXT PRIMARY KEY,
  relative_path TEXT NOT NULL,
  stem TEXT NOT NULL,
  size INTEGER NOT NULL,
  mtime_ns INTEGER NOT NULL,
  sha256 TEXT,
  read_error TEXT
);
CREATE INDEX IF NOT EXISTS files_by_sha256 ON files (sha256);
CREATE TABLE IF NOT EXISTS readings (
  settings_id INTEGER NOT NULL REFERENCES settings (settings_id),
  sha256 TEXT NOT NULL,
  bytes INTEGER NOT NULL,
  status TEXT NOT NULL CHECK (status IN ('ok', 'failed')),
  error TEXT,
  error_kind INTEGER,
  title TEXT,
  author TEXT,
  date TEXT,
  year INTEGER,
  language TEXT,
  segments INTEGER NOT NULL,
  tokens INTEGER NOT NULL,
  run_id INTEGER,
  first_segment_year INTEGER,
  last_segment_year INTEGER,
  texts_apart INTEGER NOT NULL DEFAULT 0,
  PRIMARY KEY (settings_id, sha256)
);
CREATE TABLE IF NOT EXISTS segments (
  settings_id INTEGER NOT NULL,
  sha256 TEXT NOT NULL,
  ordinal INTEGER NOT NULL,
  local_id TEXT NOT NULL,
  unit TEXT NOT NULL,
  label TEXT NOT NULL,
  language TEXT NOT NULL,
  author TEXT NOT NULL,
  authorship TEXT NOT NULL,
  pointers TEXT NOT NULL,
  warnings TEXT NOT NULL,
  tokens INTEGER NOT NULL,
  types INTEGER NOT NULL,
  feature_total INTEGER NOT NULL,
  counts BLOB NOT NULL,
  date TEXT,
  year INTEGER,
  text_title TEXT,
  text_author TEXT,
  collection_titles TEXT,
  text_number INTEGER,
  PRIMARY KEY (settings_id, sha256, ordinal)
);
CREATE TABLE IF NOT EXISTS vocabulary_blocks (
  settings_id INTEGER NOT NULL,
  first_feature_id INTEGER NOT NULL,
  forms TEXT NOT NULL,
  PRIMARY KEY (settings_id, first_feature_id)
) WITHOUT ROWID;
CREATE TABLE IF NOT EXISTS runs (
  run_id INTEGER PRIMARY KEY,
  kind TEXT NOT NULL CHECK (kind IN ('batch', 'analysis', 'merge')),
  settings_id INTEGER,
  started TEXT NOT NULL,
  finished TEXT,
  status TEXT NOT NULL CHECK (status IN ('running', 'done', 'interrupted', 'failed')),
  tool TEXT NOT NULL,
  parameters TEXT NOT NULL,
  files_found INTEGER NOT NULL DEFAULT 0,
  files_unchanged INTEGER NOT NULL DEFAULT 0,
  files_hashed INTEGER NOT NULL DEFAULT 0,
  files_read INTEGER NOT NULL DEFAULT 0,
  files_failed INTEGER NOT NULL DEFAULT 0,
  bytes_read INTEGER NOT NULL DEFAULT 0,
  analysis_key TEXT
);
CREATE TABLE IF NOT EXISTS analysis_segments (
  run_id INTEGER NOT NULL,
  segment TEXT NOT NULL,
  path TEXT NOT NULL,
  sha256 TEXT NOT NULL,
  ordinal INTEGER NOT NULL,
  label TEXT NOT NULL,
  author TEXT NOT NULL,
  tokens INTEGER NOT NULL,
  measured INTEGER NOT NULL,
  excluded_reason TEXT,
  year INTEGER,
  PRIMARY KEY (run_id, segment)
);
CREATE TABLE IF NOT EXISTS features (
  run_id INTEGER NOT NULL,
  rank INTEGER NOT NULL,
  form TEXT NOT NULL,
  total INTEGER NOT NULL,
  mean REAL NOT NULL,
  sd REAL NOT NULL,
  PRIMARY KEY (run_id, rank)
);
CREATE TABLE IF NOT EXISTS neighbours (
  run_id INTEGER NOT NULL,
  segment TEXT NOT NULL,
  rank INTEGER NOT NULL,
  neighbour TEXT NOT NULL,
  distance REAL NOT NULL,
  PRIMARY KEY (run_id, segment, rank)
);
CREATE TABLE IF NOT EXISTS pca_components (
  run_id INTEGER NOT NULL,
  component INTEGER NOT NULL,
  explained_variance REAL NOT NULL,
  explained_variance_ratio REAL NOT NULL,
  PRIMARY KEY (run_id, component)
);
CREATE TABLE IF NOT EXISTS pca_coordinates (
  run_id INTEGER NOT NULL,
  segment TEXT NOT NULL,
  component INTEGER NOT NULL,
  value REAL NOT NULL,
  PRIMARY KEY (run_id, segment, component)
);
CREATE TABLE IF NOT EXISTS attributions (
  run_id INTEGER NOT NULL,
  segment TEXT NOT NULL,
  rank INTEGER NOT NULL,
  candidate TEXT NOT NULL,
  distance REAL NOT NULL,
  nearest_segment TEXT NOT NULL,
  nearest_distance REAL NOT NULL,
  margin REAL NOT NULL,
  stability REAL NOT NULL,
  rule TEXT NOT NULL,
  warnings TEXT NOT NULL,
  PRIMARY KEY (run_id, segment, rank)
);
CREATE VIEW IF NOT EXISTS vocabulary AS
  SELECT b.settings_id, b.first_feature_id + j.key AS feature_id, j.value AS form
  FROM vocabulary_blocks b, json_each(b.forms) j;
)sql";

// A file that could not be opened has no reading (no content, so no settings_id) and its
// error in `files`; it is 'failed' all the same, so that `WHERE status = 'failed'` lists it.
// A reading's error is kept without the path it was first read under (stored_failure.h):
// each file gets its own path back here.
// Written as sqlite_master keeps it (no leading line break, no semicolon), so that an
// existing store's view is compared with it as it stands.
constexpr const char* kFileListView = R"sql(CREATE VIEW file_list AS
  SELECT f.path, r.settings_id, COALESCE(r.status, CASE WHEN f.read_error IS NOT NULL THEN 'failed' END) AS status,
         COALESCE(f.read_error, CASE WHEN substr(r.error, 1, 1) = ':' THEN f.path || r.error ELSE r.error END) AS error,
         r.title, r.author,
         r.date, r.year, r.language, r.segments, r.tokens, f.size, f.sha256
  FROM files f LEFT JOIN readings r ON r.sha256 = f.sha256)sql";

// A segment's year is its own where the edition dates it (a letter), else its file's; its
// title and file_author its own text's where the file holds several (a teiCorpus).
constexpr const char* kSegmentListView = R"sql(
CREATE VIEW segment_list AS
  SELECT s.settings_id, f.path, f.stem || '#' || s.local_id AS segment, s.label, s.author, s.authorship,
         s.language, s.tokens, s.types, COALESCE(s.text_title, r.title) AS title,
         COALESCE(s.text_author, r.author) AS file_author, s.date, COALESCE(s.year, r.year) AS year
  FROM files f JOIN segments s ON s.sha256 = f.sha256
  JOIN readings r ON r.settings_id = s.settings_id AND r.sha256 = s.sha256;
)sql";

// Format 2 -> 3: segments dated apart from their file. Columns are added (SQLite adds a
// column without rewriting the table), last, as in a new store; the rows of format 2 keep
// NULL in them, as their readings dated files only. Such readings belong to an earlier
// reading revision, so the next batch reads the files again under settings of its own.
// One statement at a time, so that a failure names the one that failed.
constexpr const char* kFrom2To3[] = {
    "ALTER TABLE segments ADD COLUMN date TEXT",
    "ALTER TABLE segments ADD COLUMN year INTEGER",
    "ALTER TABLE readings ADD COLUMN first_segment_year INTEGER",
    "ALTER TABLE readings ADD COLUMN last_segment_year INTEGER",
    "ALTER TABLE analysis_segments ADD COLUMN year INTEGER",
    // An analysis made before is reused as long as its key holds: its segments get the
    // year it took them by, their file's (format 2 dated files only).
    "UPDATE analysis_segments SET year = (SELECT r.year FROM runs u JOIN readings r ON r.settings_id = u.settings_id "
    "WHERE u.run_id = analysis_segments.run_id AND r.sha256 = analysis_segments.sha256)",
    "DROP VIEW IF EXISTS segment_list",
};

// Format 3 -> 4: segments named by their own text's header. Rows of format 3 keep NULL
// and 0: their readings named every segment by its file's header, and belong to an
// earlier reading revision, so the next batch reads the files again.
constexpr const char* kFrom3To4[] = {
    "ALTER TABLE readings ADD COLUMN texts_apart INTEGER NOT NULL DEFAULT 0",
    "ALTER TABLE segments ADD COLUMN text_title TEXT",
    "ALTER TABLE segments ADD COLUMN text_author TEXT",
    "ALTER TABLE segments ADD COLUMN collection_titles TEXT",
    "ALTER TABLE segments ADD COLUMN text_number INTEGER",
    "DROP VIEW IF EXISTS segment_list",
};

// Brings a store of format 2 or 3 (`format`) up to this format inside the open
// transaction, one format at a time; on failure (a store changed by hand, say) throws, and
// the transaction leaves the store as it was.
void upgrade_store(Database& db, const std::string& path, int format) {
  try {
    if (format == 2)
      for (const char* statement : kFrom2To3) db.exec(statement);
    for (const char* statement : kFrom3To4) db.exec(statement);
    db.exec(kSegmentListView);
  } catch (const Error& e) {
    std::string reason = e.what();
    const std::string named = "store " + path + ": ";
    if (reason.rfind(named, 0) == 0) reason.erase(0, named.size());
    throw Error(e.kind(), "the store " + path + " has format " + std::to_string(format) +
                              " but cannot be brought up to format " + std::to_string(kStoreFormat) + " (" + reason +
                              "); it is left unchanged");
  }
  db.prepare("UPDATE store_info SET value = ?1 WHERE key = 'format'").run(std::to_string(kStoreFormat));
}

// A store made before file_list called a file that could not be opened 'failed' gets the
// view as it is now, once: the view holds no data, so nothing else changes. A store with
// the view as it is now is not written to (an unchanged archive's re-run writes nothing).
void refresh_file_list_view(Database& db) {
  Statement view = db.prepare("SELECT sql FROM sqlite_master WHERE type = 'view' AND name = 'file_list'");
  const std::string current = view.step() ? view.text_at(0) : "";
  view.reset();
  if (current == kFileListView) return;
  db.exec("DROP VIEW IF EXISTS file_list");
  db.exec(kFileListView);
}

}  // namespace

namespace {

std::unique_ptr<Database> open_store_once(const std::string& path, bool create) {
  auto db = std::make_unique<Database>(path, create);
  // Exclusive locking before the first access: the lock is taken by the first statement
  // below and kept, and WAL then needs no shared-memory file.
  db->exec("PRAGMA locking_mode = EXCLUSIVE");
  // No waiting inside SQLite while the lock is taken: open_store waits, between attempts
  // that each let go of what they hold (see there).
  db->exec("PRAGMA busy_timeout = 0");
  // Whether it is a store is asked before anything is written: switching another
  // application's SQLite file to WAL (below) would change that file for good. (The lock
  // taken here is kept, so the answer holds for the transaction below.)
  bool has_tables = false;
  {
    Statement tables = db->prepare(
        "SELECT count(*), count(CASE WHEN name = 'store_info' THEN 1 END) FROM sqlite_master WHERE type = 'table'");
    tables.step();
    has_tables = tables.int64_at(0) > 0;
    if (has_tables && tables.int64_at(1) == 0)
      throw Error(ErrorKind::bad_input, path + " is an SQLite file but not a manicule store (left as it was)");
    // A store only read from (analyse-store's, merge's inputs) is never made here: a shard
    // emptied by a failed copy would otherwise be merged as a store holding nothing, and
    // with merge --exact take its share's files out of the merged store.
    if (!has_tables && !create) {
      std::error_code ec;
      const auto bytes = std::filesystem::file_size(path, ec);
      throw Error(ErrorKind::bad_input, path + " holds no manicule store (" +
                                            (ec ? std::string("size unknown") : std::to_string(bytes) + " bytes") +
                                            ", no table; left as it was): was it copied whole?");
    }
  }
  // 16 KiB pages for a new store (an existing one keeps its own): most of what is stored
  // is count blobs of a few KiB each, which 4 KiB pages split over chains of overflow
  // pages. First runs took 5 % (plays) to 10 % (novels) less time and CPU than with 4 KiB;
  // 64 KiB gained hardly more and would write a whole 64 KiB to the log for each page a
  // file's row changes in the indexes keyed by content hash.
  db->exec("PRAGMA page_size = 16384");
  {
    Statement mode = db->prepare("PRAGMA journal_mode = WAL");
    if (mode.step() && mode.text_at(0) != "wal")
      throw Error(ErrorKind::write_failed, "store " + path + ": cannot switch to WAL mode (is the store read-only?)");
  }
  db->exec("PRAGMA synchronous = NORMAL");
  // The log is copied into the database every 4,096 pages (64 MiB) rather than SQLite's
  // 1,000: each copy holds up the batch's writing for its two syncs (some 50 ms) while
  // finished files wait to be stored. The plays and novels now need none before the
  // analysis, which checkpoints on a thread of its own; first runs of the plays 2-7 %
  // faster, peak memory 109 to 96 MiB.
  db->exec("PRAGMA wal_autocheckpoint = 4096");
  db->exec("PRAGMA foreign_keys = OFF");
  // Statement journals in memory: an insert of many rows (RowInserter) keeps the pages it
  // changes in one, which SQLite otherwise writes to a file in /var/tmp beyond 64 KiB:
  // 14 MiB for the plays' analysis, whose results are now stored in 13.9 ms rather than
  // 16.7 (medians of 5 interleaved runs); the plays' first run opens no temporary file.
  db->exec("PRAGMA temp_store = MEMORY");
  // Read the store through a memory map rather than a read() call a page: an analysis
  // reads every stored count, a re-run its lists of files and results.
  db->exec("PRAGMA mmap_size = 1073741824");
  Transaction t(*db);
  if (has_tables) {
    Statement version = db->prepare("SELECT value FROM store_info WHERE key = 'format'");
    std::string found = version.step() ? version.text_at(0) : "";
    version.reset();
    if (found == "2" || found == "3") {
      upgrade_store(*db, path, found == "2" ? 2 : 3);
      found = std::to_string(kStoreFormat);
    }
    if (found != std::to_string(kStoreFormat))
      throw Error(ErrorKind::bad_input, "the store " + path + " has format " + (found.empty() ? "?" : found) +
                                            "; this manicule reads format " + std::to_string(kStoreFormat) +
                                            " (and brings a store of format 2 or 3 up to it)");
    refresh_file_list_view(*db);
  }
  if (!has_tables) {
    // A store of this format has the whole schema (it is created in one transaction), so
    // only a new store needs it: an unchanged archive's re-run spends no time parsing it.
    db->exec(kSchema);
    db->exec(kFileListView);
    db->exec(kSegmentListView);
    db->prepare("INSERT INTO store_info (key, value) VALUES ('format', ?1)").run(std::to_string(kStoreFormat));
  }
  t.commit();
  db->exec("PRAGMA busy_timeout = 1500");
  return db;
}

}  // namespace

void check_store_is_whole(Database& db) {
  std::string finding;
  Statement check = db.prepare("PRAGMA quick_check(1)");  // the first finding is enough to say so
  try {
    finding = check.step() ? check.text_at(0) : "no answer";
  } catch (const Error& e) {
    // A page so damaged that the check itself stops (SQLite's "corrupt" or "not a
    // database", bad_input): SQLite's own words, kept while the statement is; anything
    // else (the store in use, a read error) is not damage.
    if (e.kind() != ErrorKind::bad_input) throw;
    finding = sqlite3_errmsg(db.handle());
  }
  // SQLite heads its findings with "*** in database main ***" on a line of its own.
  constexpr std::string_view kHeading = "*** in database main ***";
  if (finding.starts_with(kHeading)) finding.erase(0, kHeading.size());
  std::replace(finding.begin(), finding.end(), '\n', ' ');
  finding.erase(0, finding.find_first_not_of(' '));
  if (finding != "ok")
    throw Error(ErrorKind::bad_input, "the store " + db.path() + " is damaged (SQLite: " + finding +
                                          "); nothing read or written: restore it from a copy, or make it again "
                                          "with batch into a new store");
}

std::unique_ptr<Database> open_store(const std::string& path, bool create,
                                     const std::function<bool()>& stop_waiting) {
  // Two processes opening one store at the same moment can each hold the shared lock that
  // the other's exclusive lock waits for: with SQLite's busy_timeout both waited it out and
  // both refused (2 of 20 pairs of runs started together here). So each attempt gives up at
  // once and lets go of its shared lock, and the open is tried again after a pause that
  // differs between processes, until one of them has the store; the other goes on trying
  // for 1.5 s, as long as busy_timeout had it wait, before it refuses.
  using Clock = std::chrono::steady_clock;
  const auto give_up = Clock::now() + std::chrono::milliseconds(1500);
  std::minstd_rand pauses(static_cast<std::uint32_t>(::getpid()) ^
                          static_cast<std::uint32_t>(Clock::now().time_since_epoch().count()));
  for (;;) {
    try {
      return open_store_once(path, create);
    } catch (const StoreInUse&) {
      if (Clock::now() >= give_up || (stop_waiting && stop_waiting())) throw;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(5 + pauses() % 26));
  }
}

namespace {

// The store at `path` with the files SQLite keeps beside it (log, shared memory, journal).
void remove_store_files(const std::string& path) {
  // Called while another error is on its way: a file that cannot go stays, unsaid.
  std::error_code ec;
  for (const char* suffix : kStoreFileSuffixes) std::filesystem::remove(path + suffix, ec);
}

}  // namespace

void discard_new_store(std::unique_ptr<Database> db) {
  const std::string path = db->path();
  db->keep_log_file_on_close();
  remove_store_files(path);
  db.reset();
}

}  // namespace manicule::store
