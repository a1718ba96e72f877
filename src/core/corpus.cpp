#include "core/corpus.h"

#include <algorithm>
#include <atomic>
#include <exception>
#include <filesystem>
#include <mutex>
#include <thread>

#include "core/error.h"
#include "core/file_reading.h"
#include "profile/profile_builder.h"
#include "text/tokenizer.h"

namespace manicule {

namespace fs = std::filesystem;

std::vector<std::string> expand_inputs(const std::vector<std::string>& inputs) {
  std::vector<std::string> files;
  for (const auto& input : inputs) {
    std::error_code ec;
    auto status = fs::status(input, ec);
    if (ec || !fs::exists(status)) throw Error(ErrorKind::bad_input, "no such file or folder", input);
    if (fs::is_directory(status)) {
      std::vector<std::string> found;
      for (auto it = fs::recursive_directory_iterator(input, fs::directory_options::skip_permission_denied, ec);
           it != fs::recursive_directory_iterator(); it.increment(ec)) {
        if (ec) break;
        if (it->is_regular_file() && it->path().extension() == ".xml") found.push_back(it->path().string());
      }
      std::sort(found.begin(), found.end());
      files.insert(files.end(), found.begin(), found.end());
    } else {
      files.push_back(input);
    }
  }
  return files;
}

Corpus read_corpus(const Request& request, const std::vector<std::string>& files, const ProgressFn& progress) {
  const SelectionRules rules = request.selection_rules();
  validate(request.features);
  unsigned threads = request.threads ? request.threads : std::max(1u, std::thread::hardware_concurrency());
  threads = std::min<unsigned>(threads, std::max<std::size_t>(1, files.size()));

  // Each file is merged into the run's counts as soon as it and every file before it are
  // read (file order is kept), and its own vocabulary freed: memory holds the merged
  // counts and the files still waiting, not every file's vocabulary at once.
  Corpus corpus;
  corpus.files = files;
  ProfileBuilder merged(request.features);
  std::vector<FileReading> results(files.size());
  std::vector<char> ready(files.size(), 0);
  std::size_t next_to_merge = 0;
  std::mutex merge_mutex;
  std::exception_ptr merge_error;
  auto absorb = [&](FileReading& r) {
    corpus.bytes += r.bytes;
    corpus.file_sha256.push_back(r.sha256);
    if (r.failed) {
      corpus.failures.push_back(std::move(r.failure));
    } else {
      merged.merge(r.counts);
      for (auto& s : r.segments) corpus.segments.push_back(std::move(s));
    }
    r = FileReading{};
  };

  std::atomic<std::size_t> next{0};
  std::atomic<std::size_t> done{0};
  std::atomic<std::size_t> bytes_done{0};
  std::mutex progress_mutex;
  auto worker = [&] {
    Tokenizer tokenizer(request.tokenizer);
    for (std::size_t i = next++; i < files.size(); i = next++) {
      results[i] = read_file(files[i], request, rules, tokenizer);
      bytes_done += results[i].bytes;
      {
        std::lock_guard<std::mutex> lock(merge_mutex);
        ready[i] = 1;
        try {
          while (!merge_error && next_to_merge < files.size() && ready[next_to_merge]) absorb(results[next_to_merge++]);
        } catch (...) {
          merge_error = std::current_exception();  // rethrown by the calling thread
        }
      }
      std::size_t d = ++done;
      if (progress) {
        std::lock_guard<std::mutex> lock(progress_mutex);
        progress(d, files.size(), bytes_done.load());
      }
    }
  };
  std::vector<std::thread> pool;
  for (unsigned t = 1; t < threads; ++t) pool.emplace_back(worker);
  worker();
  for (auto& t : pool) t.join();
  if (merge_error) std::rethrow_exception(merge_error);

  corpus.counts = merged.finish();
  return corpus;
}

}  // namespace manicule
