#include "profile/feature_spec.h"

#include "core/error.h"

namespace manicule {

void validate(const FeatureSpec& spec) {
  if (spec.kind == FeatureKind::word) return;
  if (spec.n < 1 || spec.n > kMaxNgram) {
    throw Error(ErrorKind::usage, "n-gram length must be between 1 and " +
                                      std::to_string(kMaxNgram) + ", not " +
                                      std::to_string(spec.n));
  }
}

std::string_view feature_kind_name(FeatureKind kind) {
  switch (kind) {
    case FeatureKind::word: return "word";
    case FeatureKind::word_ngram: return "word-ngram";
    case FeatureKind::char_ngram: return "char-ngram";
  }
  return "word";
}

FeatureKind parse_feature_kind(std::string_view name) {
  for (FeatureKind kind : {FeatureKind::word, FeatureKind::word_ngram, FeatureKind::char_ngram}) {
    if (feature_kind_name(kind) == name) return kind;
  }
  throw Error(ErrorKind::usage, "unknown feature kind '" + std::string(name) +
                                    "' (expected word, word-ngram or char-ngram)");
}

std::string describe(const FeatureSpec& spec) {
  switch (spec.kind) {
    case FeatureKind::word: return "words";
    case FeatureKind::word_ngram: return "word " + std::to_string(spec.n) + "-grams";
    case FeatureKind::char_ngram: return "character " + std::to_string(spec.n) + "-grams";
  }
  return "words";
}

}  // namespace manicule
