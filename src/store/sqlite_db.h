// A thin RAII layer over the sqlite3 C API, for the archive store alone (the only place
// that speaks SQL): a connection, prepared statements with typed binding and reading, and
// transactions that roll back unless committed. Every SQLite failure throws
// Error(write_failed) naming the database file and SQLite's message; SQLITE_BUSY (another
// process holds the store) gets a message of its own. A Database belongs to one thread.
#pragma once
#include <cstdint>
#include <string>
#include <string_view>

#include "core/error.h"

struct sqlite3;
struct sqlite3_stmt;

namespace manicule::store {

class Database;

// SQLITE_BUSY: another connection holds the store. Apart from the other
// errors because opening a store tries again on it (open_store).
class StoreInUse : public Error {
 public:
  using Error::Error;
};

// For a program that owns its process (the command line), before any store is opened:
// SQLite then keeps no account of the memory it holds, which takes a lock around each of
// its allocations and frees (some 300,000 allocations in the plays' first run, heaptrack;
// 0.3 % of the instructions of a first run over 100 of the plays, callgrind, all of them
// in the store's writer). Process-wide, so a library embedded in another program leaves
// it to that program. False when SQLite is in use already and nothing changed.
bool skip_sqlite_memory_statistics();

class Statement {
 public:
  Statement(Database& db, std::string_view sql);
  ~Statement();
  Statement(Statement&& other) noexcept;
  Statement(const Statement&) = delete;
  Statement& operator=(const Statement&) = delete;
  Statement& operator=(Statement&&) = delete;

  // Parameters are numbered from 1, as in SQL's ?1, ?2, ...
  Statement& bind(int index, std::int64_t value);
  Statement& bind(int index, int value) { return bind(index, static_cast<std::int64_t>(value)); }
  Statement& bind(int index, std::size_t value) { return bind(index, static_cast<std::int64_t>(value)); }
  Statement& bind(int index, double value);
  Statement& bind(int index, std::string_view text);
  Statement& bind(int index, const std::string& text) { return bind(index, std::string_view(text)); }
  Statement& bind(int index, const char* text) { return bind(index, std::string_view(text)); }
  Statement& bind_blob(int index, std::string_view bytes);
  Statement& bind_null(int index);
  // The value of `from`'s current row at `column` (0-based), whatever its type, NULL too.
  Statement& bind_column(int index, const Statement& from, int column);

  // Binds the arguments to ?1.. in order, runs the statement to its end and resets it.
  template <typename... Args>
  void run(const Args&... args) {
    int i = 0;
    (bind(++i, args), ...);
    step_to_end();
  }

  bool step();        // true while a row is there to read
  void step_to_end();  // runs, then resets (for statements that return nothing)
  void reset();        // ready to run again; bindings are kept until rebound

  // Columns are numbered from 0.
  std::int64_t int64_at(int column) const;
  std::string text_at(int column) const;   // "" for NULL
  std::string_view blob_at(int column) const;  // valid until the next step or reset
  bool is_null(int column) const;

 private:
  Database* db_;
  sqlite3_stmt* stmt_ = nullptr;
};

class Database {
 public:
  // Opens (creating when `create`) the database file. Throws Error(bad_input) when it
  // does not exist and `create` is false.
  Database(const std::string& path, bool create);
  ~Database();
  Database(const Database&) = delete;
  Database& operator=(const Database&) = delete;

  void exec(std::string_view sql);  // one or more statements without results
  // Copies what the write-ahead log holds into the database file and syncs it. Not while
  // another thread uses this connection (it is opened without SQLite's mutex).
  void checkpoint();
  // Closes the store as one whole file: its log copied in (all of it) and removed. A log that
  // cannot be copied (a full disk) is an Error, for the store is then whole only with its
  // log beside it, and a copy of the file alone (a job script's) would be damaged.
  void close();
  // Closing then leaves FILE-wal where it is (SQLite removes it otherwise): for a store
  // whose files were unlinked while open (discard_new_store).
  void keep_log_file_on_close();
  Statement prepare(std::string_view sql) { return Statement(*this, sql); }
  std::int64_t last_insert_id() const;
  int changes() const;

  const std::string& path() const { return path_; }
  sqlite3* handle() const { return db_; }
  // Throws the Error for SQLite result `code` (anything but OK/ROW/DONE).
  [[noreturn]] void fail(int code, std::string_view doing) const;

 private:
  std::string path_;
  sqlite3* db_ = nullptr;
};

// BEGIN IMMEDIATE now; ROLLBACK at destruction unless commit() was called.
class Transaction {
 public:
  explicit Transaction(Database& db);
  ~Transaction();
  Transaction(const Transaction&) = delete;
  Transaction& operator=(const Transaction&) = delete;
  void commit();

 private:
  Database& db_;
  bool open_ = true;
};

}  // namespace manicule::store
