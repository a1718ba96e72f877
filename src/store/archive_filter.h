// Sub-corpora of an archive, chosen by where a file lies and what its header says:
// folder, author, year range, language, title pattern. A filter that is left empty
// keeps everything. Header fields come from the store (readings), so filtering an
// analysis reads no XML. Author and title ignore letter case (text/caseless_match.h);
// languages compare as canonical tags (text/language_tags.h).
#pragma once
#include <filesystem>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "core/file_reading.h"
#include "core/segment.h"

namespace manicule::store {

// What separates the words of --author's text ("Tide, Mara").
inline constexpr const char* kAuthorWordSeparators = " \t,;";

struct ArchiveFilter {
  std::string folder;    // only files inside this folder (relative to an input folder, or as a path)
  // Author and title: the header's of a segment's text (its file's, or in a teiCorpus its
  // own text's).
  std::string author;    // one of the header's authors holds each word of this text as a whole word, in any order
  // Years: a segment's own where the edition dates it apart from its file (a letter), else
  // its file's (the work's date from the header); segments without either are left out.
  int year_from = 0;     // the year is at least this (0 = no lower bound)
  int year_to = 0;       // ... at most this (0 = no upper bound)
  std::string language;  // the segment's language, else its file's, lies in this range (de, en, eng, en-GB)
  std::string title;     // the header's title matches this shell pattern (* and ?), e.g. "*Brief*"
  // The folder that relative stored paths are relative to (where batch ran, recorded with
  // its run); empty: the working folder, as in batch itself. --folder is always taken from
  // the working folder.
  std::string stored_paths_base;

  bool selects_by_header() const;
  // Whether --author or --title is asked: the tests of a header's heading.
  bool selects_by_heading() const { return !author.empty() || !title.empty(); }
  bool asks_years() const { return year_from || year_to; }
  // Whether `year` lies in the range (true when no range is asked; 0, no year, never does).
  bool year_matches(int year) const;
  // Whether some year of first..last lies in the range (0, 0: no years).
  bool years_overlap(int first, int last) const;
  bool empty() const { return folder.empty() && !selects_by_header(); }
  // "author~tide year=1800-1830", "" when empty; recorded with each analysis run.
  std::string describe() const;
  // The same question however it was spelled, for the key of a stored analysis (JSON): the
  // author's words caseless, sorted, once each; the years; the language tag canonical
  // ("ENG" -> "en"); the title pattern caseless; no folder, as the files it takes are in the
  // key already. Empty when the filter tests no header.
  std::string question_key() const;
};

// A filter's --folder, prepared once (its reading, its absolute spellings from the working
// folder as it is now) for the many files it is asked about.
class FolderFilter {
 public:
  explicit FolderFilter(const ArchiveFilter& filter);
  // Whether the file at `path` (as stored or listed; `relative_path` below its input) lies
  // in the folder; true when no folder is asked.
  bool holds(const std::string& path, const std::string& relative_path) const;

 private:
  std::string given_;   // as typed
  std::string folder_;  // tidied: "./a/b/" as "a/b"
  bool from_working_folder_ = false;  // "./x", "../x", "/x", ".", ".."
  bool bare_name_ = false;            // "de", "de/"
  // The folder's absolute spelling for each spelling of the working folder, with the
  // folder that relative stored paths are relative to.
  std::vector<std::pair<std::string, std::filesystem::path>> absolute_;
  // The folder as the system resolves it, links followed, and the resolved spellings of
  // the folders that paths lie in (worked out once each): a folder and a path reached
  // through different links ("/data/arch/de" for "/mnt/vol/arch/de") are compared so.
  std::string resolved_;
  mutable std::unordered_map<std::string, std::string> resolved_parents_;
};

// Whether `path` lies below `folder` (a prefix ending at a '/', of the path or the folder).
bool starts_with_folder(const std::string& path, const std::string& folder);
// The header tests of author and title. Of a file's header; or, where a file holds several
// texts with headers of their own (a teiCorpus), of one text's: its authors (else the
// nearest collection's, as the reader gives them), its own title or a title of the
// collections around it, so that a collection's title takes all its texts. Years and
// language are tested per segment (a letter may be dated, or written in a language, apart
// from its file).
bool header_matches(const ArchiveFilter& filter, const FileMetadata& metadata);
bool text_matches(const ArchiveFilter& filter, const TextHeading& text);

}  // namespace manicule::store
