#include "text/icu_word_breaker.h"

#include <unicode/brkiter.h>
#include <unicode/rbbi.h>
#include <unicode/uloc.h>
#include <unicode/utext.h>

#include <cstdint>
#include <cstring>
#include <limits>

#include "core/error.h"

namespace manicule {

namespace {

std::unique_ptr<icu::BreakIterator> create_word_iterator(const std::string& locale_id) {
  UErrorCode status = U_ZERO_ERROR;
  std::unique_ptr<icu::BreakIterator> iterator(
      icu::BreakIterator::createWordInstance(icu::Locale(locale_id.c_str()), status));
  if (U_FAILURE(status) || !iterator) {
    throw Error(ErrorKind::internal, "ICU cannot create a word break iterator for locale '" +
                                         locale_id + "': " + u_errorName(status));
  }
  return iterator;
}

// Two iterators follow the same rules when their compiled rule tables are identical.
bool same_rules(icu::BreakIterator& a, icu::BreakIterator& b) {
  auto* rules_a = dynamic_cast<icu::RuleBasedBreakIterator*>(&a);
  auto* rules_b = dynamic_cast<icu::RuleBasedBreakIterator*>(&b);
  if (!rules_a || !rules_b) return false;
  uint32_t length_a = 0;
  uint32_t length_b = 0;
  const uint8_t* data_a = rules_a->getBinaryRules(length_a);
  const uint8_t* data_b = rules_b->getBinaryRules(length_b);
  return data_a && data_b && length_a == length_b && std::memcmp(data_a, data_b, length_a) == 0;
}

}  // namespace

std::string icu_locale_for_tag(std::string_view tag) {
  if (tag.empty()) return "";
  const std::string tag_string(tag);
  char locale_id[ULOC_FULLNAME_CAPACITY] = {};
  int32_t parsed = 0;
  UErrorCode status = U_ZERO_ERROR;
  uloc_forLanguageTag(tag_string.c_str(), locale_id, sizeof locale_id, &parsed, &status);
  if (U_FAILURE(status) || parsed <= 0) return "";
  char language[ULOC_LANG_CAPACITY] = {};
  char script[ULOC_SCRIPT_CAPACITY] = {};
  uloc_getLanguage(locale_id, language, sizeof language, &status);
  uloc_getScript(locale_id, script, sizeof script, &status);
  if (U_FAILURE(status) || language[0] == '\0' || std::strcmp(language, "und") == 0) return "";
  std::string result = language;
  if (script[0] != '\0') result += std::string("_") + script;
  return result;
}

IcuWordBreaker::IcuWordBreaker() = default;

IcuWordBreaker::~IcuWordBreaker() {
  if (utext_) utext_close(utext_);
}

IcuWordBreaker::Breaker& IcuWordBreaker::breaker_for(std::string_view language) {
  const std::string key(language);
  if (auto found = by_language_.find(key); found != by_language_.end()) return found->second;

  const std::string locale_id = icu_locale_for_tag(language);
  Breaker breaker;
  breaker.iterator = create_word_iterator(locale_id);
  if (locale_id.empty()) {
    breaker.root_rules = true;
  } else {
    breaker.root_rules = same_rules(*breaker.iterator, *breaker_for("").iterator);
  }
  return by_language_.emplace(key, std::move(breaker)).first->second;
}

bool IcuWordBreaker::uses_root_rules(std::string_view language) {
  return breaker_for(language).root_rules;
}

void IcuWordBreaker::segment(std::string_view text, std::size_t begin, std::size_t end,
                             std::string_view language, std::vector<WordSegment>& out) {
  if (begin >= end) return;
  if (end - begin > static_cast<std::size_t>(std::numeric_limits<int32_t>::max())) {
    throw Error(ErrorKind::bad_input, "a text of 2 GiB or more cannot be segmented at once");
  }
  icu::BreakIterator& iterator = *breaker_for(language).iterator;
  UErrorCode status = U_ZERO_ERROR;
  utext_ = utext_openUTF8(utext_, text.data() + begin, static_cast<int64_t>(end - begin),
                          &status);
  iterator.setText(utext_, status);
  if (U_FAILURE(status)) {
    throw Error(ErrorKind::internal,
                std::string("ICU cannot segment the text: ") + u_errorName(status));
  }
  int32_t previous = iterator.first();
  for (int32_t next = iterator.next(); next != icu::BreakIterator::DONE;
       previous = next, next = iterator.next()) {
    out.push_back({begin + static_cast<std::size_t>(previous),
                   begin + static_cast<std::size_t>(next), iterator.getRuleStatus()});
  }
}

}  // namespace manicule
