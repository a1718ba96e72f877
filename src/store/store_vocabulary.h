// The features of one settings in a store, kept in memory as a manicule::Vocabulary whose
// ids are the store's feature ids (0, 1, 2, ... in order of first storing), so mapping a
// file's counts to store ids needs no query. New forms get the next ids and are written by
// write_new() inside the caller's transaction; the store is locked for one writer, so ids
// never clash. After a rollback, make a new StoreVocabulary (reloads what was committed).
//
// On disk the forms are kept in blocks, a row of table `vocabulary_blocks` holding the
// forms of consecutive ids from `first_feature_id` as a JSON array of strings; the view
// `vocabulary` (settings_id, feature_id, form) opens them into a row each with SQLite's
// json_each. A row a form cost the plays' first run some 0.28 s of CPU for 245,000 forms;
// a block a file's new forms costs a few milliseconds.
#pragma once
#include <cstdint>
#include <functional>
#include <string>
#include <string_view>

#include "profile/vocabulary.h"
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
  Statement insert_;
  Vocabulary forms_;
  std::size_t stored_ = 0;
};

// Calls `each(id, form)` for every stored form of the settings, in id order. Throws
// Error(bad_input) naming the store when a block is damaged or ids do not follow on.
void for_each_stored_form(Database& db, std::int64_t settings_id,
                          const std::function<void(FeatureId, std::string_view)>& each);

// A block's text: the forms as a JSON array of strings (RFC 8259: '"', '\' and control
// characters escaped, every other byte as it is), and back (only what encode writes).
// Our own few lines rather than nlohmann::json, which the project uses elsewhere: a re-run
// that reads one changed file loads the whole vocabulary, and decoding the plays' 245,435
// forms took 6 ms here against 19 ms with nlohmann's SAX parser and 39 ms with its DOM
// (measured 2026-12-02). The view and Python's json module check the format in
// tests/cli/test_store_vocabulary.py.
std::string encode_form_block(const Vocabulary& forms, std::size_t first, std::size_t end);
bool decode_form_block(std::string_view json, const std::function<void(std::string_view)>& each);

}  // namespace manicule::store
