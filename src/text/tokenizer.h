// Tokenizer: UTF-8 text in one language -> normalised word tokens.
//
// Words are UAX #29 word segments as ICU's word BreakIterator finds them for the language
// (BCP 47 tag; ICU locale from its primary subtag and script, root when unknown). A
// segment is a token when its rule status is letter, kana or ideographic, or number
// when keep_numbers is on; other segments (punctuation, symbols) only with keep_punctuation,
// white space never. Each token is normalised as TokenNormaliser says (NFC, typographic
// options, full case folding, NFC). Text made of ASCII, Latin-1 and common punctuation
// takes the Latin fast path, which gives the same result (tests/unit/test_tokenizer_*).
//
// Not thread-safe: use one Tokenizer per thread. It caches one ICU BreakIterator per
// language and keeps no state between calls that could change a result.
#pragma once
#include <cstddef>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "text/tokenizer_options.h"
#include "text/word_segment.h"

namespace manicule {

class Tokenizer {
 public:
  explicit Tokenizer(TokenizerOptions options = {});
  ~Tokenizer();
  Tokenizer(const Tokenizer&) = delete;
  Tokenizer& operator=(const Tokenizer&) = delete;

  // Calls sink(token) for each kept token of `text` (UTF-8), normalised, in text order.
  // The view passed to sink is valid only during that call. A template so that the
  // per-token call inlines: a play corpus has some ten million tokens.
  template <typename Sink>
  void tokenize(std::string_view text, std::string_view language, Sink&& sink) {
    for (const WordSegment& segment : kept_segments(text, language)) {
      const std::string_view piece = text.substr(segment.begin, segment.end - segment.begin);
      if (segment.form == SegmentForm::ascii_lower) {
        sink(piece);
        continue;
      }
      // Normalising can leave nothing of a segment of invisible characters alone.
      const std::string_view token = normalise(piece, segment.form);
      if (!token.empty()) sink(token);
    }
  }

  // The kept tokens of `text`, normalised, in text order.
  std::vector<std::string> tokens(std::string_view text, std::string_view language);

  // UAX #29 word boundaries as byte offsets into `text`, ascending: 0, every boundary and
  // text.size() for non-empty text; none for empty text. The same boundaries tokenize uses
  // (fast path or ICU).
  std::vector<std::size_t> word_boundaries(std::string_view text, std::string_view language);

  const TokenizerOptions& options() const;

 private:
  // The segments of `text` that make tokens, in text order (valid until the next call).
  const std::vector<WordSegment>& kept_segments(std::string_view text, std::string_view language);
  // A kept segment's text, normalised; a view valid until the next call.
  std::string_view normalise(std::string_view piece, SegmentForm form);

  struct Impl;
  TokenizerOptions options_;
  std::unique_ptr<Impl> impl_;
};

}  // namespace manicule
