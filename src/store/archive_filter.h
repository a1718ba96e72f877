// Sub-corpora of an archive, chosen by where a file lies and what its header says:
// folder, author, year range, language, title pattern. A filter that is left empty
// keeps everything. Header fields come from the store (readings), so filtering an
// analysis reads no XML. Author and title ignore letter case (text/caseless_match.h);
// languages compare as canonical tags (text/language_tags.h).
#pragma once
#include <string>

#include "core/file_reading.h"

namespace manicule::store {

struct ArchiveFilter {
  std::string folder;    // only files inside this folder (relative to an input folder, or as a path)
  std::string author;    // the header's authors hold each word of this text, in any order
  int year_from = 0;     // the header's year is at least this (0 = no lower bound)
  int year_to = 0;       // ... at most this (0 = no upper bound); files without a year are left out
  std::string language;  // the segment's language, else its file's, lies in this range (de, en, eng, en-GB)
  std::string title;     // the header's title matches this shell pattern (* and ?), e.g. "*Brief*"

  bool selects_by_header() const;
  bool empty() const { return folder.empty() && !selects_by_header(); }
  // "author~goethe year=1800-1830", "" when empty; recorded with each analysis run.
  std::string describe() const;
};

bool in_folder(const ArchiveFilter& filter, const std::string& path, const std::string& relative_path);

// Whether `path` lies below `folder` (a prefix ending at a '/', of the path or the folder).
bool starts_with_folder(const std::string& path, const std::string& folder);
// The file-level header tests: author, year, title (language is tested per segment).
bool header_matches(const ArchiveFilter& filter, const FileMetadata& metadata);

}  // namespace manicule::store
