#include "cli/analysis_options.h"

#include <string_view>

#include "cli/number_checks.h"
#include "cli/text_checks.h"
#include "core/error.h"
#include "core/regular_file.h"
#include "core/sha256.h"
#include "profile/stop_list.h"

namespace manicule::cli {

void AnalysisOptions::add_to(CLI::App& command, bool with_measure, bool with_neighbours) {
  command.add_option("--features", features, "what to count: word, word-ngram or char-ngram")
      ->check(CLI::IsMember({"word", "word-ngram", "char-ngram"}))
      ->capture_default_str();
  command.add_option("--n", n, "n for word-ngram and char-ngram features")->capture_default_str();
  command.add_option("--ranks", ranks, "frequency ranks of the features used, FIRST-LAST (e.g. 1-1000, 100-800)")
      ->capture_default_str();
  command.add_option("--culling", culling, "keep only features found in at least this % of segments (0-100)")
      ->capture_default_str();
  command.add_option("--stop-words", stop_words_file, "file of words to leave out, one per line ('#' comments)")
      ->check(not_blank());
  command.add_option("--min-tokens", min_tokens,
                     "leave out segments with fewer words (default 1500: Burrows 2002 found Delta fairly "
                     "reliable above about 1,500 words)")
      ->capture_default_str();
  if (with_measure) {
    std::vector<std::string> names;
    for (const auto& info : all_distance_measures()) names.emplace_back(info.name);
    command.add_option("--measure", measure, "distance measure")->check(CLI::IsMember(names))->capture_default_str();
  }
  if (with_measure && with_neighbours)
    command.add_option("--neighbours", neighbours, "nearest segments listed per segment")->capture_default_str();
}

void AnalysisOptions::apply_to(Request& request) const {
  request.features.kind = parse_feature_kind(features);
  // An n above 1 asks for n-grams: counting words alone instead would answer another question.
  if (n < 1) throw Error(ErrorKind::usage, "--n takes 1 or more (the length of an n-gram); got " + std::to_string(n));
  if (request.features.kind == FeatureKind::word && n != 1)
    throw Error(ErrorKind::usage, "--n " + std::to_string(n) +
                                      " counts n-grams: give --features word-ngram or char-ngram with it (words are "
                                      "counted one by one)");
  request.features.n = request.features.kind == FeatureKind::word ? 1 : n;
  validate(request.features);
  const std::string_view spec = ranks;
  const std::size_t dash = spec.find('-');
  if (dash == std::string_view::npos || !parse_digits(spec.substr(0, dash), request.feature_space.rank_first) ||
      !parse_digits(spec.substr(dash + 1), request.feature_space.rank_last))
    throw Error(ErrorKind::usage, "--ranks takes FIRST-LAST, e.g. 1-1000; got '" + ranks + "'");
  request.feature_space.culling_percent = culling;
  request.feature_space.min_segment_tokens = min_tokens;
  if (!stop_words_file.empty()) {
    const std::string text = read_regular_file(stop_words_file, "the stop list");  // read once: words and digest
    request.feature_space.stop_words = parse_stop_list(text);
    // Recorded with the results: the same list under the same name is known by its digest.
    request.feature_space.stop_words_source = stop_words_file + " (" +
                                              std::to_string(request.feature_space.stop_words.size()) +
                                              " words, SHA-256 " + sha256_hex(text) + ")";
  }
  request.measure = parse_distance_measure(measure);
  request.neighbours = neighbours;
}

}  // namespace manicule::cli
