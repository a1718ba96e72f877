// Inserts rows into one table many at a time. SQLite does a statement's setting up and
// finishing once per call, and for rows of a few small columns that costs about as much
// as the row itself; one INSERT of 64 rows pays it once (rows of three small columns,
// measured: 0.8 us a row one by one). Rows are kept until 64 are there; finish() inserts the rest, and must
// be called before the transaction commits (rows not finished are not inserted).
#pragma once
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

#include "store/sqlite_db.h"

namespace manicule::store {

class RowInserter {
 public:
  // `head` is the statement up to VALUES, e.g. "INSERT INTO features (run_id, rank, form)";
  // `columns` is the number of columns it names.
  RowInserter(Database& db, std::string head, int columns);

  // One row: as many values as columns, in their order. An empty std::optional is NULL.
  template <typename... Values>
  void add(const Values&... values) {
    static_assert(sizeof...(Values) > 0);
    if (static_cast<int>(sizeof...(Values)) != columns_) wrong_row_size(sizeof...(Values));
    (pending_.push_back(value_of(values)), ...);
    if (pending_.size() == kRowsPerStatement * static_cast<std::size_t>(columns_)) insert_pending(many_);
  }
  void finish();

 private:
  static constexpr std::size_t kRowsPerStatement = 64;
  using Value = std::variant<std::nullptr_t, std::int64_t, double, std::string>;

  static Value value_of(std::int64_t v) { return v; }
  static Value value_of(int v) { return static_cast<std::int64_t>(v); }
  static Value value_of(std::uint32_t v) { return static_cast<std::int64_t>(v); }
  static Value value_of(std::size_t v) { return static_cast<std::int64_t>(v); }
  static Value value_of(double v) { return v; }
  static Value value_of(std::string_view v) { return std::string(v); }
  static Value value_of(const std::string& v) { return v; }
  static Value value_of(const char* v) { return std::string(v); }
  static Value value_of(const std::optional<std::string>& v) { return v ? Value(*v) : Value(nullptr); }
  static Value value_of(const std::optional<int>& v) { return v ? Value(std::int64_t{*v}) : Value(nullptr); }

  std::string sql_for(std::size_t rows) const;
  void insert_pending(Statement& statement);
  [[noreturn]] void wrong_row_size(std::size_t values) const;

  Database& db_;
  std::string head_;
  int columns_;
  Statement many_;
  std::vector<Value> pending_;
};

}  // namespace manicule::store
