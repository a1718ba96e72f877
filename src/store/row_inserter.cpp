#include "store/row_inserter.h"

#include "core/error.h"

namespace manicule::store {

RowInserter::RowInserter(Database& db, std::string head, int columns)
    : db_(db), head_(std::move(head)), columns_(columns), many_(db.prepare(sql_for(kRowsPerStatement))) {
  pending_.reserve(kRowsPerStatement * static_cast<std::size_t>(columns_));
}

std::string RowInserter::sql_for(std::size_t rows) const {
  std::string row = "(";
  for (int c = 0; c < columns_; ++c) row += c ? ", ?" : "?";
  row += ")";
  std::string sql = head_ + " VALUES ";
  for (std::size_t r = 0; r < rows; ++r) sql += (r ? ", " : "") + row;
  return sql;
}

void RowInserter::insert_pending(Statement& statement) {
  int index = 0;
  for (const Value& v : pending_) {
    ++index;
    if (const auto* i = std::get_if<std::int64_t>(&v)) statement.bind(index, *i);
    else if (const auto* d = std::get_if<double>(&v)) statement.bind(index, *d);
    else if (const auto* s = std::get_if<std::string>(&v)) statement.bind(index, *s);
    else statement.bind_null(index);
  }
  statement.step_to_end();
  pending_.clear();
}

void RowInserter::finish() {
  if (pending_.empty()) return;
  Statement rest = db_.prepare(sql_for(pending_.size() / static_cast<std::size_t>(columns_)));
  insert_pending(rest);
}

void RowInserter::wrong_row_size(std::size_t values) const {
  throw Error(ErrorKind::internal, "a row of " + std::to_string(values) + " values for " + std::to_string(columns_) +
                                       " columns (" + head_ + ")");
}

}  // namespace manicule::store
