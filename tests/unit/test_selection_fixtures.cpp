// Selection rules on small invented fixtures (tests/fixtures), one file per rule. The
// expected words come from the TEI rules in ../shared/docs/tei-conventions.md (TEI P5
// 4.12.0 sections cited per case), written by hand in each fixture's header comment, not
// from running manicule.
#include <catch2/catch.hpp>

#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "tei/reader.h"

using namespace manicule;

namespace {

std::string fixture(const std::string& name) { return std::string(MANICULE_FIXTURES) + "/" + name; }

// The selected text as words: split at white space, sentence punctuation removed.
std::vector<std::string> words(const Segment& s) {
  std::string text;
  for (const auto& run : s.runs) text += run.text + " ";
  for (char& c : text)
    if (c == '.' || c == ',' || c == ';' || c == ':' || c == '!' || c == '?') c = ' ';
  std::istringstream in(text);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

std::vector<std::string> split(const std::string& text) {
  std::istringstream in(text);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

std::vector<Segment> read(const std::string& name, const std::string& unit, Preset preset = Preset::reading,
                          const std::string& base_witness = "") {
  SelectionRules rules = SelectionRules::make(unit, preset);
  rules.base_witness = base_witness;
  return read_segments(XmlSource::file(fixture(name)), rules);
}

std::map<std::string, Segment> by_local_id(const std::vector<Segment>& segments) {
  std::map<std::string, Segment> out;
  for (const auto& s : segments) out[s.local_id] = s;
  return out;
}

}  // namespace

TEST_CASE("choice: reading takes corr, reg, expan; diplomatic takes sic, orig, abbr (3.5.1, 3.5.2, 3.6.5)") {
  auto reading = read("choice.xml", "whole");
  REQUIRE(reading.size() == 1);
  CHECK(words(reading[0]) == split("Captain Wren showed the ferry ticket at noon Tolls paid in full"));
  auto diplomatic = read("choice.xml", "whole", Preset::diplomatic);
  CHECK(words(diplomatic[0]) == split("Capt Wren shewed the ferrey ticket at noon Tolls payd in full"));
}

TEST_CASE("app: lem wins; without lem the base witness's rdg, never several (13.1)") {
  CHECK(words(read("app.xml", "whole", Preset::reading, "A")[0]) ==
        split("The boat crossed slowly at dawn under sail today"));
  CHECK(words(read("app.xml", "whole", Preset::reading, "B")[0]) ==
        split("The boat crossed slowly at dawn under oars today"));
}

TEST_CASE("app: an rdgGrp is one reading and reads one of its own; --keep rdg reads them instead (13.1.4)") {
  CHECK(words(read("app-groups.xml", "whole", Preset::reading, "A")[0]) ==
        split("The ferry left early from the north quay at ebb tide by night"));
  CHECK(words(read("app-groups.xml", "whole", Preset::reading, "D")[0]) ==
        split("The ferry left early from the north quay at slack tide by night"));
  SelectionRules variants = SelectionRules::make("whole");
  variants.keep("rdg");
  variants.base_witness = "A";
  CHECK(words(read_segments(XmlSource::file(fixture("app-groups.xml")), variants)[0]) ==
        split("The ferry sailed early from the east quay at ebb tide late night"));
}

TEST_CASE("lb/pb break=no join the halves across a skipped note; a plain lb separates (3.11.3)") {
  CHECK(words(read("lb-nobreak.xml", "whole")[0]) ==
        split("A hyphenated word on the landing stage a crossing at dusk and a plain break here"));
  CHECK(words(read("lb-nobreak.xml", "whole", Preset::diplomatic)[0]) ==
        split("A hyphen-ated word on the landing stage a cross-ing at dusk and a plain break here"));
}

TEST_CASE("nested notes are skipped with their subtree; tails stay; tags are not whitespace (3.9.1, 3.2.2)") {
  CHECK(words(read("nested-notes.xml", "whole")[0]) == split("alphabeta gamma delta epsilon"));
}

TEST_CASE("a speech with several ids in @who counts for each speaker named (7.2.2)") {
  auto speakers = by_local_id(read("joint-speech.xml", "speaker"));
  REQUIRE(speakers.count("a"));
  REQUIRE(speakers.count("b"));
  CHECK(words(speakers["a"]) == split("Heave away now The tide is high"));
  CHECK(words(speakers["b"]) == split("Heave away now The boat is ready"));
  // With joint speeches dropped, each keeps only its own speech.
  SelectionRules rules = SelectionRules::make("speaker");
  rules.joint = JointSpeech::drop;
  auto dropped = by_local_id(read_segments(XmlSource::file(fixture("joint-speech.xml")), rules));
  CHECK(words(dropped["a"]) == split("The tide is high"));
  CHECK(words(dropped["b"]) == split("The boat is ready"));
}

TEST_CASE("a speech without @who falls back to its speaker label matched against persName (7.2.2)") {
  auto speakers = by_local_id(read("missing-who.xml", "speaker"));
  REQUIRE(speakers.count("anna"));
  REQUIRE(speakers.count("speaker:stranger"));
  REQUIRE(speakers.count("ben"));
  CHECK(words(speakers["anna"]) == split("Where is the ferry Tomorrow then"));
  CHECK(words(speakers["speaker:stranger"]) == split("Gone downriver at noon"));
  CHECK(words(speakers["ben"]) == split("It left early"));
  CHECK(speakers["anna"].pointers == std::vector<std::string>{"#anna"});
  // Each speaker credited by label says so, with the count of such speeches: in the
  // fixture two <sp> without @who are Anna's (ANNA., Anna), one the stranger's, none Ben's.
  CHECK(speakers["anna"].warnings == std::vector<std::string>{"2 speech(es) without @who credited by their <speaker> label"});
  CHECK(speakers["speaker:stranger"].warnings ==
        std::vector<std::string>{"1 speech(es) without @who credited by their <speaker> label"});
  CHECK(speakers["ben"].warnings.empty());
}

TEST_CASE("one letter per file: the body is the letter, formulae skipped, sender from correspDesc (2.4.6, 4.2.2)") {
  auto letters = read("one-letter.xml", "letter");
  REQUIRE(letters.size() == 1);
  CHECK(words(letters[0]) == split("The new boat is ready and the toll is unchanged I shall come down on Monday"));
  CHECK(letters[0].author == "#p-wren");
  CHECK(letters[0].label == "Tobias Wren");
  CHECK(letters[0].authorship == Authorship::known);
}

TEST_CASE("several letters per file pair with their correspDesc through @decls (16.3.2)") {
  auto letters = by_local_id(read("several-letters-decls.xml", "letter"));
  REQUIRE(letters.size() == 3);
  CHECK(letters["letter-a"].author == "#p-cole");
  CHECK(letters["letter-b"].author == "#p-wren");
  CHECK(letters["letter-c"].author == "#p-lusk");
  CHECK(words(letters["letter-c"]) == split("Rope sent by cart"));
}

TEST_CASE("a teiCorpus's own header holds for its texts: authors, correspDesc; each text named by its own (15.1)") {
  HeaderInfo header;
  auto chapters = by_local_id(read_segments(XmlSource::file(fixture("corpus-header.xml")),
                                            SelectionRules::make("chapter", Preset::reading), nullptr, &header));
  REQUIRE(chapters.size() == 2);
  CHECK(words(chapters["log-1"]) == split("The lamp was lit at six"));
  CHECK(chapters["log-1"].author == "Ada Cole");
  REQUIRE(chapters["log-1"].own_text);
  CHECK(chapters["log-1"].own_text->title == "The Harbour Log");
  CHECK(chapters["log-1"].own_text->author == "Ada Cole");
  CHECK(words(chapters["toll-1"]) == split("The toll is one penny"));
  CHECK(chapters["toll-1"].author == "Reuben Lusk");
  REQUIRE(chapters["toll-1"].own_text);
  CHECK(chapters["toll-1"].own_text->title == "Tolls of the Ferry");
  CHECK(chapters["toll-1"].own_text->author == "Reuben Lusk");
  CHECK(chapters["log-1"].year == 1851);
  CHECK(chapters["log-1"].language == "en");
  CHECK(chapters["toll-1"].year == 1853);
  CHECK(chapters["toll-1"].language == "en-GB");
  CHECK(header.title == "Papers of the Quay");
  CHECK(header.authors == std::vector<std::string>{"Ada Cole"});
  CHECK(first_year(work_date(header)) == 1851);

  auto letters = read("corpus-header.xml", "letter");
  REQUIRE(letters.size() == 1);
  CHECK(letters[0].local_id == "letter-a");
  CHECK(letters[0].author == "#p-wren");
  CHECK(words(letters[0]) == split("Send more oil"));
}

TEST_CASE("a file of one TEI names no text of its own: the file's header is its text's") {
  auto letters = read("several-letters-decls.xml", "letter");
  REQUIRE(!letters.empty());
  for (const auto& letter : letters) CHECK_FALSE(letter.own_text);
}

TEST_CASE("document order pairs a letter with a correspDesc no @decls names; doubted senders (16.3.2, 2.4.6)") {
  auto letters = by_local_id(read("letter-senders.xml", "letter"));
  REQUIRE(letters.size() == 9);
  CHECK(letters["letter-a"].author == "#p-lusk");
  CHECK(letters["letter-a"].warnings.empty());
  CHECK(words(letters["letter-b"]) == split("Bring the lantern down"));
  CHECK(letters["letter-b"].author == "#p-wren");
  CHECK(letters["letter-b"].warnings.size() == 1);
  CHECK(letters["letter-c"].author == "#p-cole");
  CHECK(letters["letter-c"].warnings.size() == 1);
  CHECK(letters["letter-d"].author.empty());
  CHECK(letters["letter-d"].authorship == Authorship::unknown);
  CHECK(letters["letter-d"].warnings.size() == 1);
  CHECK(letters["letter-e"].author.empty());
  CHECK(letters["letter-e"].authorship == Authorship::unknown);
  CHECK(letters["letter-f"].author == "#p-quell");
  CHECK(letters["letter-f"].authorship == Authorship::conjectured);
  CHECK(letters["letter-g"].author == "#p-wren");
  CHECK(letters["letter-g"].authorship == Authorship::conjectured);
  CHECK(letters["letter-h"].author == "#p-cole");
  CHECK(letters["letter-h"].warnings.size() == 1);
  CHECK(letters["letter-i"].author == "#p-lusk");
  CHECK(letters["letter-i"].authorship == Authorship::known);
  CHECK(letters["letter-i"].warnings.empty());
}

TEST_CASE("letters of a teiCorpus: each text's correspDescs its own; no other letter's date (2.4.6, 16.3.2)") {
  auto letters = by_local_id(read("corpus-letters.xml", "letter"));
  REQUIRE(letters.size() == 4);
  CHECK(letters["l1"].author == "#p-wren");
  CHECK(letters["l1"].date == "1850-04-02");
  CHECK(words(letters["l2"]) == split("The oil is low"));
  CHECK(letters["l2"].author.empty());
  CHECK(letters["l2"].authorship == Authorship::unknown);
  CHECK(letters["l2"].warnings.size() == 1);
  CHECK(letters["l2"].date.empty());
  CHECK(letters["l3"].authorship == Authorship::unknown);
  CHECK(letters["l3"].warnings.size() == 1);
  CHECK(letters["l3"].date.empty());
  CHECK(letters["l4"].author == "barnaby quell");
  CHECK(letters["l4"].authorship == Authorship::conjectured);
}

TEST_CASE("plays of a teiCorpus: each play's voices its own; the corpus header's cast names them (15.1, 7.2.2)") {
  auto voices = by_local_id(read("corpus-plays.xml", "speaker"));
  REQUIRE(voices.size() == 4);
  CHECK(words(voices["text2:speaker:chorus"]) == split("Hear the bell Hear it twice"));
  CHECK(voices["text2:keeper"].label == "Old Keeper");
  CHECK(voices["text2:keeper"].author == "keeper");
  CHECK(words(voices["text2:keeper"]) == split("The lamp is lit The oil is gone"));
  CHECK(words(voices["TEI[2]:speaker:chorus"]) == split("The tide is out"));
  CHECK(voices["TEI[2]:keeper"].label == "Old Keeper");
  CHECK(words(voices["TEI[2]:keeper"]) == split("Bring rope"));
}

TEST_CASE("xml:lang is inherited and switches inside a segment (1.3.1.1.2)") {
  auto chapters = read("lang-switch.xml", "chapter");
  REQUIRE(chapters.size() == 1);
  std::map<std::string, std::string> by_language;
  for (const auto& run : chapters[0].runs) by_language[run.language] += run.text + " ";
  auto words_of = [](const std::string& t) {
    Segment s;
    s.runs.push_back(TextRun{t, ""});
    return words(s);
  };
  CHECK(words_of(by_language["en"]) == split("The clerk wrote in the margin and said to the ferryman"));
  CHECK(words_of(by_language["la"]) == split("aqua alta est"));
  CHECK(words_of(by_language["fr"]) == split("à demain mon ami"));
  CHECK(chapters[0].language == "en");
}

TEST_CASE("internal entities declared in the DOCTYPE are expanded (XML 1.0 section 4.4.2)") {
  CHECK(words(read("internal-entities.xml", "whole")[0]) ==
        split("The Quillmouth Ferry Company runs the Quillmouth Ferry Company boat at dawn"));
}

TEST_CASE("UTF-16 with byte-order mark, UTF-8 BOM, CRLF, comments and PIs before the root are read") {
  for (const char* name : {"utf16.xml", "bom.xml", "crlf.xml", "comments-pi.xml"}) {
    INFO(name);
    auto segments = read(name, "whole");
    REQUIRE(segments.size() == 1);
    CHECK(!words(segments[0]).empty());
  }
}

TEST_CASE("a segment without xml:id gets a TEI xpath() pointer to its element (17.2.4)") {
  auto speakers = by_local_id(read("missing-who.xml", "speaker"));
  const auto& pointers = speakers["speaker:stranger"].pointers;
  REQUIRE(pointers.size() == 1);
  CHECK(pointers[0].rfind("xpath(/TEI[1]/text[1]/body[1]/", 0) == 0);
}

// TEI P5 2.2.1: titleStmt/author holds the author's name, and may hold an idno (13.3.1) with
// an identifier; an anonymous work names a placeholder. The label is the name alone, and a
// placeholder (here DraCor's "(Anonym)" with Wikidata's "anonymous", Q4233718, from memory)
// leaves the text without a known author, so attribution questions it.
TEST_CASE("the header author is its name without idno identifiers; an anonymous author is unknown (2.2.1, 13.3.1)") {
  auto whole = [](const std::string& author) {
    const std::string xml =
        "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\"><teiHeader><fileDesc><titleStmt><title>Der Fährmann</title>"
        "<author>" + author + "</author></titleStmt><publicationStmt><p>invented</p></publicationStmt>"
        "<sourceDesc><p>invented</p></sourceDesc></fileDesc></teiHeader>"
        "<text><body><p>Am Ufer wartet der Fährmann.</p></body></text></TEI>";
    auto segments = read_segments(XmlSource::buffer("author.xml", xml.data(), xml.size()), SelectionRules::make("whole", Preset::reading));
    REQUIRE(segments.size() == 1);
    return segments[0];
  };
  Segment named = whole("<persName><forename>Hanne</forename> <surname>Quillfeld</surname></persName>"
                        "<idno type=\"wikidata\">Q000</idno><idno type=\"pnd\">000</idno>");
  CHECK(named.author == "Hanne Quillfeld");
  CHECK(named.authorship == Authorship::known);
  Segment anonymous = whole("<persName>(Anonym)</persName><idno type=\"wikidata\">Q4233718</idno>");
  CHECK(anonymous.author.empty());
  CHECK(anonymous.authorship == Authorship::unknown);
}
