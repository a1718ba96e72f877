#include "store/archive_filter.h"

#include <fnmatch.h>

#include <algorithm>
#include <cctype>

namespace manicule::store {

namespace {

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

// "./a/b/" -> "a/b"
std::string tidy_folder(std::string f) {
  while (f.size() > 1 && f.back() == '/') f.pop_back();
  while (f.rfind("./", 0) == 0) f.erase(0, 2);
  return f;
}

}  // namespace

bool starts_with_folder(const std::string& path, const std::string& folder) {
  return path.size() > folder.size() && path.compare(0, folder.size(), folder) == 0 &&
         (folder.back() == '/' || path[folder.size()] == '/');
}

bool ArchiveFilter::selects_by_header() const {
  return !author.empty() || year_from || year_to || !language.empty() || !title.empty();
}

std::string ArchiveFilter::describe() const {
  std::string out;
  auto add = [&](const std::string& part) { out += (out.empty() ? "" : " ") + part; };
  if (!folder.empty()) add("folder=" + folder);
  if (!author.empty()) add("author~" + author);
  if (year_from || year_to)
    add("year=" + (year_from ? std::to_string(year_from) : std::string()) + "-" +
        (year_to ? std::to_string(year_to) : std::string()));
  if (!language.empty()) add("language=" + language);
  if (!title.empty()) add("title=" + title);
  return out;
}

bool in_folder(const ArchiveFilter& filter, const std::string& path, const std::string& relative_path) {
  if (filter.folder.empty()) return true;
  std::string folder = tidy_folder(filter.folder);
  std::string tidy_path = path;
  while (tidy_path.rfind("./", 0) == 0) tidy_path.erase(0, 2);
  return starts_with_folder(relative_path, folder) || starts_with_folder(tidy_path, folder);
}

bool language_matches(const ArchiveFilter& filter, const std::string& language) {
  return filter.language.empty() || lower(filter.language) == lower(language);
}

bool header_matches(const ArchiveFilter& filter, const FileMetadata& m, bool check_language) {
  if (!filter.author.empty() && lower(m.author).find(lower(filter.author)) == std::string::npos) return false;
  if ((filter.year_from || filter.year_to) && m.year == 0) return false;
  if (filter.year_from && m.year < filter.year_from) return false;
  if (filter.year_to && m.year > filter.year_to) return false;
  if (!filter.title.empty() && fnmatch(filter.title.c_str(), m.title.c_str(), FNM_CASEFOLD) != 0) return false;
  if (check_language && !language_matches(filter, m.language)) return false;
  return true;
}

}  // namespace manicule::store
