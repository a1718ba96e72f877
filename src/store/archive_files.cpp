#include "store/archive_files.h"

#include <sys/stat.h>

#include <filesystem>
#include <functional>

#include "core/corpus.h"
#include "core/sha256.h"
#include "core/whole_number.h"

namespace manicule::store {

namespace fs = std::filesystem;

std::optional<Shard> shard_from_text(std::string_view text) {
  Shard s;
  const std::size_t slash = text.find('/');
  if (slash == std::string_view::npos || !parse_digits(text.substr(0, slash), s.index) ||
      !parse_digits(text.substr(slash + 1), s.count))
    return std::nullopt;
  return s;
}

bool in_shard(const std::string& relative_path, const Shard& shard) {
  if (shard.count <= 1) return true;
  std::uint64_t h = std::stoull(sha256_hex(relative_path).substr(0, 16), nullptr, 16);
  return h % shard.count + 1 == shard.index;
}

bool stat_file(const std::string& path, std::uint64_t& size, std::int64_t& mtime_ns) {
  struct stat st {};
  if (::stat(path.c_str(), &st) != 0) return false;
  size = static_cast<std::uint64_t>(st.st_size);
  mtime_ns = static_cast<std::int64_t>(st.st_mtim.tv_sec) * 1000000000 + st.st_mtim.tv_nsec;
  return true;
}

namespace {

// `path`, found by walking `folder`, relative to it with '/' between names. The walk
// builds each path as the folder's own spelling, a separator and the names below it (never
// "." or ".."), so the part after that prefix is the answer; std::filesystem's lexical
// rule is kept for anything else (it costs microseconds a file: an unchanged archive's
// re-run is mostly such per-file costs).
std::string relative_to_folder(const std::string& path, const std::string& folder) {
  const bool ends_with_separator = !folder.empty() && folder.back() == '/';
  const std::size_t rest = folder.size() + (ends_with_separator ? 0 : 1);
  if (!folder.empty() && path.size() > rest && path.compare(0, folder.size(), folder) == 0 &&
      (ends_with_separator || path[folder.size()] == '/'))
    return path.substr(rest);
  return fs::path(path).lexically_relative(folder).generic_string();
}

}  // namespace

std::vector<ArchiveFile> list_archive_files(const std::vector<std::string>& inputs, const ArchiveFilter& filter,
                                            const Shard& shard, std::vector<UnlistedFolder>& unlisted,
                                            LeftAside& left_aside, std::vector<std::string>& empty_inputs) {
  std::vector<ArchiveFile> out;
  const FolderFilter in_folder(filter);
  for (const auto& input : inputs) {
    const bool folder = fs::is_directory(input);
    const auto relative_of = [&](const std::string& path) {
      return folder ? relative_to_folder(path, input) : fs::path(path).filename().string();
    };
    std::function<bool(const std::string&)> in_the_folder;  // for the files left aside
    if (!filter.folder.empty())
      in_the_folder = [&](const std::string& path) { return in_folder.holds(path, relative_of(path)); };
    const std::vector<std::string> found = expand_inputs({input}, &unlisted, &left_aside, in_the_folder);
    if (found.empty()) empty_inputs.push_back(input);
    for (const auto& path : found) {
      ArchiveFile f;
      f.path = path;
      f.relative_path = relative_of(path);
      if (!in_folder.holds(f.path, f.relative_path) || !in_shard(f.relative_path, shard)) continue;
      stat_file(f.path, f.size, f.mtime_ns);
      out.push_back(std::move(f));
    }
  }
  return out;
}

}  // namespace manicule::store
