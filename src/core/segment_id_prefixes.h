// What a file's segment ids begin with. An id is "<prefix>#<local id>", the prefix being the
// file's stem ("ferry-letters" for .../ferry-letters.xml). Files of one name in several
// folders of an archive (1850/letters.xml, 1851/letters.xml) would share it: theirs is the
// shortest end of their path, in whole names, that tells them apart ("1850/letters"), or
// the whole path without its extension. Paths alike but for their extension (x.xml,
// x.tei in one folder) keep it ("x.xml"), and any still alike (bytes not UTF-8, each read
// as U+FFFD) are numbered in path order ("a\uFFFD.xml~2"). Ids therefore depend on the
// other files of a run only where names repeat.
#pragma once
#include <string>
#include <vector>

namespace manicule {

// "letters/anna-17.xml" -> "anna-17": the file's name without its extension, as
// well-formed UTF-8 (a segment id is written into XML and JSON).
std::string file_stem(const std::string& path);

// One prefix per path, all distinct for distinct paths; well-formed UTF-8.
std::vector<std::string> segment_id_prefixes(const std::vector<std::string>& paths);

}  // namespace manicule
