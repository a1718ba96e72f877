#include "text/normalise.h"

#include <unicode/normalizer2.h>
#include <unicode/uchar.h>
#include <unicode/unistr.h>

#include "core/error.h"

namespace manicule {

namespace {

// The plain letters for U+FB00–U+FB06 (Unicode's compatibility decompositions;
// ﬅ U+FB05 is long s + t and becomes "st").
const char16_t* const kLigatureLetters[] = {u"ff", u"fi", u"fl", u"ffi", u"ffl", u"st", u"st"};

bool is_apostrophe_variant(char16_t c) {
  return c == 0x2019 || c == 0x2018 || c == 0x02BC || c == 0xFF07;
}

void check(UErrorCode status, const char* what) {
  if (U_FAILURE(status)) {
    throw Error(ErrorKind::internal, std::string("ICU ") + what + " failed: " + u_errorName(status));
  }
}

}  // namespace

struct TokenNormaliser::Buffers {
  const icu::Normalizer2* nfc = nullptr;
  icu::UnicodeString text;
  icu::UnicodeString replaced;
  std::string utf8;
};

TokenNormaliser::TokenNormaliser(const TokenizerOptions& options)
    : options_(options), buffers_(std::make_unique<Buffers>()) {
  UErrorCode status = U_ZERO_ERROR;
  buffers_->nfc = icu::Normalizer2::getNFCInstance(status);
  check(status, "NFC instance");
}

TokenNormaliser::~TokenNormaliser() = default;

std::string_view TokenNormaliser::normalise(std::string_view token) {
  Buffers& b = *buffers_;
  UErrorCode status = U_ZERO_ERROR;
  b.text = icu::UnicodeString::fromUTF8(
      icu::StringPiece(token.data(), static_cast<int32_t>(token.size())));
  if (!b.nfc->isNormalized(b.text, status)) b.text = b.nfc->normalize(b.text, status);
  check(status, "NFC normalisation");

  bool changed = false;
  // Characters that change nothing a reader sees (Unicode's Default_Ignorable_Code_Point:
  // soft hyphen, zero-width joiners, directional marks, variation selectors) sit inside a
  // word when the editor's text has them (UAX #29 WB4 attaches them), so that "amici\u00ADtia"
  // would count apart from "amicitia". They are dropped, as NFKC_Casefold drops them
  // (Unicode Standard 3.13, toNFKC_Casefold; cited from memory).
  const auto ignorable = [](UChar32 c) { return u_hasBinaryProperty(c, UCHAR_DEFAULT_IGNORABLE_CODE_POINT); };
  int32_t first_ignorable = 0;
  while (first_ignorable < b.text.length() && !ignorable(b.text.char32At(first_ignorable)))
    first_ignorable = b.text.moveIndex32(first_ignorable, 1);
  if (first_ignorable < b.text.length()) {
    b.replaced.setTo(b.text, 0, first_ignorable);
    for (int32_t i = first_ignorable; i < b.text.length(); i = b.text.moveIndex32(i, 1))
      if (!ignorable(b.text.char32At(i))) b.replaced.append(b.text.char32At(i));
    b.text.swap(b.replaced);
    changed = true;
  }
  // At a word's edges: U+202F, the narrow no-break space that French and German typesetting
  // puts before "!", "?", ";" and inside guillemets, is ExtendNumLet to UAX #29 (for
  // Mongolian suffixes), which joins it to the word beside it ("Herr\u202F!"); and U+02BC,
  // a letter to UAX #29, which a word keeps ("κατʼ", "ʼtis") where the apostrophes it stands
  // for (’ and ') are split off as punctuation. Dropped there, so that the word counts alike
  // however the editor typeset it; inside a word both stay.
  const auto edge_mark = [&](char16_t c) { return c == 0x202F || (options_.apostrophes && c == 0x02BC); };
  int32_t begin = 0, end = b.text.length();
  while (begin < end && edge_mark(b.text.charAt(begin))) ++begin;
  while (end > begin && edge_mark(b.text.charAt(end - 1))) --end;
  if (begin != 0 || end != b.text.length()) {
    b.text.retainBetween(begin, end);
    changed = true;
  }

  // Every character replaced here is in the BMP, so code units will do.
  const auto replacement = [&](char16_t c) -> const char16_t* {
    if (options_.long_s && c == 0x017F) return u"s";
    if (options_.ligatures && c >= 0xFB00 && c <= 0xFB06) return kLigatureLetters[c - 0xFB00];
    if (options_.apostrophes && is_apostrophe_variant(c)) return u"'";
    return nullptr;
  };
  int32_t first = 0;
  while (first < b.text.length() && !replacement(b.text.charAt(first))) ++first;
  if (first < b.text.length()) {
    b.replaced.setTo(b.text, 0, first);
    for (int32_t i = first; i < b.text.length(); ++i) {
      const char16_t c = b.text.charAt(i);
      if (const char16_t* letters = replacement(c)) {
        b.replaced.append(icu::UnicodeString(letters));
      } else {
        b.replaced.append(c);
      }
    }
    b.text.swap(b.replaced);
    changed = true;
  }

  if (options_.case_fold) {
    b.text.foldCase(U_FOLD_CASE_DEFAULT);  // full folding, as u_strFoldCase
    changed = true;
  }
  if (changed && !b.nfc->isNormalized(b.text, status)) b.text = b.nfc->normalize(b.text, status);
  check(status, "NFC normalisation");

  b.utf8.clear();
  b.text.toUTF8String(b.utf8);
  return b.utf8;
}

}  // namespace manicule
