// Language tags as editions declare them for a text or a passage: BCP 47 tags
// (RFC 5646) or bare ISO 639 codes of two or three letters, "en", "eng", "ger", "de-AT".
// Two spellings of one language compare equal once canonical (CLDR's aliases, through ICU:
// "eng" -> "en", "ger" and "deu" -> "de", "fre" -> "fr"), and a range holds the tags that
// extend it (RFC 4647 section 3.3.1, basic filtering: "en" holds "en-GB").
#pragma once
#include <string>
#include <string_view>
#include <unordered_map>

namespace manicule {

// The canonical tag in lower case ("eng" -> "en", "DE-at" -> "de-at"); "" for an empty or
// undetermined tag ("und"), or one ICU cannot read ("de_AT").
std::string canonical_language_tag(std::string_view tag);

// The primary language subtag of a canonical tag: "de" of "de-at"; "" of "".
std::string_view primary_subtag(std::string_view canonical_tag);

// Whether `tag` names a language by an ISO 639 code of two or three letters, with or without
// further subtags: "de", "ger", "en-GB", not "german" (well-formed BCP 47, but no code) nor
// "xx" (two letters that ISO 639-1 does not assign, by ICU's list of them).
bool is_language_code(std::string_view tag);

// A language range to filter by, such as a user's --language: which tags it holds.
class LanguageRange {
 public:
  explicit LanguageRange(std::string_view range);
  bool empty() const { return canonical_.empty(); }
  // Whether `tag`, canonical, is the range or extends it by further subtags. An empty or
  // undetermined tag lies in no range.
  bool holds(std::string_view tag) const;
  // Whether `tag` can be read as a language at all (canonical_language_tag is not empty).
  bool readable(std::string_view tag) const;
  // canonical_language_tag(tag), worked out once per distinct tag.
  const std::string& canonical(std::string_view tag) const;

 private:
  std::string canonical_;
  mutable std::unordered_map<std::string, std::string> canonical_tags_;  // tags seen so far (a handful)
};

}  // namespace manicule
