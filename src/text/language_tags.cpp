#include "text/language_tags.h"

#include <unicode/locid.h>
#include <unicode/uloc.h>

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

std::string_view primary_subtag(std::string_view canonical_tag) {
  return canonical_tag.substr(0, canonical_tag.find('-'));
}

bool is_language_code(std::string_view tag) {
  const std::string canonical = canonical_language_tag(tag);
  const std::string_view primary = primary_subtag(canonical);
  if (primary.size() == 3) return true;  // ISO 639-2 and -3 codes: more than ICU lists
  if (primary.size() != 2) return false;
  // Two letters: one that ISO 639-1 assigns, as ICU lists them ("xx" is none).
  for (const char* const* code = uloc_getISOLanguages(); *code; ++code)
    if (primary == *code) return true;
  return false;
}

LanguageRange::LanguageRange(std::string_view range) : canonical_(canonical_language_tag(range)) {}

const std::string& LanguageRange::canonical(std::string_view tag) const {
  auto [it, fresh] = canonical_tags_.try_emplace(std::string(tag));
  if (fresh) it->second = canonical_language_tag(tag);
  return it->second;
}

bool LanguageRange::readable(std::string_view tag) const { return !tag.empty() && !canonical(tag).empty(); }

bool LanguageRange::holds(std::string_view tag) const {
  if (canonical_.empty() || tag.empty()) return false;
  const std::string& t = canonical(tag);
  return t == canonical_ ||
         (t.size() > canonical_.size() && t.compare(0, canonical_.size(), canonical_) == 0 && t[canonical_.size()] == '-');
}

}  // namespace manicule
