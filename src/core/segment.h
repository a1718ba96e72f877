// Segment: one unit of running text selected from an edition (a speaker, a letter, a
// chapter, a whole text or an element named by XPath), with everything later layers need
// and nothing that ties them to XML.
#pragma once
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace manicule {

// A stretch of selected text in one language. Runs are separated by token boundaries.
struct TextRun {
  std::string text;      // UTF-8, as selected (not yet normalised)
  std::string language;  // BCP 47 tag inherited from xml:lang; empty if unknown
};

// Between the authors of one text in a single field ("A; B": the titleStmt's authors of a
// segment or a file): join_authors writes it, the store's author filter splits on it.
inline constexpr std::string_view kAuthorSeparator = "; ";

// The title and authors of one text's own header (titleStmt), as FileMetadata gives a
// file's: the authors joined by kAuthorSeparator (the nearest collection's where the text
// names none); and the titles of the collections around it (teiCorpus, or the outer TEI
// of TEI elements in a TEI), outermost first.
struct TextHeading {
  std::string title;
  std::string author;
  std::vector<std::string> collection_titles;
  int number = 0;  // its TEI element's place among the file's, in document order (1-based)
};

// Who is known to have written or spoken a segment, as far as the edition says.
enum class Authorship { known, conjectured, unknown };

struct Segment {
  std::string id;          // "<file stem>#<local id>": unique across a run
  std::string file;        // path of the edition it came from
  std::string local_id;    // xml:id of the unit element, or a key such as "speaker:Anna"
  std::string unit;        // speaker | letter | chapter | whole | xpath
  std::string label;       // human-readable name (speaker's name, letter's sender, title)
  std::string language;    // main language of the segment (the most text)
  // Where write-back points: "#id" pointers or TEI xpath() pointers, relative to the file.
  std::vector<std::string> pointers;
  std::string author;      // author or speaker key from the edition ("" if none)
  Authorship authorship = Authorship::unknown;
  // When the edition dates this segment apart from its file, as written: a letter's
  // sending (its correspDesc, else its dateline), a TEI of a corpus by its own header.
  // "" when only the file is dated (FileMetadata::date).
  std::string date;
  int year = 0;            // the first four-digit year in `date`; 0 when there is none
  // Where the file holds several texts, each with its own header (a teiCorpus, or TEI
  // elements in a TEI): the heading of this segment's text, by which the store's --author
  // and --title take it. Absent in a file of one text, whose heading is the file's.
  std::optional<TextHeading> own_text;
  std::vector<TextRun> runs;
  std::vector<std::string> warnings;  // what the reader noticed (unpaired letter, ...)
};

}  // namespace manicule
