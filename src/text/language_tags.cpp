#include "text/language_tags.h"

#include <unicode/locid.h>

namespace manicule {

std::string canonical_language_tag(std::string_view tag) {
  if (tag.empty()) return {};
  UErrorCode status = U_ZERO_ERROR;
  icu::Locale parsed = icu::Locale::forLanguageTag(icu::StringPiece(tag.data(), static_cast<int32_t>(tag.size())), status);
  if (U_FAILURE(status) || parsed.isBogus()) return {};
  icu::Locale canonical = icu::Locale::createCanonical(parsed.getName());
  if (canonical.isBogus() || canonical.getLanguage()[0] == '\0') return {};
  std::string out = canonical.toLanguageTag<std::string>(status);
  if (U_FAILURE(status) || out == "und") return {};
  for (char& c : out)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  return out;
}

LanguageRange::LanguageRange(std::string_view range) : canonical_(canonical_language_tag(range)) {}

bool LanguageRange::holds(std::string_view tag) const {
  if (canonical_.empty() || tag.empty()) return false;
  auto [it, fresh] = answers_.try_emplace(std::string(tag), false);
  if (fresh) {
    const std::string t = canonical_language_tag(tag);
    it->second = t == canonical_ || (t.size() > canonical_.size() && t.compare(0, canonical_.size(), canonical_) == 0 &&
                                     t[canonical_.size()] == '-');
  }
  return it->second;
}

}  // namespace manicule
