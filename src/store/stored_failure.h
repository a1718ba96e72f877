// A failing file's message as the store keeps it. A reading belongs to a content (its
// SHA-256), which may lie under several paths, or under another path by the next run (a
// copy, a rename); so the path the message began with is not stored, only what follows it
// (":12:7: ..." or ": ..."), and each file's own path is put back when it is reported.
// Messages stored whole by earlier versions are given as they are.
#pragma once
#include <string>

namespace manicule::store {

// `message` without its leading `path` where it begins with "path:".
std::string failure_to_store(const std::string& message, const std::string& path);
// A stored failure as it reads for the file at `path`.
std::string failure_for(const std::string& stored, const std::string& path);
// (store_schema.cpp's file_list view applies the same rule in SQL.)

}  // namespace manicule::store
