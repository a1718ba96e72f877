// URI references between an edition, its results and their exports: relative references
// from one file to another ("../letters/anna.xml"), file: URIs (RFC 8089) and resolving
// a reference against a base (RFC 3986, section 5.2). Paths are percent-encoded where
// URIs need it (spaces, non-ASCII bytes, ...).
#pragma once
#include <string>

namespace manicule {

// From the document at `from` to the file at `to`.
std::string relative_uri(const std::string& from, const std::string& to);

// file:///absolute/path of a local file.
std::string file_uri(const std::string& path);

std::string resolve_uri(const std::string& base, const std::string& reference);

// The URI without its fragment ("a.xml#L07" -> "a.xml").
std::string without_fragment(const std::string& uri);

// Whether `uri` is absolute (a scheme, RFC 3986 section 3.1) with no fragment and no space,
// control character or character a URI never holds unescaped ('<', '>', '"'): fit to make
// ids from, such as a published edition's address.
bool is_absolute_uri_without_fragment(const std::string& uri);

}  // namespace manicule
