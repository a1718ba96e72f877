#include "attribution/size_warnings.h"

#include <algorithm>

namespace manicule {

std::string with_thousands(std::size_t n) {
  std::string digits = std::to_string(n), out;
  for (std::size_t i = 0; i < digits.size(); ++i) {
    if (i > 0 && (digits.size() - i) % 3 == 0) out += ',';
    out += digits[i];
  }
  return out;
}

std::vector<std::string> questioned_size_warnings(std::size_t questioned_words,
                                                  const std::vector<std::size_t>& candidate_segment_words,
                                                  std::size_t reliable_words) {
  std::vector<std::string> out;
  if (questioned_words < reliable_words) {
    out.push_back("the questioned text has " + with_thousands(questioned_words) + " words, fewer than the about " +
                  with_thousands(reliable_words) +
                  " from which Eder (2015, DSH 30(2)) found attribution stable in most languages");
  }
  if (!candidate_segment_words.empty()) {
    std::vector<std::size_t> sizes = candidate_segment_words;
    std::nth_element(sizes.begin(), sizes.begin() + static_cast<std::ptrdiff_t>(sizes.size() / 2), sizes.end());
    const std::size_t median = sizes[sizes.size() / 2];
    if (questioned_words * 4 < median) {
      out.push_back("the questioned text (" + with_thousands(questioned_words) +
                    " words) is much shorter than the candidates' texts (median " + with_thousands(median) +
                    " words): its frequencies are noisier, which moves it away from every candidate");
    }
  }
  return out;
}

std::string quoted_candidate(const std::string& candidate) { return "candidate '" + candidate + "'"; }

std::string candidate_size_warning(const std::string& candidate, std::size_t words, std::size_t segments,
                                   std::size_t reliable_words) {
  if (words >= reliable_words) return {};
  return quoted_candidate(candidate) + " has little text: " + with_thousands(words) + " words in " +
         std::to_string(segments) + " segment(s), fewer than the about " + with_thousands(reliable_words) +
         " Eder (2015, DSH 30(2)) found needed";
}

}  // namespace manicule
