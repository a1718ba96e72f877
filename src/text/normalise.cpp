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

  // Every character replaced here is in the BMP, so code units will do.
  bool changed = false;
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
