#include "core/corpus_stream.h"

#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <deque>
#include <exception>
#include <filesystem>
#include <mutex>
#include <thread>

#include "core/parallel_items.h"
#include "core/sha256.h"
#include "core/worker_start.h"
#include "text/tokenizer.h"

namespace manicule {

namespace {

// Finished files on their way from the workers to the sink, bounded.
class FinishedQueue {
 public:
  FinishedQueue(std::size_t capacity, std::size_t producers) : capacity_(capacity), producers_(producers) {}

  // False when the consumer has stopped: the producer should stop too.
  bool push(std::size_t index, FileReading&& reading) {
    std::unique_lock<std::mutex> lock(mutex_);
    room_.wait(lock, [&] { return stopped_ || items_.size() < capacity_; });
    if (stopped_) return false;
    items_.emplace_back(index, std::move(reading));
    ready_.notify_one();
    return true;
  }
  void producer_done() {
    std::lock_guard<std::mutex> lock(mutex_);
    --producers_;
    ready_.notify_one();
  }
  // False when every producer is done and nothing is left.
  bool pop(std::pair<std::size_t, FileReading>& out) {
    std::unique_lock<std::mutex> lock(mutex_);
    ready_.wait(lock, [&] { return !items_.empty() || producers_ == 0; });
    if (items_.empty()) return false;
    out = std::move(items_.front());
    items_.pop_front();
    room_.notify_one();
    return true;
  }
  void stop() {
    std::lock_guard<std::mutex> lock(mutex_);
    stopped_ = true;
    room_.notify_all();
  }
  bool stopped() {
    std::lock_guard<std::mutex> lock(mutex_);
    return stopped_;
  }

 private:
  std::mutex mutex_;
  std::condition_variable room_, ready_;
  std::deque<std::pair<std::size_t, FileReading>> items_;
  std::size_t capacity_;
  std::size_t producers_;
  bool stopped_ = false;
};

// Hashes the file first; a content the caller already holds is not parsed.
bool skip_known(const std::string& file, std::size_t index, const StreamOptions& options, FileReading& out) {
  if (index >= options.hash_first.size() || !options.hash_first[index] || !options.known) return false;
  std::string sha;
  try {
    sha = sha256_file(file);
  } catch (const std::exception&) {
    return false;  // parsing reports the error with its location
  }
  if (!options.known(index, sha)) return false;
  out.file = file;
  out.sha256 = sha;
  out.parsed = false;
  std::error_code ec;
  out.bytes = static_cast<std::size_t>(std::filesystem::file_size(file, ec));
  return true;
}

}  // namespace

void read_files_streaming(const Request& request, const std::vector<std::string>& files,
                          const StreamOptions& options, const FileSink& sink) {
  const SelectionRules rules = request.selection_rules();
  validate(request.features);
  if (files.empty()) return;
  const auto workers = static_cast<unsigned>(
      std::min<std::size_t>(resolve_thread_count(request.threads), files.size()));
  auto read_one = [&](std::size_t i, Tokenizer& tokenizer) {
    FileReading reading;
    if (!skip_known(files[i], i, options, reading)) {
      reading = read_file(files[i], request, rules, tokenizer);
      // A parse that stopped on an error gives no digest; the content is still worth a key.
      if (options.hash_failures && reading.failed && reading.sha256.empty()) {
        try {
          reading.sha256 = sha256_file(files[i]);
        } catch (const std::exception&) {
        }
      }
    }
    return reading;
  };

  if (workers == 1) {
    // One thread: read on the caller's. A worker would only add a hand-over per file (a
    // futex wake-up, which costs tens of microseconds on a virtual machine) and move each
    // reading's memory to another core's cache.
    Tokenizer tokenizer(request.tokenizer);
    for (std::size_t i = 0; i < files.size(); ++i) sink(i, read_one(i, tokenizer));
    return;
  }

  FinishedQueue queue(options.max_waiting ? options.max_waiting : 4 * workers, workers);
  std::atomic<std::size_t> next{0};

  auto work = [&] {
    on_worker_start();
    Tokenizer tokenizer(request.tokenizer);
    for (std::size_t i = next++; i < files.size(); i = next++) {
      if (queue.stopped()) break;
      if (!queue.push(i, read_one(i, tokenizer))) break;
    }
    queue.producer_done();
  };
  std::vector<std::thread> pool;
  for (unsigned t = 0; t < workers; ++t) pool.emplace_back(work);

  std::exception_ptr failure;
  std::pair<std::size_t, FileReading> item;
  while (queue.pop(item)) {
    if (failure) continue;  // drain so that no worker waits forever
    try {
      sink(item.first, std::move(item.second));
    } catch (...) {
      failure = std::current_exception();
      queue.stop();
    }
  }
  for (auto& t : pool) t.join();
  if (failure) std::rethrow_exception(failure);
}

}  // namespace manicule
