// FeatureSpec: which units of a segment are counted as features.
//  - word:       each token (word unigrams, the default)
//  - word_ngram: n consecutive tokens of one segment, joined by one space
//  - char_ngram: n consecutive Unicode code points of the segment's tokens joined by single
//                spaces (the usual practice for character n-grams: a space marks a word
//                boundary, so n-grams can span two words)
// N-grams never cross a segment boundary.
#pragma once
#include <string>
#include <string_view>

namespace manicule {

enum class FeatureKind { word, word_ngram, char_ngram };

struct FeatureSpec {
  FeatureKind kind = FeatureKind::word;
  int n = 1;  // ignored for word; 1..kMaxNgram for n-grams
};

inline constexpr int kMaxNgram = 16;

// Throws Error(usage) unless n fits the kind.
void validate(const FeatureSpec& spec);

// "word", "word-ngram", "char-ngram" and back; parse throws Error(usage) on other names.
std::string_view feature_kind_name(FeatureKind kind);
FeatureKind parse_feature_kind(std::string_view name);

// A short label such as "word 3-grams", for reports.
std::string describe(const FeatureSpec& spec);

}  // namespace manicule
