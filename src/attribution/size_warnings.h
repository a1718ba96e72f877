// Size warnings: where the texts are too small for attribution to be trusted.
// Eder (2015, "Does size matter? Authorship attribution, small samples, big problem",
// DSH 30(2): 167-182) found attribution by most frequent words stable from about 5,000
// words in most languages (2,500 for Latin prose); below that, results swing with the
// sample. We warn when
//  - the questioned text is below that size;
//  - a candidate's known texts together are below it ("little text");
//  - the questioned text is shorter than a quarter of the median size of the candidates'
//    segments: its frequencies are then much noisier than theirs, which pushes it away
//    from every candidate and favours those whose own segments are noisy.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

namespace manicule {

std::vector<std::string> questioned_size_warnings(std::size_t questioned_words,
                                                  const std::vector<std::size_t>& candidate_segment_words,
                                                  std::size_t reliable_words);

// How a warning quotes a candidate ("candidate '#p-pellow'"): one definition, so that the
// notes written into an edition can put the candidate's name in its place.
std::string quoted_candidate(const std::string& candidate);

std::string candidate_size_warning(const std::string& candidate, std::size_t words, std::size_t segments,
                                   std::size_t reliable_words);  // "" when large enough

// 12345 -> "12,345", for messages.
std::string with_thousands(std::size_t n);

}  // namespace manicule
