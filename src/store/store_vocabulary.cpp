#include "store/store_vocabulary.h"

#include "core/error.h"

namespace manicule::store {

StoreVocabulary::StoreVocabulary(Database& db, std::int64_t settings_id)
    : settings_id_(settings_id), insert_(db, "INSERT INTO vocabulary (settings_id, feature_id, form)", 3) {
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
  for (std::size_t id = stored_; id < forms_.size(); ++id)
    insert_.add(settings_id_, id, forms_.form(static_cast<FeatureId>(id)));
  insert_.finish();
  stored_ = forms_.size();
}

}  // namespace manicule::store
