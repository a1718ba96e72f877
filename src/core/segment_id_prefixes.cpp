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

// The last `parts` names of `path`, as written, extension and all: "c/x.tei".
std::string path_end_as_written(const std::string& path, std::size_t parts) {
  std::size_t start = path.size();
  for (std::size_t found = 0; found < parts && start > 0; ++found) {
    const std::size_t slash = path.find_last_of('/', start - 1);
    start = slash == std::string::npos ? 0 : slash;
    if (slash == std::string::npos) break;
  }
  std::string end = path.substr(start);
  while (!end.empty() && end.front() == '/') end.erase(0, 1);
  return well_formed_utf8(end.empty() ? path : end);
}

// Sets the prefixes of `group` to `end(path, parts)` for the fewest parts, from 2 on, that
// tell them apart, or else that give whole paths (a path has at most as many names as it
// has characters, so this ends). Returns whether they are apart.
template <class End>
bool shortest_distinct_ends(const std::vector<std::string>& paths, const std::vector<std::size_t>& group, End end,
                            std::vector<std::string>& prefixes) {
  for (std::size_t parts = 2;; ++parts) {
    std::set<std::string> seen;
    bool distinct = true, whole = true;
    for (std::size_t i : group) {
      prefixes[i] = end(paths[i], parts);
      distinct = seen.insert(prefixes[i]).second && distinct;
      whole = whole && prefixes[i] == end(paths[i], parts + 1);
    }
    if (distinct || whole) return distinct;
  }
}

// Files whose paths differ only in their extension (c/x.xml, c/x.tei) or in bytes that
// are not UTF-8 (each read as U+FFFD) share every end without their extension: such a
// group is told apart by the shortest ends with it, of one folder name at least as files
// of one name in sibling folders get ("c/x.xml", "c/x.tei"). What is still alike is
// numbered by keep_distinct_across_groups ("c/a\uFFFD.xml~2").
void keep_apart(const std::vector<std::string>& paths, const std::vector<std::size_t>& files,
                std::vector<std::string>& prefixes) {
  std::map<std::string, std::vector<std::size_t>> alike;
  for (std::size_t i : files) alike[prefixes[i]].push_back(i);
  for (const auto& [prefix, group] : alike)
    if (group.size() > 1) shortest_distinct_ends(paths, group, path_end_as_written, prefixes);
}

// An end made for one group may be another group's ("c/x.tei" for c/x.tei beside c/x.xml,
// and for c/x.tei.xml by its stem): of files sharing a prefix, the first in path order
// keeps it and each other takes the shortest end of its path, with its extension, that no
// file has, else a number.
void keep_distinct_across_groups(const std::vector<std::string>& paths, std::vector<std::string>& prefixes) {
  std::map<std::string, std::vector<std::size_t>> by_prefix;
  for (std::size_t i = 0; i < paths.size(); ++i) by_prefix[prefixes[i]].push_back(i);
  std::set<std::string> used;
  for (const auto& [prefix, files] : by_prefix) used.insert(prefix);
  for (auto& [prefix, files] : by_prefix) {
    if (files.size() < 2) continue;
    std::sort(files.begin(), files.end(), [&paths](std::size_t a, std::size_t b) { return paths[a] < paths[b]; });
    for (std::size_t k = 1; k < files.size(); ++k) {
      const std::string& path = paths[files[k]];
      std::string chosen;
      for (std::size_t parts = 1; chosen.empty(); ++parts) {
        const std::string end = path_end_as_written(path, parts);
        if (!used.count(end)) chosen = end;
        else if (end == path_end_as_written(path, parts + 1)) break;  // the whole path, and taken
      }
      for (std::size_t n = 2; chosen.empty(); ++n)
        if (!used.count(prefix + "~" + std::to_string(n))) chosen = prefix + "~" + std::to_string(n);
      used.insert(chosen);
      prefixes[files[k]] = chosen;
    }
  }
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
    // Longer ends of the paths until the group's are distinct; where whole paths are not,
    // the extensions too.
    if (!shortest_distinct_ends(paths, files, path_end, prefixes)) keep_apart(paths, files, prefixes);
  }
  keep_distinct_across_groups(paths, prefixes);
  return prefixes;
}

}  // namespace manicule
