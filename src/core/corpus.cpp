#include "core/corpus.h"

#include <algorithm>
#include <cerrno>
#include <filesystem>
#include <map>

#include "core/corpus_stream.h"
#include "core/error.h"
#include "core/file_reading.h"
#include "core/open_failure.h"
#include "core/segment_id_prefixes.h"
#include "profile/profile_builder.h"

namespace manicule {

namespace fs = std::filesystem;

namespace {

// Adds the files below `folder` whose names say TEI to `found`, folder by folder (symbolic
// links to folders are not followed; links to files are; hidden files and folders, named
// with a leading dot, are passed by). A folder that cannot be listed goes to `unlisted`,
// or, without it, stops the walk with an error naming it. Other regular files, and hidden
// entries, are counted in `left_aside`, when given.
void walk_folder(const fs::path& folder, std::vector<std::string>& found, std::vector<UnlistedFolder>* unlisted,
                 LeftAside* left_aside, const std::function<bool(const std::string&)>& counts) {
  // Counts `path` in `count`, keeping in `first` the first such path in path order.
  const auto tally = [&counts](const fs::path& path, std::size_t& count, std::string& first) {
    if (counts && !counts(path.string())) return;
    if (count++ == 0 || path.string() < first) first = path.string();
  };
  std::error_code ec;
  std::vector<fs::path> subfolders;
  for (fs::directory_iterator it(folder, ec); !ec && it != fs::directory_iterator(); it.increment(ec)) {
    std::error_code type_ec;  // set for a link to nothing or a loop of links
    const fs::path& path = it->path();
    const std::string name = path.filename().string();
    // Hidden by their names (.git, a Mac's ._letter.xml beside letter.xml): not the archive's.
    if (name.front() == '.') {
      if (left_aside) tally(path, left_aside->hidden, left_aside->first_hidden);
      continue;
    }
    if (it->is_directory(type_ec) && !it->is_symlink(type_ec)) {
      subfolders.push_back(path);
      continue;
    }
    if (!is_tei_file_name(name)) {
      if (left_aside && it->is_regular_file(type_ec)) tally(path, left_aside->count, left_aside->first);
      continue;
    }
    // Taken: regular files, and entries whose type cannot be told (a link to nothing, a loop
    // of links), which are the archive's files that cannot be read: reading them says why,
    // and a batch records that and goes on, instead of stopping or leaving them out unseen.
    // Passed by: named pipes and devices, which reading could wait on for ever.
    const bool regular = it->is_regular_file(type_ec);
    if (regular || type_ec) found.push_back(path.string());
  }
  if (ec) {
    if (!unlisted) {
      throw Error(ErrorKind::bad_input, std::string("cannot list the folder: ").append(ec.message()),
                  folder.string());
    }
    unlisted->push_back(UnlistedFolder{folder.string(), ec.message()});
  }
  for (const auto& sub : subfolders) walk_folder(sub, found, unlisted, left_aside, counts);
}

}  // namespace

bool is_tei_file_name(const std::string& name) {
  const auto ends_with = [&name](std::string_view ending) {
    if (name.size() <= ending.size()) return false;
    for (std::size_t i = 0; i < ending.size(); ++i) {
      char c = name[name.size() - ending.size() + i];
      if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
      if (c != ending[i]) return false;
    }
    return true;
  };
  return ends_with(".xml") || ends_with(".tei");
}

std::vector<std::string> expand_inputs(const std::vector<std::string>& inputs, std::vector<UnlistedFolder>* unlisted,
                                       LeftAside* left_aside, const std::function<bool(const std::string&)>& counts) {
  std::vector<std::string> files;
  for (const auto& input : inputs) {
    std::error_code ec;
    auto status = fs::status(input, ec);
    if (ec && ec != std::errc::no_such_file_or_directory) {  // a loop of links, say: reading it tells why
      files.push_back(input);
      continue;
    }
    if (ec || !fs::exists(status)) {
      std::error_code link_ec;
      const bool link = fs::is_symlink(fs::symlink_status(input, link_ec));
      throw Error(ErrorKind::bad_input, link ? open_failure_reason(input, ENOENT) : "no such file or folder", input);
    }
    if (fs::is_directory(status)) {
      std::vector<std::string> found;
      walk_folder(input, found, unlisted, left_aside, counts);
      std::sort(found.begin(), found.end());
      files.insert(files.end(), found.begin(), found.end());
    } else {
      files.push_back(input);
    }
  }
  return files;
}

std::string resolved_path(const std::string& path) {
  std::error_code ec;
  const fs::path absolute = fs::absolute(path, ec);
  return (ec ? fs::path(path) : absolute).lexically_normal().string();
}

namespace {

// Gives a file's segments ids that begin with `prefix` (segment_id_prefixes).
void use_id_prefix(FileReading& r, const std::string& prefix) {
  for (std::size_t i = 0; i < r.segments.size(); ++i) {
    std::string id = prefix + "#" + r.segments[i].segment.local_id;
    if (i < r.counts.segments.size()) r.counts.segments[i].id = id;
    r.segments[i].segment.id = std::move(id);
  }
}

}  // namespace

Corpus read_corpus(const Request& request, const std::vector<std::string>& files, const ProgressFn& progress) {
  // Files are read on all cores (read_files_streaming) and arrive here as they finish; each
  // is merged into the run's counts, in file order, as soon as it and every file before it
  // have arrived, and its own vocabulary freed: memory holds the merged counts and the few
  // files still waiting, not every file's vocabulary at once.
  if (files.empty()) {  // folders named, none holding a TEI file: say so, not "no segment"
    std::string named;
    for (const auto& input : request.inputs) named += (named.empty() ? "" : ", ") + input;
    throw Error(ErrorKind::nothing_selected, "no TEI file (*.xml, *.tei) found under " +
                                                 (named.empty() ? std::string("the inputs") : named));
  }
  Corpus corpus;
  corpus.files = files;
  ProfileBuilder merged(request.features);
  {
    // One file under two spellings would get two prefixes, and be compared with itself.
    std::map<std::string, std::string> spelled;  // resolved path -> first spelling
    for (const auto& file : files) {
      auto [first, added] = spelled.emplace(resolved_path(file), file);
      if (!added)
        throw Error(ErrorKind::usage, "the file " + file + " is named twice among the inputs" +
                                          (first->second == file ? "" : " (also as " + first->second + ")"));
    }
  }
  // The reader, which sees one file, begins its ids with the file's stem; files of one name
  // in several folders get longer prefixes here.
  const std::vector<std::string> prefixes = segment_id_prefixes(files);
  auto absorb = [&](std::size_t index, FileReading& r) {
    if (prefixes[index] != file_stem(r.file)) use_id_prefix(r, prefixes[index]);
    corpus.bytes += r.bytes;
    corpus.file_sha256.push_back(r.sha256);
    if (r.failed) {
      corpus.failures.push_back(std::move(r.failure));
      return;
    }
    if (request.keep_counts) {
      merged.merge(std::move(r.counts));
    } else {
      // The same refusal merge() makes, should two segments still share an id (a file named
      // twice among the inputs).
      for (const auto& s : r.segments) merged.claim_id(s.segment.id);
    }
    for (auto& s : r.segments) corpus.segments.push_back(std::move(s));
  };
  std::map<std::size_t, FileReading> waiting;
  std::size_t next_to_merge = 0, received = 0, bytes_done = 0;
  StreamOptions options;
  options.hash_failures = false;  // a failed file's digest is recorded as it was read, or ""
  read_files_streaming(request, files, options, [&](std::size_t index, FileReading&& reading) {
    bytes_done += reading.bytes;
    if (progress) progress(++received, files.size(), bytes_done);
    waiting.emplace(index, std::move(reading));
    for (auto it = waiting.find(next_to_merge); it != waiting.end(); it = waiting.find(++next_to_merge)) {
      absorb(next_to_merge, it->second);
      waiting.erase(it);
    }
  });
  corpus.counts = merged.finish();
  return corpus;
}

}  // namespace manicule
