// Tokenizer speed: MB/s of the ICU path and of the Latin fast path on real text.
//
// Reads the TEI files named on the command line (default: a few plays and novels from
// ../shared/corpora, relative to the project root), strips the tags crudely, and times
// Tokenizer::tokenize and Tokenizer::word_boundaries on the whole text with fast_path off
// and on, best of three runs. Build and run: see the tokenizer section of bench/RESULTS.md.
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

#include "../tests/unit/test_tokenizer_support.h"
#include "text/stretch_planner.h"
#include "text/tokenizer.h"

using namespace manicule;

namespace {

struct Text {
  std::string language;
  std::string content;
};

template <typename Work>
double best_seconds(Work work) {
  double best = 1e300;
  for (int run = 0; run < 3; ++run) {
    const auto start = std::chrono::steady_clock::now();
    work();
    const std::chrono::duration<double> took = std::chrono::steady_clock::now() - start;
    best = std::min(best, took.count());
  }
  return best;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::string> files;
  for (int i = 1; i < argc; ++i) files.push_back(argv[i]);
  if (files.empty()) {
    files = {"../shared/corpora/gerdracor/goethe-faust-eine-tragoedie.xml",
             "../shared/corpora/gerdracor/schiller-die-raeuber.xml",
             "../shared/corpora/gerdracor/lessing-emilia-galotti.xml",
             "../shared/corpora/gerdracor/buechner-dantons-tod.xml",
             "../shared/corpora/eltec-eng/ENG18471_Bronte.xml",
             "../shared/corpora/eltec-eng/ENG18610_Eliot.xml",
             "../shared/corpora/eltec-eng/ENG18400_Trollope.xml"};
  }
  std::vector<Text> texts;
  std::size_t bytes = 0;
  std::size_t fast_bytes = 0;
  std::vector<TextStretch> stretches;
  for (const std::string& file : files) {
    bool ok = false;
    const std::string xml = test::read_whole_file(file, ok);
    if (!ok) {
      std::fprintf(stderr, "cannot read %s\n", file.c_str());
      return 1;
    }
    const bool english = file.find("eltec-eng") != std::string::npos;
    texts.push_back({english ? "en" : "de", test::crude_text_of(xml)});
    bytes += texts.back().content.size();
    plan_stretches(texts.back().content, stretches);
    for (const TextStretch& stretch : stretches) {
      if (stretch.fast) fast_bytes += stretch.end - stretch.begin;
    }
  }
  const double megabytes = static_cast<double>(bytes) / 1e6;
  std::printf("%zu files, %.2f MB of text, %.1f%% of it in fast-path stretches\n",
              texts.size(), megabytes, 100.0 * static_cast<double>(fast_bytes) / bytes);

  for (const bool fast_path : {false, true}) {
    TokenizerOptions options;
    options.fast_path = fast_path;
    Tokenizer tokenizer(options);
    std::size_t tokens = 0;
    const double tokenize_seconds = best_seconds([&] {
      tokens = 0;
      for (const Text& text : texts) {
        tokenizer.tokenize(text.content, text.language, [&](std::string_view) { ++tokens; });
      }
    });
    const double boundary_seconds = best_seconds([&] {
      for (const Text& text : texts) tokenizer.word_boundaries(text.content, text.language);
    });
    std::printf("%-9s tokenize %7.1f MB/s (%zu tokens)   word_boundaries %7.1f MB/s\n",
                fast_path ? "fast path" : "ICU", megabytes / tokenize_seconds, tokens,
                megabytes / boundary_seconds);
  }
  return 0;
}
