// TokenNormaliser: the reference normalisation of one token, done by ICU, in this order:
//   1. NFC (Normalizer2),
//   2. invisible characters (Default_Ignorable_Code_Point) dropped, then U+202F (and, with
//      the apostrophe option, U+02BC) dropped at either end; the token may end up empty,
//   3. the typographic options: long s, ligatures, apostrophe look-alikes (they map
//      characters to plain letters or U+0027 and never need a canonical reordering),
//   4. full case folding (CaseFolding.txt statuses C and F, U_FOLD_CASE_DEFAULT),
//   5. NFC again when 2-4 left the text not in NFC (a ligature before a combining mark).
// Ill-formed UTF-8 reads as U+FFFD. Not thread-safe: it keeps working buffers.
#pragma once
#include <memory>
#include <string>
#include <string_view>

#include "text/tokenizer_options.h"

namespace manicule {

class TokenNormaliser {
 public:
  explicit TokenNormaliser(const TokenizerOptions& options);
  ~TokenNormaliser();
  TokenNormaliser(const TokenNormaliser&) = delete;
  TokenNormaliser& operator=(const TokenNormaliser&) = delete;

  // The normalised token, as a view valid until the next call.
  std::string_view normalise(std::string_view token);

 private:
  struct Buffers;
  TokenizerOptions options_;
  std::unique_ptr<Buffers> buffers_;
};

}  // namespace manicule
