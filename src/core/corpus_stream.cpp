#include "core/corpus_stream.h"

#include <algorithm>
#include <atomic>
#include <deque>
#include <exception>
#include <filesystem>
#include <mutex>
#include <system_error>
#include <thread>

#include "core/parallel_items.h"
#include "core/sha256.h"
#include "core/worker_start.h"
#include "text/tokenizer.h"

namespace manicule {

namespace {

// Finished files on their way to the sink, which the workers call themselves, one at a
// time: a worker leaves the file it finished here and, unless another worker is in the
// sink already, hands over every file waiting. The sink has no thread of its own: on two
// cores such a third thread took turns with the two readers, at some 2,000 context
// switches for the plays, and freed each file's memory away from the thread that had
// allocated it (bench/RESULTS.md: context switches 2,144 to 226 without it; the plays'
// first run level in time, within a few per cent).
class FinishedFiles {
 public:
  FinishedFiles(const FileSink& sink, std::size_t most_waiting) : sink_(sink), most_waiting_(most_waiting) {}

  // Leaves a finished file, then hands over what waits if the sink is free; with more than
  // `most_waiting` files waiting, waits for the sink to be free to do so, which bounds the
  // memory files take while the sink is slower than the reading.
  void leave(std::size_t index, FileReading&& reading) {
    std::size_t waiting = 0;
    {
      std::lock_guard<std::mutex> lock(waiting_mutex_);
      waiting_.emplace_back(index, std::move(reading));
      waiting = waiting_.size();
    }
    if (waiting > most_waiting_) {
      std::lock_guard<std::mutex> lock(sink_mutex_);
      hand_over();
    } else if (sink_mutex_.try_lock()) {
      hand_over();
      sink_mutex_.unlock();
    }
  }
  // Hands over every file left so far (a worker's last step): a file left while another
  // worker was in the sink, just after it had looked, is not left behind.
  void hand_over_all() {
    std::lock_guard<std::mutex> lock(sink_mutex_);
    hand_over();
  }
  // True once the sink has thrown: the workers should stop after their current file.
  bool stopped() const { return stopped_.load(); }
  // What the sink threw, if it did (read once the workers have ended).
  std::exception_ptr failure() const { return failure_; }

 private:
  // With sink_mutex_ held. After the sink has thrown, the files still waiting are dropped.
  void hand_over() {
    for (;;) {
      std::pair<std::size_t, FileReading> item;
      {
        std::lock_guard<std::mutex> lock(waiting_mutex_);
        if (waiting_.empty()) return;
        item = std::move(waiting_.front());
        waiting_.pop_front();
      }
      if (failure_) continue;
      try {
        sink_(item.first, std::move(item.second));
      } catch (...) {
        failure_ = std::current_exception();
        stopped_ = true;
      }
    }
  }

  const FileSink& sink_;
  const std::size_t most_waiting_;
  std::mutex waiting_mutex_;  // guards waiting_
  std::mutex sink_mutex_;     // held by the worker in the sink; guards failure_
  std::deque<std::pair<std::size_t, FileReading>> waiting_;
  std::atomic<bool> stopped_{false};
  std::exception_ptr failure_;
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

  FinishedFiles finished(sink, options.max_waiting ? options.max_waiting : 4 * workers);
  std::atomic<std::size_t> next{0};

  auto work = [&] {
    on_worker_start();
    Tokenizer tokenizer(request.tokenizer);
    for (std::size_t i = next++; i < files.size() && !finished.stopped(); i = next++)
      finished.leave(i, read_one(i, tokenizer));
    finished.hand_over_all();
  };
  std::vector<std::thread> pool;
  for (unsigned t = 0; t < workers; ++t) {
    // A system that grants fewer threads than asked (a process limit) gets the work done by
    // those it granted, or by this thread when it grants none, rather than an abort.
    try {
      pool.emplace_back(work);
    } catch (const std::system_error&) {
      break;
    }
  }
  if (pool.empty()) work();
  for (auto& t : pool) t.join();
  if (finished.failure()) std::rethrow_exception(finished.failure());
}

}  // namespace manicule
