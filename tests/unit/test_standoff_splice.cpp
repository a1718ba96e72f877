// The byte scanner and the splice planner of src/standoff: offsets in tricky markup,
// where each insertion goes (TEI P5 4.12.0 content models: standOff in model.resource;
// teiHeader = fileDesc, model.teiHeaderPart*, revisionDesc?), exact expected bytes
// written out by hand, and that taking our insertions out gives back the input.
#include <catch2/catch.hpp>

#include <string>

#include "core/error.h"
#include "standoff/edition_splice.h"
#include "standoff/xml_scan.h"

using namespace manicule;

namespace {

SpliceFragments fragments() {
  SpliceFragments f;
  f.standoff = XmlNode::element("standOff", {{"xml:id", "mcl-standoff"}, {"type", "stylometry"}});
  XmlNode& values = f.standoff.add(XmlNode::element("fvLib"));
  values.add(XmlNode::element("fs", {{"type", "x"}}));
  values.add(XmlNode::element("fs", {{"type", "y"}}));
  XmlNode app = XmlNode::element("application", {{"xml:id", "mcl-app"}, {"ident", "manicule"}, {"version", "1"}});
  app.add_text_element("label", "m");
  f.application = app;
  XmlNode change = XmlNode::element("change", {{"when", "2026-01-01"}, {"target", "#mcl-standoff"}});
  change.add(XmlNode::text_node("done"));
  f.change = change;
  f.encoding_desc_id = "mcl-encodingDesc";
  f.app_info_id = "mcl-appInfo";
  f.revision_desc_id = "mcl-revisionDesc";
  return f;
}

std::string annotate(const std::string& doc, SplicePlan* plan_out = nullptr) {
  ScannedDocument scan = scan_xml(doc, "test.xml");
  SplicePlan plan = plan_splice(scan, doc, fragments(), false);
  if (plan_out) *plan_out = plan;
  return with_insertions(doc, plan.insertions);
}

std::string strip(const std::string& doc) {
  ScannedDocument scan = scan_xml(doc, "test.xml");
  return without_ranges(doc, previous_results(scan, doc));
}

int element_at(const ScannedDocument& doc, const std::string& bytes, const std::string& marker) {
  std::size_t at = bytes.find(marker);
  for (std::size_t i = 0; i < doc.elements.size(); ++i)
    if (doc.elements[i].start_begin == at) return static_cast<int>(i);
  return -1;
}

}  // namespace

TEST_CASE("scanner: markup hidden in comments, CDATA, PIs, literals and attribute values", "[standoff]") {
  const std::string doc =
      "\xEF\xBB\xBF<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
      "<!DOCTYPE TEI [\n  <!ENTITY plain \"a ]> b\">\n  <!-- ]> <text> -->\n  <?pi ]>?>\n"
      "  <!ENTITY tags '<hi>x</hi>'>\n]>\n"
      "<!-- <standOff> before the root -->\n<?pi <text>?>\n"
      "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\" rend=\"a>b\" n='it&apos;s &amp; &#x3E;'>\n"
      "  <teiHeader><fileDesc/></teiHeader>\n"
      "  <text><body><p><![CDATA[</TEI><standOff>]]>&plain;</p><p>&tags;</p></body></text>\n"
      "</TEI>\n";
  ScannedDocument scan = scan_xml(doc, "t.xml");
  CHECK(scan.bom_size == 3);
  CHECK(scan.declared_encoding == "UTF-8");
  REQUIRE(scan.elements.size() == 7);
  const ScannedElement& root = scan.root();
  CHECK(root.name == "TEI");
  CHECK(root.start_begin == doc.find("<TEI"));
  CHECK(*root.attribute("rend") == "a>b");
  CHECK(*root.attribute("n") == "it's & >");
  CHECK(root.end_begin == doc.rfind("</TEI>"));
  int text = scan.first_child_named(0, "text");
  REQUIRE(text >= 0);
  CHECK(scan.elements[static_cast<std::size_t>(text)].preceding_content_end == doc.find("</teiHeader>") + 12);
  // &plain; holds no markup; &tags; does, and is seen.
  int p2 = static_cast<int>(scan.elements.size()) - 1;
  CHECK(scan.elements[static_cast<std::size_t>(p2)].markup_entity);
  CHECK_FALSE(scan.elements[static_cast<std::size_t>(p2 - 1)].markup_entity);
  CHECK(scan.markup_entity_in_root);
}

TEST_CASE("scanner: same-name positions and xpath() pointers", "[standoff]") {
  const std::string doc =
      "<TEI><text><body><div/><p/><div><sp/><sp xml:id=\"s2\"/></div></body></text></TEI>";
  ScannedDocument scan = scan_xml(doc, "t.xml");
  int second_sp = resolve_xpath_pointer(scan, "xpath(/TEI[1]/text[1]/body[1]/div[2]/sp[2])");
  REQUIRE(second_sp >= 0);
  CHECK(*scan.elements[static_cast<std::size_t>(second_sp)].attribute("xml:id") == "s2");
  CHECK(resolve_xpath_pointer(scan, "xpath(/TEI[1]/text[1]/body[1]/div[3])") == -1);
  CHECK(scan.xml_ids.count("s2") == 1);
  Insertion id = id_insertion(scan, resolve_xpath_pointer(scan, "xpath(/TEI[1]/text[1]/body[1]/div[1])"), "d1");
  CHECK(with_insertions(doc, {id}).find("<div xml:id=\"d1\"/><p/>") != std::string::npos);
}

TEST_CASE("scanner: malformed markup is refused", "[standoff]") {
  CHECK_THROWS_AS(scan_xml("<TEI><a></b></TEI>", "t.xml"), Error);
  CHECK_THROWS_AS(scan_xml("<TEI><!-- open </TEI>", "t.xml"), Error);
  CHECK_THROWS_AS(scan_xml("<TEI a=\"<\"/>", "t.xml"), Error);
  CHECK_THROWS_AS(scan_xml("<TEI/><TEI/>", "t.xml"), Error);
}

TEST_CASE("splice: a play with a standOff of its own and a listChange", "[standoff]") {
  const std::string doc =
      "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\">\n"
      "  <teiHeader>\n"
      "    <fileDesc><p/></fileDesc>\n"
      "    <revisionDesc>\n"
      "      <listChange>\n"
      "        <change when=\"2017\">old</change>\n"
      "      </listChange>\n"
      "    </revisionDesc>\n"
      "  </teiHeader>\n"
      "  <standOff>\n"
      "    <listEvent/>\n"
      "  </standOff>\n"
      "  <text/>\n"
      "</TEI>\n";
  const std::string expected =
      "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\">\n"
      "  <teiHeader>\n"
      "    <fileDesc><p/></fileDesc>\n"
      "    <encodingDesc xml:id=\"mcl-encodingDesc\">\n"
      "      <appInfo xml:id=\"mcl-appInfo\">\n"
      "        <application xml:id=\"mcl-app\" ident=\"manicule\" version=\"1\"><label>m</label></application>\n"
      "      </appInfo>\n"
      "    </encodingDesc>\n"
      "    <revisionDesc>\n"
      "      <listChange>\n"
      "        <change when=\"2026-01-01\" target=\"#mcl-standoff\">done</change>\n"
      "        <change when=\"2017\">old</change>\n"
      "      </listChange>\n"
      "    </revisionDesc>\n"
      "  </teiHeader>\n"
      "  <standOff>\n"
      "    <listEvent/>\n"
      "  </standOff>\n"
      "  <standOff xml:id=\"mcl-standoff\" type=\"stylometry\">\n"
      "    <fvLib>\n"
      "      <fs type=\"x\"/>\n"
      "      <fs type=\"y\"/>\n"
      "    </fvLib>\n"
      "  </standOff>\n"
      "  <text/>\n"
      "</TEI>\n";
  std::string out = annotate(doc);
  CHECK(out == expected);
  CHECK(strip(out) == doc);
  // A run over an edition holding an earlier run's results (other values in our fvLib)
  // takes them out (as prepare_annotation does before splicing) and writes the same again.
  std::string older = out;
  const std::string value = "<fs type=\"y\"/>";
  REQUIRE(older.find(value) != std::string::npos);
  older.replace(older.find(value), value.size(), "<fs type=\"y-earlier\"/>");
  CHECK(annotate(strip(older)) == expected);
}

TEST_CASE("splice: no standOff, encodingDesc with appInfo, CRLF and tabs", "[standoff]") {
  const std::string doc =
      "<TEI>\r\n"
      "\t<teiHeader>\r\n"
      "\t\t<fileDesc/>\r\n"
      "\t\t<encodingDesc>\r\n"
      "\t\t\t<appInfo>\r\n"
      "\t\t\t\t<application ident=\"other\" version=\"2\"><label>o</label></application>\r\n"
      "\t\t\t</appInfo>\r\n"
      "\t\t</encodingDesc>\r\n"
      "\t\t<revisionDesc><change when=\"2019\">x</change></revisionDesc>\r\n"
      "\t</teiHeader>\r\n"
      "<!-- c -->\r\n"
      "<text/>\r\n"
      "</TEI>";
  std::string out = annotate(doc);
  CHECK(out.find("</application>\r\n\t\t\t\t<application xml:id=\"mcl-app\"") != std::string::npos);
  CHECK(out.find("<revisionDesc>\r\n\t\t\t<change when=\"2026-01-01\"") != std::string::npos);
  // after the comment that stands before <text>, at <text>'s indentation (none)
  CHECK(out.find("<!-- c -->\r\n<standOff xml:id=\"mcl-standoff\" type=\"stylometry\">\r\n\t<fvLib>\r\n") !=
        std::string::npos);
  CHECK(out.find("\n\n") == std::string::npos);
  for (std::size_t i = out.find('\n'); i != std::string::npos; i = out.find('\n', i + 1)) REQUIRE(out[i - 1] == '\r');
  CHECK(strip(out) == doc);
}

TEST_CASE("splice: prefixed TEI, no header wrappers, no text", "[standoff]") {
  const std::string doc =
      "<tei:TEI xmlns:tei=\"http://www.tei-c.org/ns/1.0\"><tei:teiHeader><tei:fileDesc/></tei:teiHeader></tei:TEI>";
  std::string out = annotate(doc);
  CHECK(out.find("<tei:fileDesc/>\n    <tei:encodingDesc xml:id=\"mcl-encodingDesc\">") != std::string::npos);
  CHECK(out.find("<tei:revisionDesc xml:id=\"mcl-revisionDesc\">") != std::string::npos);
  CHECK(out.find("</tei:teiHeader>\n  <tei:standOff") != std::string::npos);
  CHECK(strip(out) == doc);
}

TEST_CASE("splice: what cannot take a change is reported, not forced", "[standoff]") {
  const std::string doc = "<TEI><teiHeader><fileDesc/><revisionDesc/></teiHeader><text/></TEI>";
  SplicePlan plan;
  std::string out = annotate(doc, &plan);
  REQUIRE(plan.notes.size() == 1);
  CHECK(out.find("<change") == std::string::npos);
  CHECK(out.find("<revisionDesc/>") != std::string::npos);
}

TEST_CASE("splice: an entity that may hide elements in the header is refused", "[standoff]") {
  const std::string doc =
      "<!DOCTYPE TEI [<!ENTITY enc \"<encodingDesc><p/></encodingDesc>\">]>"
      "<TEI><teiHeader><fileDesc/>&enc;</teiHeader><text/></TEI>";
  ScannedDocument scan = scan_xml(doc, "t.xml");
  CHECK_THROWS_AS(plan_splice(scan, doc, fragments(), false), Error);
}

TEST_CASE("splice: wrappers that hold more than ours stay when ours go", "[standoff]") {
  const std::string doc =
      "<TEI><teiHeader><fileDesc/><encodingDesc xml:id=\"mcl-encodingDesc\"><appInfo xml:id=\"mcl-appInfo\">"
      "<application ident=\"manicule\" version=\"0\"/></appInfo><p>editor's note</p></encodingDesc></teiHeader>"
      "<text/></TEI>";
  std::string out = strip(doc);
  CHECK(out == "<TEI><teiHeader><fileDesc/><encodingDesc xml:id=\"mcl-encodingDesc\"><p>editor's note</p>"
               "</encodingDesc></teiHeader><text/></TEI>");
}

TEST_CASE("splice: ASCII-only insertions for legacy encodings", "[standoff]") {
  const std::string doc = "<?xml version=\"1.0\" encoding=\"ISO-8859-1\"?><TEI><teiHeader><fileDesc/></teiHeader></TEI>";
  SpliceFragments f = fragments();
  f.standoff.add_text_element("note", "Gr\xC3\xA4" "fin");
  ScannedDocument scan = scan_xml(doc, "t.xml");
  std::string out = with_insertions(doc, plan_splice(scan, doc, f, true).insertions);
  CHECK(out.find("<note>Gr&#xE4;fin</note>") != std::string::npos);
}
