#include "store/file_stems.h"

#include <string>
#include <vector>

#include "core/segment_id_prefixes.h"

namespace manicule::store {

void refresh_file_stems(Database& db) {
  std::vector<std::string> paths, stems;
  Statement files = db.prepare("SELECT path, stem FROM files ORDER BY path");
  while (files.step()) {
    paths.push_back(files.text_at(0));
    stems.push_back(files.text_at(1));
  }
  files.reset();
  const std::vector<std::string> prefixes = segment_id_prefixes(paths);
  Statement update = db.prepare("UPDATE files SET stem = ?2 WHERE path = ?1");
  for (std::size_t i = 0; i < paths.size(); ++i) {
    if (prefixes[i] == stems[i]) continue;
    update.bind(1, paths[i]).bind(2, prefixes[i]);
    update.step_to_end();
  }
}

}  // namespace manicule::store
