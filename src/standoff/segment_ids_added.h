// --add-ids: giving xml:ids to the segment elements that have none, as the only change
// inside <text>, so that results point at "#id" rather than at a TEI xpath() pointer
// (which breaks as soon as an editor inserts an element before it).
// Each xpath() pointer of a segment is resolved on the byte scan; the element gets
// xml:id="KEY" (a unit element: its local id, e.g. "chapter3"; a speech of a speaker
// without a person entry: "KEY-N"), unique in the document. The segment in `analysis` is
// renamed as a later read of the edition would name it (local id, segment id, pointers,
// label), so a second run finds the same segments and writes the same bytes; one already
// known by an id of the edition (a body letter, by its TEI's) keeps that name. A joint
// speech, a speech of each of its speakers, gets one id, which both speakers' pointers take.
// Refused (Error(bad_input)) where an entity may hide elements, since element positions
// in the bytes would then not match those of the parsed document.
#pragma once
#include <string>
#include <vector>

#include "core/analysis.h"
#include "standoff/edition_splice.h"
#include "standoff/standoff_ids.h"
#include "standoff/xml_scan.h"

namespace manicule {

struct AddedIds {
  std::vector<Insertion> insertions;  // kind "xml:id", positions in the scanned bytes
  std::vector<std::string> ids;
};

AddedIds give_segments_ids(Analysis& analysis, const std::vector<std::size_t>& segments, const ScannedDocument& doc,
                           IdRegistry& ids, const std::string& file);

}  // namespace manicule
