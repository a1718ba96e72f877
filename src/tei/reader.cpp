#include "tei/reader.h"

#include <libxml/parser.h>

#include <memory>
#include <set>

#include "core/error.h"
#include "core/regular_file.h"
#include "core/segment_id_prefixes.h"
#include "tei/tei_walker.h"
#include "tei/xml_error_text.h"
#include "tei/xpath_units.h"

namespace manicule {

namespace {

// The first error of the tree's parse, kept rather than printed by libxml2.
struct TreeErrors {
  std::string message;
  long line = 0;
};

void on_tree_error(void* user, xmlErrorPtr error) {
  auto ctxt = static_cast<xmlParserCtxtPtr>(user);
  auto errors = static_cast<TreeErrors*>(ctxt->_private);
  if (!errors || !error || error->level < XML_ERR_ERROR || !errors->message.empty()) return;
  errors->message = one_line_message(error->message);
  errors->line = error->line;
}

// Evaluates the editor's XPath on a tree parsed without entity substitution or any
// loading (safe), within libxml2's limits for trees.
std::set<std::vector<int>> evaluate_xpath(const XmlSource& source, const std::string& expression) {
  const int options = XML_PARSE_NONET | XML_PARSE_NOWARNING | XML_PARSE_NOERROR | XML_PARSE_NOCDATA;
  std::unique_ptr<xmlParserCtxt, void (*)(xmlParserCtxtPtr)> ctxt(xmlNewParserCtxt(), xmlFreeParserCtxt);
  if (!ctxt) throw Error(ErrorKind::internal, "could not create an XML parser", source.name);
  TreeErrors errors;
  ctxt->_private = &errors;
  ctxt->sax->serror = on_tree_error;
  std::unique_ptr<xmlDoc, void (*)(xmlDocPtr)> doc(nullptr, xmlFreeDoc);
  if (source.data) {
    doc.reset(xmlCtxtReadMemory(ctxt.get(), source.data, static_cast<int>(source.size), source.name.c_str(), nullptr,
                                options));
  } else {
    // Opened as the streaming reader opens it (a named pipe, which would block for ever, is
    // refused), and handed to libxml2 open.
    std::unique_ptr<std::FILE, int (*)(std::FILE*)> file(open_regular_file(source.name), std::fclose);
    doc.reset(xmlCtxtReadFd(ctxt.get(), fileno(file.get()), source.name.c_str(), nullptr, options));
  }
  if (!doc)
    throw Error(ErrorKind::bad_input,
                (errors.message.empty() ? std::string("malformed XML") : errors.message) +
                    " (an xpath: unit reads the document as a tree first, within libxml2's limits for trees: "
                    "256 levels of elements, 10 MB a text node)",
                source.name, errors.line);
  return select_elements(doc.get(), expression);
}

}  // namespace

std::vector<Segment> read_segments(const XmlSource& source, const SelectionRules& rules, SourceDigest* digest,
                                   HeaderInfo* header) {
  std::set<std::vector<int>> targets;
  if (rules.unit == UnitKind::xpath) {
    try {
      targets = evaluate_xpath(source, rules.xpath);
    } catch (const Error& e) {
      if (e.kind() != ErrorKind::bad_input) throw;
      // A malformed document is told in the streaming reader's words (a file cut short, with
      // the line its open element began on); only a tree's own limits are told as above.
      TeiWalker probe(rules, source.name, file_stem(source.name), &targets);
      parse_xml(source, probe);
      throw;
    }
  }
  TeiWalker walker(rules, source.name, file_stem(source.name), &targets);
  SourceDigest d = parse_xml(source, walker);
  if (digest) *digest = d;
  if (header) *header = walker.file_header();
  return walker.finish();
}

}  // namespace manicule
