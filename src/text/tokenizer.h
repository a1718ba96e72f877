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
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "text/tokenizer_options.h"

namespace manicule {

class Tokenizer {
 public:
  explicit Tokenizer(TokenizerOptions options = {});
  ~Tokenizer();
  Tokenizer(const Tokenizer&) = delete;
  Tokenizer& operator=(const Tokenizer&) = delete;

  // Calls sink(token) for each kept token of `text` (UTF-8), normalised, in text order.
  // The view passed to sink is valid only during that call.
  void tokenize(std::string_view text, std::string_view language,
                const std::function<void(std::string_view token)>& sink);

  // The kept tokens of `text`, normalised, in text order.
  std::vector<std::string> tokens(std::string_view text, std::string_view language);

  // UAX #29 word boundaries as byte offsets into `text`, ascending: 0, every boundary and
  // text.size() for non-empty text; none for empty text. The same boundaries tokenize uses
  // (fast path or ICU).
  std::vector<std::size_t> word_boundaries(std::string_view text, std::string_view language);

  const TokenizerOptions& options() const;

 private:
  struct Impl;
  TokenizerOptions options_;
  std::unique_ptr<Impl> impl_;
};

}  // namespace manicule
