// Unit tests for labels: the CSV format of label_file.h (RFC 4180 quoting, header,
// comments, errors with line numbers) and the segment roles of segment_roles.h on a
// small hand-made Analysis.
#include <catch2/catch.hpp>

#include "attribution/label_file.h"
#include "attribution/segment_roles.h"
#include "core/error.h"

using namespace manicule;

TEST_CASE("labels files: header, quotes, comments", "[attribution]") {
  const auto rows = parse_label_file(
      "\xEF\xBB\xBFsegment,label\n"
      "# a comment\n"
      "\n"
      "a#1,Jane Austen\n"
      "\"b#2\",\"Brontë, Charlotte\"\r\n"
      "c#3,\"the \"\"other\"\" hand\"\n"
      "d#4,\n",
      "labels.csv");
  REQUIRE(rows.size() == 4);
  CHECK(rows[0].segment == "a#1");
  CHECK(rows[0].label == "Jane Austen");
  CHECK(rows[0].line == 4);
  CHECK(rows[1].label == "Brontë, Charlotte");
  CHECK(rows[2].label == "the \"other\" hand");
  CHECK(rows[3].label.empty());  // questioned
  CHECK(rows[3].line == 7);
}

TEST_CASE("labels files: errors name the line", "[attribution]") {
  auto message_of = [](const std::string& text) {
    try {
      parse_label_file(text, "l.csv");
    } catch (const Error& e) {
      CHECK(e.kind() == ErrorKind::bad_input);
      return std::string(e.what());
    }
    return std::string("no error");
  };
  CHECK(message_of("a#1,x,y\n").find("l.csv:1:") == 0);
  CHECK(message_of("a#1,x\nb\n").find("l.csv:2:") == 0);
  CHECK(message_of("a#1,x\na#1,y\n").find("labelled twice") != std::string::npos);
  CHECK(message_of("a#1,\"open\n").find("never closed") != std::string::npos);
  CHECK(message_of(",x\n").find("empty") != std::string::npos);
  // A file with no row at all (or only the header) is most likely the wrong file.
  CHECK(message_of("").find("no labelled row") != std::string::npos);
  CHECK(message_of("segment,label\n# nothing yet\n").find("no labelled row") != std::string::npos);
}

namespace {
SegmentSummary summary(const std::string& id, const std::string& unit, const std::string& author, Authorship a,
                       std::size_t tokens) {
  SegmentSummary s;
  s.id = id;
  s.file = id.substr(0, id.find('#')) + ".xml";
  s.unit = unit;
  s.author = author;
  s.authorship = a;
  s.tokens = tokens;
  return s;
}
}  // namespace

TEST_CASE("segment roles from the edition and a labels file", "[attribution]") {
  Analysis a;
  a.segments = {summary("p#anna", "speaker", "anna", Authorship::known, 3000),
                summary("q#anna", "speaker", "anna", Authorship::known, 3000),
                summary("l#1", "letter", "#x", Authorship::known, 3000),
                summary("l#2", "letter", "#x", Authorship::conjectured, 3000),
                summary("l#3", "letter", "", Authorship::unknown, 3000),
                summary("l#4", "letter", "#y", Authorship::known, 100)};
  a.table_rows = {0, 1, 2, 3, 4};  // l#4 was too short to be measured
  AttributionOptions options;
  SegmentRoles roles = assign_roles(a, options);
  // Speaker ids are local to their play: two plays' "anna" are two candidates.
  CHECK(roles.label[0] == "p#anna");
  CHECK(roles.label[1] == "q#anna");
  CHECK(roles.role[3] == SegmentRole::questioned);
  CHECK(roles.conjecture[3] == "#x");
  CHECK(roles.role[4] == SegmentRole::questioned);
  CHECK(roles.role[5] == SegmentRole::unmeasured);
  CHECK(roles.candidates == std::vector<std::string>{"#x", "p#anna", "q#anna"});
  REQUIRE(roles.warnings.size() == 1);  // "#y": its only letter is below the minimum
  CHECK(roles.warnings[0].find("'#y'") != std::string::npos);

  options.labels = {{"l#1", "", 2, "f.csv"}, {"l#3", "#z", 3, "f.csv"}};
  roles = assign_roles(a, options);
  CHECK(roles.role[2] == SegmentRole::questioned);  // the file questions what the edition says
  CHECK(roles.label[4] == "#z");

  options.labels = {{"l#9", "#z", 5, "f.csv"}};
  try {
    assign_roles(a, options);
    FAIL("an unknown segment must be an error");
  } catch (const Error& e) {
    CHECK(e.kind() == ErrorKind::bad_input);
    CHECK(std::string(e.what()).find("f.csv:5:") == 0);
    CHECK(std::string(e.what()).find("'l#9'") != std::string::npos);
  }
}
