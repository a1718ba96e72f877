#include "store/sqlite_db.h"

#include <sqlite3.h>

#include <unistd.h>

#include <cerrno>
#include <filesystem>

#include "core/error.h"
#include "core/open_failure.h"

namespace manicule::store {

namespace {

std::string message_for(int code, const std::string& path, std::string_view doing, sqlite3* db) {
  int primary = code & 0xff;
  if (primary == SQLITE_BUSY)
    return "the store " + path + " is in use by another program (a manicule batch, analyse-store or merge, or " +
           "an SQLite client such as the sqlite3 shell holding it open); wait for it to finish or close it, or use "
           "another store";
  // Where the disk filled, what was being written says nothing to a user (it was a piece of
  // SQL); what matters is that the store keeps what it held, and what to do.
  // (SQLite keeps its temporary files in memory here: store_schema.cpp, so the disk is the store's.)
  if (primary == SQLITE_FULL && doing == "checkpoint")
    return "store " + path + ": the disk is full: its log (" + path + "-wal) could not be copied into it; the " +
           "store is whole only with that log beside it, so keep the two files together, make room, and run the " +
           "command again";
  if (primary == SQLITE_FULL)
    return "store " + path + ": the disk is full: the change being written is not kept, and the store keeps " +
           "what it held before it; make room and run the command again (a batch goes on where this one stopped)";
  std::string detail = db ? sqlite3_errmsg(db) : sqlite3_errstr(code);
  if (primary == SQLITE_NOTADB || primary == SQLITE_CORRUPT)
    return path + " is not a manicule store (or is damaged): " + detail;
  return "store " + path + ": " + std::string(doing) + ": " + detail;
}

// The folder a file lies in ("." for a bare name).
std::filesystem::path folder_of(const std::filesystem::path& file) {
  return file.has_parent_path() ? file.parent_path() : std::filesystem::path(".");
}

// Why a store cannot be opened, where SQLite says only "unable to open database file" (and
// its saved system error is that of its last attempt, not of the cause).
std::string why_not_openable(const std::string& path) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (fs::is_directory(path, ec)) return "it is a folder";
  const fs::path parent = folder_of(path);
  if (!fs::exists(path, ec)) {
    if (fs::is_symlink(fs::symlink_status(path, ec))) return "it is " + open_failure_reason(path, ENOENT);
    if (!fs::is_directory(parent, ec)) return "the folder " + parent.string() + " does not exist";
    if (::access(parent.c_str(), W_OK | X_OK) != 0)
      return errno == EROFS ? "the folder " + parent.string() + " is on a read-only file system"
                            : "no permission to create a file in " + parent.string();
  } else if (::access(path.c_str(), R_OK | W_OK) != 0) {
    return errno == EROFS ? "it is on a read-only file system" : "no permission to read and write it";
  }
  return "";
}

// Why a store that opened cannot be written as a store needs ("" when nothing is seen): every
// command writes to it (runs, results), and SQLite keeps its log beside it (FILE-wal).
std::string why_not_writable(const std::string& path) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (::access(path.c_str(), W_OK) != 0)
    return errno == EROFS ? "it is on a read-only file system" : "no permission to write it";
  // SQLite follows a link to the store and keeps its log beside the file it leads to.
  fs::path file = fs::canonical(path, ec);
  if (ec) file = fs::path(path);
  const fs::path parent = folder_of(file);
  if (::access(parent.c_str(), W_OK | X_OK) != 0 && !fs::exists(file.string() + "-wal", ec))
    return "SQLite writes its log (" + file.filename().string() + "-wal) beside the store, and the folder " +
           parent.string() + " allows no new file";
  return "";
}

}  // namespace

Database::Database(const std::string& path, bool create) : path_(path) {
  if (!create && !std::filesystem::exists(path))
    throw Error(ErrorKind::bad_input, "no such store: " + path + " (make one with manicule batch --store)");
  {
    // A device or a pipe (/dev/null) opens as an empty database and fails at the first
    // write as "disk I/O error"; a folder is said below, with the other reasons.
    std::error_code ec;
    const auto status = std::filesystem::status(path, ec);
    if (!ec && std::filesystem::exists(status) && !std::filesystem::is_regular_file(status) &&
        !std::filesystem::is_directory(status))
      throw Error(ErrorKind::bad_input, path + " is not a file (a device or a pipe), so it cannot be a store");
  }
  int flags = SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX | (create ? SQLITE_OPEN_CREATE : 0);
  int rc = sqlite3_open_v2(path.c_str(), &db_, flags, nullptr);
  if (rc != SQLITE_OK) {
    std::string message = message_for(rc, path, "opening", db_);
    if ((rc & 0xff) == SQLITE_CANTOPEN) {
      const std::string why = why_not_openable(path);
      if (!why.empty()) message += ": " + why;
    }
    sqlite3_close(db_);
    db_ = nullptr;
    throw Error(ErrorKind::write_failed, message);
  }
  sqlite3_extended_result_codes(db_, 1);
  // SQLite opens a file it may not write read-only without a word; the first write would
  // then fail as "disk I/O error" or "attempt to write a readonly database".
  std::string why = why_not_writable(path);
  if (why.empty() && sqlite3_db_readonly(db_, "main") == 1) why = "SQLite opened it read-only";
  if (!why.empty()) {
    sqlite3_close(db_);
    db_ = nullptr;
    throw Error(ErrorKind::write_failed, "cannot write the store " + path + ": " + why +
                                             " (copy it to a folder of your own and use the copy)");
  }
}

Database::~Database() {
  if (db_) sqlite3_close_v2(db_);
}

bool skip_sqlite_memory_statistics() { return sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0) == SQLITE_OK; }

void Database::fail(int code, std::string_view doing) const {
  int primary = code & 0xff;
  if (primary == SQLITE_BUSY)  // (SQLITE_LOCKED is a conflict within this connection: a bug, not a wait)
    throw StoreInUse(ErrorKind::write_failed, message_for(code, path_, doing, db_));
  ErrorKind kind = primary == SQLITE_NOTADB || primary == SQLITE_CORRUPT ? ErrorKind::bad_input : ErrorKind::write_failed;
  throw Error(kind, message_for(code, path_, doing, db_));
}

void Database::exec(std::string_view sql) {
  std::string text(sql);
  int rc = sqlite3_exec(db_, text.c_str(), nullptr, nullptr, nullptr);
  if (rc != SQLITE_OK) fail(rc, text.substr(0, 60));
}

void Database::checkpoint() {
  int rc = sqlite3_wal_checkpoint_v2(db_, nullptr, SQLITE_CHECKPOINT_PASSIVE, nullptr, nullptr);
  if (rc != SQLITE_OK) fail(rc, "checkpoint");
}

void Database::close() {
  if (!db_) return;
  int log_frames = -1, copied_frames = -1;
  int rc = sqlite3_wal_checkpoint_v2(db_, nullptr, SQLITE_CHECKPOINT_PASSIVE, &log_frames, &copied_frames);
  if (rc == SQLITE_OK && log_frames != copied_frames) rc = SQLITE_BUSY;
  if (rc != SQLITE_OK) {
    const std::string reason = (rc & 0xff) == SQLITE_BUSY ? "part of it is still in use" : sqlite3_errmsg(db_);
    throw Error(ErrorKind::write_failed,
                "store " + path_ + ": its log (" + path_ + "-wal) could not be copied into it (" + reason +
                    "): the store is whole only with that log beside it, so keep the two files together, "
                    "make room, and run the command again");
  }
  sqlite3_close_v2(db_);  // the log is in: what is left to do cannot fail the store
  db_ = nullptr;
}

void Database::keep_log_file_on_close() {
  int persist = 1;
  sqlite3_file_control(db_, "main", SQLITE_FCNTL_PERSIST_WAL, &persist);
}

std::int64_t Database::last_insert_id() const { return sqlite3_last_insert_rowid(db_); }
int Database::changes() const { return sqlite3_changes(db_); }

Statement::Statement(Database& db, std::string_view sql) : db_(&db) {
  int rc = sqlite3_prepare_v3(db.handle(), sql.data(), static_cast<int>(sql.size()), SQLITE_PREPARE_PERSISTENT,
                              &stmt_, nullptr);
  if (rc != SQLITE_OK) db.fail(rc, "preparing " + std::string(sql.substr(0, 60)));
}

Statement::~Statement() {
  if (stmt_) sqlite3_finalize(stmt_);
}

Statement::Statement(Statement&& other) noexcept : db_(other.db_), stmt_(other.stmt_) { other.stmt_ = nullptr; }

Statement& Statement::bind(int index, std::int64_t value) {
  int rc = sqlite3_bind_int64(stmt_, index, value);
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

Statement& Statement::bind(int index, double value) {
  int rc = sqlite3_bind_double(stmt_, index, value);
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

Statement& Statement::bind(int index, std::string_view text) {
  int rc = sqlite3_bind_text64(stmt_, index, text.data(), text.size(), SQLITE_TRANSIENT, SQLITE_UTF8);
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

Statement& Statement::bind_blob(int index, std::string_view bytes) {
  int rc = sqlite3_bind_blob64(stmt_, index, bytes.data(), bytes.size(), SQLITE_TRANSIENT);
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

Statement& Statement::bind_null(int index) {
  int rc = sqlite3_bind_null(stmt_, index);
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

Statement& Statement::bind_column(int index, const Statement& from, int column) {
  int rc = sqlite3_bind_value(stmt_, index, sqlite3_column_value(from.stmt_, column));
  if (rc != SQLITE_OK) db_->fail(rc, "binding");
  return *this;
}

bool Statement::step() {
  int rc = sqlite3_step(stmt_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  std::string sql = sqlite3_sql(stmt_) ? sqlite3_sql(stmt_) : "";
  sqlite3_reset(stmt_);
  db_->fail(rc, sql.substr(0, 60));
}

void Statement::step_to_end() {
  while (step()) {
  }
  reset();
}

void Statement::reset() { sqlite3_reset(stmt_); }

std::int64_t Statement::int64_at(int column) const { return sqlite3_column_int64(stmt_, column); }

std::string Statement::text_at(int column) const {
  const unsigned char* text = sqlite3_column_text(stmt_, column);
  if (!text) return {};
  return std::string(reinterpret_cast<const char*>(text), static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column)));
}

std::string_view Statement::blob_at(int column) const {
  const void* data = sqlite3_column_blob(stmt_, column);
  if (!data) return {};
  return {static_cast<const char*>(data), static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column))};
}

bool Statement::is_null(int column) const { return sqlite3_column_type(stmt_, column) == SQLITE_NULL; }

Transaction::Transaction(Database& db) : db_(db) { db_.exec("BEGIN IMMEDIATE"); }

Transaction::~Transaction() {
  if (open_) sqlite3_exec(db_.handle(), "ROLLBACK", nullptr, nullptr, nullptr);
}

void Transaction::commit() {
  db_.exec("COMMIT");
  open_ = false;
}

}  // namespace manicule::store
