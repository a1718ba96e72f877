#include "standoff/segment_ids_added.h"

#include <unordered_map>

#include "core/error.h"

namespace manicule {

namespace {

std::string wanted_id(const std::string& key) {
  std::string id = id_key(key);
  return is_ascii_ncname(id) ? id : "id-" + id;
}

// Renames a segment everywhere the Analysis names it.
void rename_segment(Analysis& analysis, std::size_t index, const std::string& local_id) {
  SegmentSummary& s = analysis.segments[index];
  std::string old_id = s.id;
  const std::string stem = s.id_prefix();
  if (s.label == s.local_id) s.label = local_id;
  s.local_id = local_id;
  s.id = stem + "#" + local_id;
  for (auto& id : analysis.table.segment_ids)
    if (id == old_id) id = s.id;
  if (analysis.pca)
    for (auto& id : analysis.pca->segment_ids)
      if (id == old_id) id = s.id;
}

}  // namespace

AddedIds give_segments_ids(Analysis& analysis, const std::vector<std::size_t>& segments, const ScannedDocument& doc,
                           IdRegistry& ids, const std::string& file) {
  AddedIds added;
  bool checked = false;
  // Ids given in this call, by element: a joint speech (who="#a #b") is a speech of each of
  // its speakers, and must get one id, not one from each.
  std::unordered_map<int, std::string> given;
  for (std::size_t index : segments) {
    SegmentSummary& s = analysis.segments[index];
    // A speaker's segment is keyed by who speaks, not by an element: its speeches get
    // numbered ids and the segment keeps its name.
    const bool speeches = s.unit == "speaker";
    for (std::size_t k = 0; k < s.pointers.size(); ++k) {
      std::string& pointer = s.pointers[k];
      if (pointer.rfind("xpath(", 0) != 0) continue;
      if (!checked && doc.markup_entity_in_root) {
        throw Error(ErrorKind::bad_input,
                    "--add-ids cannot be used here: the text refers to an entity that may hold elements, so element "
                    "positions in the file do not match the parsed document; nothing was written", file);
      }
      checked = true;
      int element = resolve_xpath_pointer(doc, pointer);
      if (element < 0)
        throw Error(ErrorKind::internal, "the element of " + pointer + " was not found; nothing was written", file);
      const ScannedElement& e = doc.elements[static_cast<std::size_t>(element)];
      std::string id;
      if (const std::string* existing = e.attribute("xml:id")) {
        id = *existing;
      } else if (auto earlier = given.find(element); earlier != given.end()) {
        id = earlier->second;
      } else {
        id = ids.claim(wanted_id(speeches ? s.local_id + "-" + std::to_string(k + 1) : s.local_id));
        added.insertions.push_back(id_insertion(doc, element, id));
        added.ids.push_back(id);
        given.emplace(element, id);
      }
      pointer = "#" + id;
      // A segment already known by an id of the edition (a letter that is its text's whole
      // body, by its TEI's id) keeps its name when its element gets an id.
      if (!speeches && s.pointers.size() == 1 && !doc.xml_ids.count(s.local_id)) rename_segment(analysis, index, id);
    }
  }
  return added;
}

}  // namespace manicule
