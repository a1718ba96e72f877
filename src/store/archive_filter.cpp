#include "store/archive_filter.h"

#include <cstdlib>
#include <filesystem>
#include <set>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/segment.h"
#include "text/caseless_match.h"
#include "text/language_tags.h"

namespace manicule::store {

namespace {

// "./a/b/" -> "a/b"
std::string tidy_folder(std::string f) {
  while (f.size() > 1 && f.back() == '/') f.pop_back();
  while (f.rfind("./", 0) == 0) f.erase(0, 2);
  return f;
}

// The words of an --author text: split at spaces, commas and semicolons.
std::vector<std::string_view> author_words(std::string_view wanted) {
  std::vector<std::string_view> words;
  for (std::size_t start = 0; start < wanted.size();) {
    std::size_t end = wanted.find_first_of(kAuthorWordSeparators, start);
    if (end == std::string_view::npos) end = wanted.size();
    if (end > start) words.push_back(wanted.substr(start, end - start));
    start = end + 1;
  }
  return words;
}

// Each word of `wanted` is a whole word of `author`, in any order: "Mara Tide" finds "Tide,
// Mara [pseud.]", as catalogues invert names, and "Kind" does not find "Wendekind".
// (to_filter refuses a text without a word.)
bool one_author_matches(std::string_view author, const std::string& wanted) {
  const std::vector<std::string_view> words = author_words(wanted);
  for (std::string_view word : words)
    if (!caseless_contains_word(author, word)) return false;
  return !words.empty();
}

// One of the authors (joined by kAuthorSeparator, join_authors) holds every word: "Anna
// Schmidt" does not find "Anna Müller; Karl Schmidt".
bool author_matches(const std::string& authors, const std::string& wanted) {
  std::size_t start = 0;
  while (true) {
    const std::size_t end = authors.find(kAuthorSeparator, start);
    if (one_author_matches(std::string_view(authors).substr(start, end - start), wanted)) return true;
    if (end == std::string::npos) return false;
    start = end + kAuthorSeparator.size();
  }
}

// The working folder's spellings: as the system resolves it, and as the shell spells it
// ($PWD, which keeps the links it was reached through) where that names the same folder
// otherwise.
std::vector<std::filesystem::path> working_folder_spellings() {
  std::vector<std::filesystem::path> out{std::filesystem::current_path()};
  std::error_code ec;
  const char* pwd = std::getenv("PWD");
  if (pwd && *pwd == '/' && std::filesystem::path(pwd) != out.front() && std::filesystem::equivalent(pwd, ".", ec))
    out.emplace_back(pwd);
  return out;
}

// `path` made absolute against `working_folder` and lexically normal: "a/./b/../c" against
// "/home/ed" gives "/home/ed/a/c".
std::string absolute_spelling(const std::string& path, const std::filesystem::path& working_folder) {
  std::filesystem::path p(path);
  if (p.is_relative()) p = working_folder / p;
  std::string out = p.lexically_normal().string();
  while (out.size() > 1 && out.back() == '/') out.pop_back();
  return out;
}

}  // namespace

bool starts_with_folder(const std::string& path, const std::string& folder) {
  return path.size() > folder.size() && path.compare(0, folder.size(), folder) == 0 &&
         (folder.back() == '/' || path[folder.size()] == '/');
}

bool ArchiveFilter::selects_by_header() const {
  return !author.empty() || asks_years() || !language.empty() || !title.empty();
}

std::string ArchiveFilter::describe() const {
  std::string out;
  auto add = [&](const std::string& part) { out += (out.empty() ? "" : " ") + part; };
  if (!folder.empty()) add("folder=" + folder);
  if (!author.empty()) add("author~" + author);
  // As --years spells them, so that the record can be given again and is read one way:
  // 44BCE, not -44; early years of the common era with their era (year=-44CE: up to 44).
  const auto year_text = [](int year) {
    if (year == 0) return std::string();
    if (year < 0) return std::to_string(-year) + "BCE";
    return std::to_string(year) + (year < 1000 ? "CE" : "");
  };
  if (asks_years()) add("year=" + year_text(year_from) + "-" + year_text(year_to));
  if (!language.empty()) add("language=" + language);
  if (!title.empty()) add("title=" + title);
  return out;
}

std::string ArchiveFilter::question_key() const {
  if (!selects_by_header()) return {};  // as describe() gave it: keys of unfiltered analyses kept
  std::set<std::string> words;
  for (std::string_view word : author_words(author)) words.insert(caseless_form(word));
  const std::string tag = canonical_language_tag(language);
  // A structured value, not a sentence: an author word may read "year=1870-1870".
  const nlohmann::json question = {{"author", words},
                                   {"years", {year_from, year_to}},
                                   {"language", tag.empty() ? language : tag},
                                   {"title", caseless_form(title)}};
  return question.dump();
}

bool ArchiveFilter::year_matches(int year) const { return years_overlap(year, year); }

bool ArchiveFilter::years_overlap(int first, int last) const {
  if (!asks_years()) return true;
  return first != 0 && (!year_from || last >= year_from) && (!year_to || first <= year_to);
}

FolderFilter::FolderFilter(const ArchiveFilter& filter) : given_(filter.folder) {
  if (given_.empty()) return;
  folder_ = tidy_folder(given_);
  // A bare name ("de", "de/") is a folder below an input, or an input given in that very
  // spelling; not also a folder de that happens to lie below the working folder. A path
  // from the working folder ("./x", "../arch/de", "/data/arch/de", "." or "..") is that
  // folder alone. Anything else with a '/' ("arch/de", "1850/letters") may be below an
  // input, or a path in any spelling.
  from_working_folder_ = given_ == "." || given_ == ".." || given_.rfind("./", 0) == 0 ||
                         given_.rfind("../", 0) == 0 || given_.front() == '/';
  bare_name_ = !from_working_folder_ && folder_.find('/') == std::string::npos;
  if (bare_name_) return;
  // The folder made absolute against the working folder, in each of its spellings, with
  // what a relative stored path is relative to: where batch ran (stored_paths_base), else
  // that same working folder.
  for (const auto& working_folder : working_folder_spellings())
    absolute_.push_back({absolute_spelling(given_, working_folder),
                         filter.stored_paths_base.empty() ? working_folder
                                                          : std::filesystem::path(filter.stored_paths_base)});
  std::error_code ec;
  const auto resolved = std::filesystem::weakly_canonical(absolute_.front().first, ec);
  if (!ec) resolved_ = absolute_spelling(resolved.string(), "/");
}

bool FolderFilter::holds(const std::string& path, const std::string& relative_path) const {
  if (given_.empty()) return true;
  std::string tidy_path = path;
  while (tidy_path.rfind("./", 0) == 0) tidy_path.erase(0, 2);
  if (!from_working_folder_ && (starts_with_folder(relative_path, folder_) || starts_with_folder(tidy_path, folder_)))
    return true;
  // Both absolute and tidied, without reading the disk: "/data/arch/de" for "arch/de",
  // "arch/x/../de", a folder reached through a link.
  std::string absolute;  // against the first base, for the test through links below
  for (const auto& [folder, base] : absolute_) {
    const std::string spelled = absolute_spelling(path, base);
    if (starts_with_folder(spelled, folder)) return true;
    if (absolute.empty()) absolute = spelled;
  }
  // Through links: the path's folder resolved (once for all the files in it) against the
  // folder resolved.
  if (resolved_.empty() || absolute.empty()) return false;
  const std::size_t slash = absolute.rfind('/');
  if (slash == std::string::npos) return false;
  const std::string parent = slash == 0 ? "/" : absolute.substr(0, slash);
  auto known = resolved_parents_.find(parent);
  if (known == resolved_parents_.end()) {
    std::error_code ec;
    const auto resolved = std::filesystem::weakly_canonical(parent, ec);
    known = resolved_parents_.emplace(parent, ec ? parent : absolute_spelling(resolved.string(), "/")).first;
  }
  const std::string resolved_path = (known->second == "/" ? "" : known->second) + absolute.substr(slash);
  return starts_with_folder(resolved_path, resolved_);
}

bool header_matches(const ArchiveFilter& filter, const FileMetadata& m) {
  return text_matches(filter, TextHeading{m.title, m.author, {}, 0});
}

bool text_matches(const ArchiveFilter& filter, const TextHeading& text) {
  if (!filter.author.empty() && !author_matches(text.author, filter.author)) return false;
  if (filter.title.empty() || caseless_pattern_match(filter.title, text.title)) return true;
  for (const std::string& title : text.collection_titles)
    if (caseless_pattern_match(filter.title, title)) return true;
  return false;
}

}  // namespace manicule::store
