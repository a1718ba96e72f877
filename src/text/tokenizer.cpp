#include "text/tokenizer.h"

#include <unicode/uchar.h>
#include <unicode/utf8.h>

#include "text/icu_word_breaker.h"
#include "text/latin_fast_path.h"
#include "text/normalise.h"
#include "text/stretch_planner.h"
#include "text/word_segment.h"

namespace manicule {

namespace {

bool starts_with_white_space(std::string_view piece) {
  UChar32 c = 0;
  int32_t i = 0;
  U8_NEXT(piece.data(), i, static_cast<int32_t>(piece.size()), c);
  return c >= 0 && u_isUWhiteSpace(c);
}

bool keeps(const TokenizerOptions& options, const WordSegment& segment,
           std::string_view piece) {
  if (is_word_status(segment.rule_status)) return true;
  if (is_number_status(segment.rule_status)) return options.keep_numbers;
  return options.keep_punctuation && !starts_with_white_space(piece);
}

}  // namespace

struct Tokenizer::Impl {
  explicit Impl(const TokenizerOptions& options) : normaliser(options) {}

  IcuWordBreaker breaker;
  TokenNormaliser normaliser;
  std::vector<WordSegment> segments;
  std::string latin_buffer;

  // Replaces `segments` with those of `text`: the Latin fast path's where it can, ICU's
  // elsewhere. With `letters_only` the fast path hands over only segments of letters
  // (what tokenize() keeps when numbers and punctuation are dropped).
  void segment(std::string_view text, std::string_view language, bool fast_path, bool letters_only) {
    segments.clear();
    if (!fast_path || !breaker.uses_root_rules(language)) {
      breaker.segment(text, 0, text.size(), language, segments);
      return;
    }
    segment_in_stretches(text, segments, letters_only, [&](std::size_t begin, std::size_t end) {
      breaker.segment(text, begin, end, language, segments);
    });
  }
};

Tokenizer::Tokenizer(TokenizerOptions options)
    : options_(options), impl_(std::make_unique<Impl>(options_)) {}

Tokenizer::~Tokenizer() = default;

const TokenizerOptions& Tokenizer::options() const { return options_; }

const std::vector<WordSegment>& Tokenizer::kept_segments(std::string_view text, std::string_view language) {
  Impl& impl = *impl_;
  const bool letters_only = !options_.keep_numbers && !options_.keep_punctuation;
  impl.segment(text, language, options_.fast_path, letters_only);
  std::size_t kept = 0;
  for (const WordSegment& segment : impl.segments) {
    if (keeps(options_, segment, text.substr(segment.begin, segment.end - segment.begin)))
      impl.segments[kept++] = segment;
  }
  impl.segments.resize(kept);
  return impl.segments;
}

std::string_view Tokenizer::normalise(std::string_view piece, SegmentForm form) {
  Impl& impl = *impl_;
  switch (form) {
    case SegmentForm::ascii_lower:
      return piece;
    case SegmentForm::ascii_capitals:
      return options_.case_fold ? fold_ascii_capitals(piece, impl.latin_buffer) : piece;
    case SegmentForm::latin:
      return latin_normalise(piece, options_.case_fold, options_.apostrophes, impl.latin_buffer);
    case SegmentForm::unknown:
      break;
  }
  return impl.normaliser.normalise(piece);
}

std::vector<std::string> Tokenizer::tokens(std::string_view text, std::string_view language) {
  std::vector<std::string> result;
  tokenize(text, language, [&](std::string_view token) { result.emplace_back(token); });
  return result;
}

std::vector<std::size_t> Tokenizer::word_boundaries(std::string_view text,
                                                    std::string_view language) {
  std::vector<std::size_t> boundaries;
  if (text.empty()) return boundaries;
  impl_->segment(text, language, options_.fast_path, false);
  boundaries.reserve(impl_->segments.size() + 1);
  boundaries.push_back(0);
  for (const WordSegment& segment : impl_->segments) boundaries.push_back(segment.end);
  return boundaries;
}

}  // namespace manicule
