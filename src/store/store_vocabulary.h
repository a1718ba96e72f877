// The features of one settings in a store, kept in memory as a manicule::Vocabulary whose
// ids are the store's feature ids (0, 1, 2, ... in order of first storing), so mapping a
// file's counts to store ids needs no query. New forms get the next ids and are written by
// write_new() inside the caller's transaction; the store is locked for one writer, so ids
// never clash. After a rollback, make a new StoreVocabulary (reloads what was committed).
#pragma once
#include <cstdint>
#include <string_view>

#include "profile/vocabulary.h"
#include "store/row_inserter.h"
#include "store/sqlite_db.h"

namespace manicule::store {

class StoreVocabulary {
 public:
  StoreVocabulary(Database& db, std::int64_t settings_id);

  FeatureId id_of(std::string_view form) { return forms_.intern(form); }
  // ids[i] = id_of(file.form(i)) for each form of a file's vocabulary.
  void ids_of(const Vocabulary& file, std::vector<FeatureId>& ids) { forms_.intern_all(file, ids); }
  // Makes room for about `forms` forms in all (a guess; more still fit).
  void expect(std::size_t forms) { forms_.reserve(forms); }
  const Vocabulary& forms() const { return forms_; }
  // Hands the forms over (to an analysis in the same process); nothing is left to write.
  Vocabulary take_forms() && { return std::move(forms_); }
  // Inserts the forms interned since the last call.
  void write_new();

 private:
  std::int64_t settings_id_;
  RowInserter insert_;
  Vocabulary forms_;
  std::size_t stored_ = 0;
};

}  // namespace manicule::store
