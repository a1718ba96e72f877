// Splicing results into an edition's own bytes: where our <standOff>, our <application>
// and our <change> go, what an earlier run of ours left there, and how to take it out
// again exactly. Nothing is ever re-serialised; every other byte stays as it was.
//
// Positions (TEI P5 4.12.0):
//  - standOff (17.10, a member of model.resource): after the root's last standOff, else
//    just before its first <text> (or nested TEI/teiCorpus), else before the root's end tag.
//  - application (2.3.11): appended to the first encodingDesc/appInfo; else an appInfo is
//    appended to the first encodingDesc; else an encodingDesc is added right after
//    fileDesc (teiHeader = fileDesc, model.teiHeaderPart*, revisionDesc?).
//  - change (2.6): newest first, before the first change of revisionDesc (or of its first
//    listChange); else a revisionDesc is added as the last child of teiHeader.
// Every insertion is a line break, the indentation of its new siblings and the element,
// placed right after a '>' or a non-blank character. So the blank run before one of our
// elements is always ours, and removing [that run, the element's end) undoes it.
// Wrappers we create (appInfo, encodingDesc, revisionDesc) carry an xml:id with our
// prefix and are removed again only when nothing but our entries is left in them.
#pragma once
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "standoff/xml_fragment.h"
#include "standoff/xml_scan.h"

namespace manicule {

// What marks the markup we write.
inline constexpr std::string_view kOurIdPrefix = "mcl-";
inline constexpr std::string_view kOurStandoffType = "stylometry";
inline constexpr std::string_view kOurApplicationIdent = "manicule";

struct ByteRange {
  std::size_t begin = 0;
  std::size_t end = 0;
};

struct Insertion {
  std::size_t at = 0;
  std::string text;
  std::string kind;  // "standOff", "application", "change" or "xml:id"
};

// True for our standOff: @type "stylometry" and an xml:id with our prefix.
bool is_our_standoff(const ScannedElement& e);

// The byte ranges an earlier run inserted (see above), outermost only, in order.
std::vector<ByteRange> previous_results(const ScannedDocument& doc, std::string_view bytes);

std::string without_ranges(std::string_view bytes, const std::vector<ByteRange>& ranges);
// Applies insertions in order of position; insertions at one position keep their order.
std::string with_insertions(std::string_view bytes, std::vector<Insertion> insertions);

struct SpliceFragments {
  XmlNode standoff;
  std::optional<XmlNode> application;  // no header entries when empty
  std::optional<XmlNode> change;
  // Ids for wrappers we may have to create (unique in the document).
  std::string encoding_desc_id, app_info_id, revision_desc_id;
};

struct SplicePlan {
  std::vector<Insertion> insertions;
  std::vector<std::string> notes;  // header entries that could not be written, and why
};

// Plans the insertions into a document that holds none of ours (strip it first). Throws
// Error(bad_input) for a document where a byte-level view cannot be trusted: a root that
// is empty, or an entity that may hide elements inside the elements we write into.
SplicePlan plan_splice(const ScannedDocument& doc, std::string_view bytes, const SpliceFragments& fragments,
                       bool ascii_only);

// The element a TEI xpath() pointer of the form xpath(/a[1]/b[2]) names (local names,
// 1-based position among same-named siblings), or -1.
int resolve_xpath_pointer(const ScannedDocument& doc, std::string_view pointer);

// The insertion that gives element `index` the attribute xml:id="id".
Insertion id_insertion(const ScannedDocument& doc, int index, const std::string& id);

}  // namespace manicule
