#include "profile/stop_list.h"

#include "core/error.h"
#include "core/regular_file.h"
#include "text/normalise.h"

namespace manicule {

std::vector<std::string> parse_stop_list(std::string_view text) {
  std::vector<std::string> words;
  while (!text.empty()) {
    const std::size_t end_of_line = text.find('\n');
    std::string_view line = text.substr(0, end_of_line);
    text = end_of_line == std::string_view::npos ? std::string_view{} : text.substr(end_of_line + 1);
    if (const std::size_t hash = line.find('#'); hash != std::string_view::npos) {
      line = line.substr(0, hash);
    }
    const std::size_t first = line.find_first_not_of(" \t\r");
    if (first == std::string_view::npos) continue;
    const std::size_t last = line.find_last_not_of(" \t\r");
    words.emplace_back(line.substr(first, last - first + 1));
  }
  return words;
}

std::vector<std::string> normalised_stop_words(const std::vector<std::string>& words, const TokenizerOptions& options) {
  TokenNormaliser normaliser(options);
  std::vector<std::string> out;
  out.reserve(words.size());
  for (const std::string& word : words) {
    const std::string_view normal = normaliser.normalise(word);
    if (!normal.empty()) out.emplace_back(normal);
  }
  return out;
}

std::vector<std::string> load_stop_list(const std::string& path) {
  return parse_stop_list(read_regular_file(path, "the stop list"));  // a pipe or a folder is refused
}

}  // namespace manicule
