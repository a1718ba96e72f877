#include "core/segment_id_prefixes.h"

#include <algorithm>
#include <cstddef>
#include <map>
#include <set>
#include <string_view>

#include "core/utf8_text.h"

namespace manicule {

namespace {

// The last `parts` names of `path` joined by '/' (the whole path as written when it has no
// more), the last one as file_stem gives it.
std::string path_end(const std::string& path, std::size_t parts) {
  std::vector<std::string_view> names;
  for (std::size_t at = 0; at <= path.size();) {
    const std::size_t slash = std::min(path.find('/', at), path.size());
    if (slash > at) names.push_back(std::string_view(path).substr(at, slash - at));
    at = slash + 1;
  }
  std::string end;
  if (parts >= names.size()) {
    end = path;
  } else {
    for (std::size_t i = names.size() - parts; i < names.size(); ++i) {
      if (!end.empty()) end += '/';
      end += names[i];
    }
  }
  const std::size_t slash = end.find_last_of('/');
  return slash == std::string::npos ? file_stem(end) : well_formed_utf8(end.substr(0, slash + 1)) + file_stem(end);
}

}  // namespace

std::string file_stem(const std::string& path) {
  const std::size_t slash = path.find_last_of('/');
  std::string base = slash == std::string::npos ? path : path.substr(slash + 1);
  const std::size_t dot = base.rfind('.');
  if (dot != std::string::npos && dot > 0) base.resize(dot);
  return well_formed_utf8(base);
}

std::vector<std::string> segment_id_prefixes(const std::vector<std::string>& paths) {
  std::vector<std::string> prefixes;
  std::map<std::string, std::vector<std::size_t>> by_stem;
  for (std::size_t i = 0; i < paths.size(); ++i) {
    prefixes.push_back(file_stem(paths[i]));
    by_stem[prefixes.back()].push_back(i);
  }
  for (const auto& [stem, files] : by_stem) {
    if (files.size() < 2) continue;
    // Longer ends of the paths until the group's are distinct (a path has at most as many
    // names as it has characters, so this ends).
    for (std::size_t parts = 2;; ++parts) {
      std::set<std::string> seen;
      bool distinct = true, whole = true;
      for (std::size_t i : files) {
        prefixes[i] = path_end(paths[i], parts);
        distinct = seen.insert(prefixes[i]).second && distinct;
        whole = whole && prefixes[i] == path_end(paths[i], parts + 1);
      }
      if (distinct || whole) break;
    }
  }
  return prefixes;
}

}  // namespace manicule
