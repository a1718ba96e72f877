// Reading one edition on its own: its segments selected, tokenised and counted, its header
// metadata, and the size and SHA-256 of its bytes (taken while parsing). The unit of work
// of both corpus readers: read_corpus (all files, then merged) and read_files_streaming
// (one finished file at a time, for archive-scale runs).
#pragma once
#include <string>
#include <vector>

#include "core/corpus.h"
#include "core/request.h"
#include "profile/count_profile.h"

namespace manicule {

class Tokenizer;
struct SelectionRules;

// Raised whenever what read_file makes of the same bytes changes (segments, counts, header
// metadata) within one version of manicule: the store keys what it keeps by it, so that
// files stored before are read again. 2: the date is the work's or the letters' (work_date),
// not the file's, and a file without segments of the unit has its TEI element's language.
// 3: segments dated apart from their file (Segment::date: letters, texts of a teiCorpus),
// and a letter paired with the correspDesc among several @decls pointers. 4: --unit xpath:
// selects the matched elements (not their children); a speaker credited by <speaker>
// labels warns of it. 5: a segment's language is that of most of its words (not bytes);
// a file's, that of its text before langUsage; the title of type main preferred; notes
// left out of titles and names, line breaks and name parts parting their words; several
// names of one author bracketed, one named twice given once; a year written "-0400" is
// before the common era. 6: invisible characters (Default_Ignorable_Code_Point) dropped
// from words, and a U+02BC at a word's edge with the apostrophe look-alikes; an rdgGrp
// reads one of its readings, and an app without lem may read it; dates in ISO 8601
// (@when-iso and the rest) are read. 7: each text of a teiCorpus (or each TEI in a TEI)
// gives its segments its own title and authors (Segment::own_text), its authors, date and
// langUsage else the nearest collection's; a teiCorpus's own header gives the file's title
// and authors, and may hold the correspDesc a letter points to; a teiCorpus's speakers are
// each text's own; document order pairs a letter past the correspDescs others' @decls
// name; a placeholder sender is unknown even with @ref, a queried name or a doubted sent
// action a conjecture; publicationStmt, editionStmt, revisionDesc and (but for a letter's
// sending) correspDesc date no work; a teiCorpus's cast list names every play's voices.
// 8: a teiCorpus file is dated by its own header alone (a text none dates is undated, not
// dated by the first text); a <name> of a place in a sent correspAction is no sender; the
// earliest sending is the earliest date, not the first of the earliest year. 9: a file's
// language is taken from its segments' tags that can be read ("de_AT" cannot), else its
// TEI element's and langUsage, as before.
constexpr int kReadingRevision = 9;

// What the edition's own header says (the first TEI element's teiHeader, with a
// teiCorpus's own title and authors where it gives them).
struct FileMetadata {
  std::string title;
  std::string author;    // titleStmt authors as written, joined by kAuthorSeparator
  std::string date;      // the work's date as written (creation, letters sent, events, editions: work_date)
  int year = 0;          // the first four-digit year in `date`; 0 when there is none
  std::string language;  // langUsage, else the language most of the selected text is in, else TEI/@xml:lang
};

struct FileReading {
  std::string file;
  std::size_t bytes = 0;
  std::string sha256;                   // of the bytes parsed ("" if unreadable)
  bool parsed = true;                   // false: only hashed (see read_files_streaming)
  FileMetadata metadata;
  std::vector<SegmentRecord> segments;  // in document order
  CountProfile counts;                  // one SegmentCounts per segment, own vocabulary
  bool failed = false;
  FileFailure failure;
};

// Never throws for a bad file: the error is recorded in `failed` and `failure`.
FileReading read_file(const std::string& file, const Request& request, const SelectionRules& rules,
                      Tokenizer& tokenizer);

}  // namespace manicule
