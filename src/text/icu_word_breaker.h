// IcuWordBreaker: UAX #29 word segmentation by ICU's word BreakIterator, one iterator per
// language tag, created on first use and kept. Reads UTF-8 in place through UText.
// Not thread-safe: one per thread (it belongs to one Tokenizer).
#pragma once
#include <cstddef>
#include <memory>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include <unicode/uversion.h>

#include "text/word_segment.h"

struct UText;
U_NAMESPACE_BEGIN
class BreakIterator;
U_NAMESPACE_END

namespace manicule {

// The ICU locale ID for a BCP 47 tag: its primary language subtag and script ("zh-Hant-TW"
// -> "zh_Hant", "de-AT" -> "de"); "" (ICU's root) for an empty, "und" or unreadable tag.
std::string icu_locale_for_tag(std::string_view tag);

class IcuWordBreaker {
 public:
  IcuWordBreaker();
  ~IcuWordBreaker();
  IcuWordBreaker(const IcuWordBreaker&) = delete;
  IcuWordBreaker& operator=(const IcuWordBreaker&) = delete;

  // Appends the segments of text[begin, end) to `out`, with offsets into `text`.
  void segment(std::string_view text, std::size_t begin, std::size_t end,
               std::string_view language, std::vector<WordSegment>& out);

  // Whether the language's word rules are ICU's root rules (the ones the Latin fast path
  // follows): Finnish and Swedish, for one, tailor them.
  bool uses_root_rules(std::string_view language);

 private:
  struct Breaker {
    std::unique_ptr<icu::BreakIterator> iterator;
    bool root_rules = false;
  };
  Breaker& breaker_for(std::string_view language);

  std::unordered_map<std::string, Breaker> by_language_;
  UText* utext_ = nullptr;
};

}  // namespace manicule
