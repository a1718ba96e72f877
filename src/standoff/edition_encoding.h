// The character encodings results can be written back into. Splicing works on UTF-8 (or
// an ASCII-compatible single-byte encoding) bytes; a UTF-16 edition is decoded to UTF-8
// first and encoded back after splicing, keeping its byte order and byte-order mark, so
// that the written file is UTF-16 again and differs from the input only by what we
// inserted. Decoding is only used when re-encoding gives back the input byte for byte.
//  - UTF-8 (declared or not): written as UTF-8.
//  - UTF-16LE/BE (with or without a byte-order mark): written as UTF-16, same byte order.
//  - ISO-8859-x, windows-125x, US-ASCII: our text written in ASCII, other characters as
//    character references.
//  - anything else: refused before anything is written (Error(bad_input)).
#pragma once
#include <string>
#include <string_view>

namespace manicule {

enum class ByteForm { utf8, utf16le, utf16be };

struct EditionText {
  ByteForm form = ByteForm::utf8;
  std::string bom;   // the UTF-16 byte-order mark as found ("" if none); UTF-8 keeps its BOM in `text`
  std::string text;  // the document in an ASCII-compatible form (UTF-8 unless legacy)
};

// Throws Error(bad_input) for UTF-16 that does not round-trip (e.g. lone surrogates).
EditionText decode_edition(std::string_view raw, const std::string& name);
std::string encode_edition(const EditionText& how, std::string_view text);

// Whether the declared encoding can be written into, and whether our text must then be
// pure ASCII. Throws Error(bad_input) naming the encoding when it cannot.
bool needs_ascii_insertions(const std::string& declared_encoding, ByteForm form, const std::string& name);

}  // namespace manicule
