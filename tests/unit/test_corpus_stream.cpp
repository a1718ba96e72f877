// Unit tests for read_files_streaming (core/corpus_stream.h): the promises its header makes
// to a sink, checked against files written here with a known number of words each.
//  - every file reaches the sink once, under its own index, and was read whole;
//  - the sink is never called twice at once, although the workers call it themselves;
//  - a sink that throws stops the reading: the exception reaches the caller, and the
//    sink is called no more.
// The word counts are those the test writes (plain ASCII words separated by spaces, which
// UAX #29 rules WB3d and WB999 split at each space and nowhere else).
#include <catch2/catch.hpp>

#include <atomic>
#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

#include "core/corpus_stream.h"

namespace fs = std::filesystem;
using manicule::FileReading;
using manicule::Request;

namespace {

// A folder of small TEI files, file i holding i + 3 words; removed at the end.
struct StreamFixture {
  fs::path folder;
  std::vector<std::string> files;
  std::vector<std::size_t> words;

  explicit StreamFixture(std::size_t count) {
    std::string pattern = (fs::temp_directory_path() / "manicule-stream-XXXXXX").string();
    REQUIRE(mkdtemp(pattern.data()) != nullptr);
    folder = pattern;
    for (std::size_t i = 0; i < count; ++i) {
      const fs::path path = folder / ("letter-" + std::to_string(i) + ".xml");
      std::ofstream out(path);
      out << "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\"><teiHeader><fileDesc><titleStmt><title>Letter "
          << i << "</title></titleStmt><publicationStmt><p>test</p></publicationStmt><sourceDesc><p>test</p>"
          << "</sourceDesc></fileDesc></teiHeader><text><body><p>";
      for (std::size_t w = 0; w < i + 3; ++w) out << (w ? " " : "") << "ferry";
      out << "</p></body></text></TEI>\n";
      files.push_back(path.string());
      words.push_back(i + 3);
    }
  }
  ~StreamFixture() {
    std::error_code ec;
    fs::remove_all(folder, ec);
  }
};

Request two_threads() {
  Request request;
  request.unit = "whole";
  request.threads = 2;
  return request;
}

}  // namespace

TEST_CASE("streaming: every file reaches the sink once, read whole", "[corpus_stream]") {
  const StreamFixture fixture(40);
  std::vector<int> calls(fixture.files.size(), 0);
  std::vector<std::size_t> tokens(fixture.files.size(), 0);
  std::vector<std::string> names(fixture.files.size());
  manicule::read_files_streaming(two_threads(), fixture.files, {}, [&](std::size_t i, FileReading&& reading) {
    ++calls[i];
    names[i] = reading.file;
    for (const auto& s : reading.segments) tokens[i] += s.tokens;
  });
  for (std::size_t i = 0; i < fixture.files.size(); ++i) {
    CHECK(calls[i] == 1);
    CHECK(names[i] == fixture.files[i]);
    CHECK(tokens[i] == fixture.words[i]);
  }
}

TEST_CASE("streaming: the sink is called one file at a time", "[corpus_stream]") {
  const StreamFixture fixture(40);
  // Atomics throughout: if the sink were entered twice at once, these counters would be
  // written by two threads, and the checks must still read them soundly.
  std::atomic<int> inside{0};
  std::atomic<int> most_inside{0};
  std::atomic<int> overlaps{0};
  std::atomic<std::size_t> handed{0};
  manicule::read_files_streaming(two_threads(), fixture.files, {}, [&](std::size_t, FileReading&&) {
    const int now = inside.fetch_add(1) + 1;
    if (now > 1) ++overlaps;
    for (int seen = most_inside.load(); now > seen && !most_inside.compare_exchange_weak(seen, now);) {
    }
    // Long enough that the other worker finishes a file meanwhile, and tries to come in.
    std::this_thread::sleep_for(std::chrono::milliseconds(2));
    ++handed;
    inside.fetch_sub(1);
  });
  CHECK(overlaps.load() == 0);
  CHECK(most_inside.load() == 1);
  CHECK(handed.load() == fixture.files.size());
}

TEST_CASE("streaming: a sink that throws stops the reading", "[corpus_stream]") {
  const StreamFixture fixture(40);
  std::atomic<int> calls{0};
  std::atomic<int> calls_after_throw{0};
  std::atomic<bool> thrown{false};
  CHECK_THROWS_AS(manicule::read_files_streaming(two_threads(), fixture.files, {},
                                                 [&](std::size_t, FileReading&&) {
                                                   if (thrown) ++calls_after_throw;
                                                   if (++calls == 5) {
                                                     thrown = true;
                                                     throw std::runtime_error("the store is full");
                                                   }
                                                 }),
                  std::runtime_error);
  CHECK(calls.load() == 5);
  CHECK(calls_after_throw.load() == 0);
}
