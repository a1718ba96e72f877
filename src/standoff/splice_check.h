// The last look before anything is written: the spliced document is parsed again with
// the hardened reader (src/tei, libxml2 with entities expanded) and must be well-formed
// XML in which each element we inserted stands where TEI allows it, in the TEI
// namespace:
//   standOff[@xml:id=ours]                        child of the root
//   application[@xml:id=ours]                     in teiHeader/encodingDesc/appInfo
//   change[@target=#ours]                         in teiHeader/revisionDesc(/listChange)
//   each xml:id we added                          present once
//   each xml:id with our prefix                   present once (entity text may hide ids)
// A byte-level slip (an insertion inside a comment, a CDATA section or an entity) shows
// up here as a missing or misplaced element. Throws Error(internal) naming what is wrong,
// so that nothing is written.
#pragma once
#include <string>
#include <string_view>
#include <vector>

namespace manicule {

struct SpliceExpectations {
  std::string standoff_id;
  std::string application_id;  // "" when no application was written
  bool change = false;         // a change pointing at the standOff was written
  std::vector<std::string> added_ids;
};

void check_spliced(std::string_view bytes, const std::string& name, const SpliceExpectations& expected);

}  // namespace manicule
