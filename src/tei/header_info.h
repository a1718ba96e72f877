// HeaderInfo: what a TEI header (and a castList) says that selection needs: names of
// persons and roles for speaker labels, correspondence metadata for letter senders, the
// title and author for whole texts, and the declared language. One per TEI element.
#pragma once
#include <map>
#include <string>
#include <vector>

#include "core/segment.h"

namespace manicule {

// One correspDesc (2.4.6): who sent the letter(s) it describes, and when.
struct CorrespRecord {
  std::string id;            // xml:id, "" if none
  bool is_default = false;   // @default="true"
  std::string sender_key;    // @ref of the sender's name, else its normalised text
  std::string sender_label;  // the name as written
  Authorship sender_status = Authorship::unknown;
  std::string sent_date;     // of its sent action, as written; the first with a year wins
  int senders_named = 0;     // names in its sent action (a letter by two hands names two)
};

struct HeaderInfo {
  std::string tei_id;                              // xml:id of the TEI element
  std::string title;  // fileDesc/titleStmt's title of type main, else its first not a subtitle
  bool title_is_main = false;                      // title came from a title of type main
  std::vector<std::string> authors;                // titleStmt/author names
  // Dates as written (@when, else @notBefore, @from, @notAfter or @to, else the text); the
  // store's file date is the first of these, in this order, that has a year, else the first
  // written (work_date).
  std::string creation_date;             // profileDesc/creation (2.4.1): when the text was made
  std::vector<std::string> sent_dates;   // correspAction of type sent (2.4.6): when letters were sent
  std::vector<std::string> event_dates;  // standOff listEvent events of type written, print, premiere
  std::string first_edition_date;        // in a sourceDesc bibl of type firstEdition
  std::string source_date;               // first in sourceDesc outside a bibl of a digital source
  std::string date;                      // first date anywhere in the header
  std::map<std::string, std::string> person_names;  // person/personGrp/role xml:id -> name
  std::vector<CorrespRecord> corresp;
  std::string language;                            // sole or most used langUsage/language
  std::string tei_language;                        // the TEI element's own xml:lang
};

// True for names that stand for nobody: "Unknown", "N.N.", "anonym", "[?]" and the like
// (tei-conventions.md section 3, "Anonymous letters"; the list is common practice).
bool is_placeholder_name(const std::string& name);

// True for a name the editor queries with a question mark: "[Ann Lee?]", "Ann Lee (?)"
// (common practice in editions, no source): a conjecture, not a known name.
bool is_queried_name(const std::string& name);

// The titleStmt authors as one text, "A; B" (the segments' author and the store's metadata),
// each once.
std::string join_authors(const std::vector<std::string>& authors);

// "1842", "c. 1799/1800" -> 1842, 1799; "-0400" (a value beginning with a minus, XML
// Schema's year before the common era) -> -400; 0 when no run of exactly four digits occurs.
int first_year(const std::string& date);

// Whether `candidate` should take the place of `kept` as one thing's date: the first date
// is kept, unless it has no year and the candidate has one ("Tuesday", then "3 May 1855").
bool better_date(const std::string& kept, const std::string& candidate);

// The date of the work rather than of the file, as written, from the header's dates in the
// order of the fields above, the first with a year winning (docs/store.md, "Sub-corpora").
// Without `with_sending`, the letters' sendings are passed by: what dates a letter of the
// text that its own correspDesc and dateline leave undated is not another letter's.
std::string work_date(const HeaderInfo& header, bool with_sending = true);

// Collapses runs of XML whitespace to one space and trims both ends.
std::string normalise_space(const std::string& text);

}  // namespace manicule
