#include "store/file_rows.h"

namespace manicule::store {

std::set<std::string> stored_file_paths(Database& db) {
  std::set<std::string> paths;
  Statement files = db.prepare("SELECT path FROM files");
  while (files.step()) paths.insert(files.text_at(0));
  return paths;
}

void remove_files(Database& db, const std::set<std::string>& paths) {
  Statement remove = db.prepare("DELETE FROM files WHERE path = ?1");
  for (const std::string& path : paths) remove.run(path);
}

}  // namespace manicule::store
