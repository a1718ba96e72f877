#include "store/store_vocabulary.h"

#include <string>

#include "core/error.h"

namespace manicule::store {

namespace {

// Rows per multi-row INSERT: one statement run per row cost some 0.8 us a form, and an
// archive's first run stores hundreds of thousands of forms.
constexpr std::size_t kRowsPerInsert = 64;

std::string insert_rows_sql(std::size_t rows) {
  std::string sql = "INSERT INTO vocabulary (settings_id, feature_id, form) VALUES ";
  for (std::size_t i = 0; i < rows; ++i) sql += i ? ", (?, ?, ?)" : "(?, ?, ?)";
  return sql;
}

}  // namespace

StoreVocabulary::StoreVocabulary(Database& db, std::int64_t settings_id)
    : settings_id_(settings_id),
      insert_(db.prepare(insert_rows_sql(1))),
      insert_many_(db.prepare(insert_rows_sql(kRowsPerInsert))) {
  Statement all = db.prepare("SELECT feature_id, form FROM vocabulary WHERE settings_id = ?1 ORDER BY feature_id");
  all.bind(1, settings_id);
  while (all.step()) {
    FeatureId id = forms_.intern(all.blob_at(1));
    if (static_cast<std::int64_t>(id) != all.int64_at(0))
      throw Error(ErrorKind::bad_input, "the store " + db.path() + " has a damaged vocabulary (feature " +
                                            std::to_string(all.int64_at(0)) + ")");
  }
  stored_ = forms_.size();
}

void StoreVocabulary::write_new() {
  std::size_t id = stored_;
  for (; id + kRowsPerInsert <= forms_.size(); id += kRowsPerInsert) {
    for (std::size_t row = 0; row < kRowsPerInsert; ++row) {
      const int first = static_cast<int>(3 * row);
      insert_many_.bind(first + 1, settings_id_)
          .bind(first + 2, static_cast<std::int64_t>(id + row))
          .bind(first + 3, forms_.form(static_cast<FeatureId>(id + row)));
    }
    insert_many_.step_to_end();
  }
  for (; id < forms_.size(); ++id)
    insert_.run(settings_id_, static_cast<std::int64_t>(id), forms_.form(static_cast<FeatureId>(id)));
  stored_ = forms_.size();
}

}  // namespace manicule::store
