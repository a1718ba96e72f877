#include "tei/xpath_units.h"

#include <libxml/parser.h>
#include <libxml/xpath.h>
#include <libxml/xpathInternals.h>

#include <algorithm>
#include <cctype>
#include <memory>

#include "core/error.h"
#include "tei/xml_error_text.h"
#include "tei/xpath_name_hint.h"

namespace manicule {

namespace {

struct XPathErrors {
  std::string message;
};

void on_xpath_error(void* user, xmlErrorPtr error) {
  auto errors = static_cast<XPathErrors*>(user);
  if (errors->message.empty() && error && error->message) errors->message = one_line_message(error->message);
}

std::string not_elements_message(const std::string& expression) {
  return "the XPath '" + expression +
         "' selects attributes, text or the document, not elements (e.g. //tei:sp rather than //tei:sp/@who)";
}

// Element ordinal path (1-based position among element siblings, from the root).
std::vector<int> ordinal_path(xmlNodePtr node) {
  std::vector<int> path;
  for (xmlNodePtr n = node; n && n->type == XML_ELEMENT_NODE; n = n->parent) {
    int position = 1;
    for (xmlNodePtr p = n->prev; p; p = p->prev)
      if (p->type == XML_ELEMENT_NODE) ++position;
    path.push_back(position);
  }
  return {path.rbegin(), path.rend()};
}

// The last location step of each branch of a union ("a/b | c/@d" gives "b" and "@d"),
// read outside string literals, predicates and parentheses.
std::vector<std::string> last_steps(const std::string& expression) {
  std::vector<std::string> steps;
  std::string step;
  int depth = 0;
  char quote = 0;
  for (char c : expression) {
    if (quote) {  // inside a string literal, whatever its characters
      if (c == quote) quote = 0;
      step += c;
      continue;
    }
    if (c == '\'' || c == '"') quote = c;
    if (c == '[' || c == '(') ++depth;
    if ((c == ']' || c == ')') && depth > 0) --depth;
    if (depth == 0 && c == '|') {
      steps.push_back(step);
      step.clear();
    } else if (depth == 0 && c == '/') {
      step.clear();
    } else {
      step += c;
    }
  }
  steps.push_back(step);
  for (std::string& s : steps)  // "attribute :: who" as "attribute::who"
    s.erase(std::remove_if(s.begin(), s.end(), [](char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\n'; }),
            s.end());
  return steps;
}

bool selects_no_element(const std::string& step);

// Whether every branch of `expression` ends on a step that gives no element.
bool no_branch_selects_elements(const std::string& expression) {
  const std::vector<std::string> steps = last_steps(expression);
  return std::all_of(steps.begin(), steps.end(), selects_no_element);
}

// Whether a location step can only give attributes, text, comments, processing
// instructions or namespaces, never an element: "@who", "attribute::who", "child::text()",
// "(//tei:sp/@who)[1]" (a bracketed expression, read inside its brackets); or, empty, the
// document itself ("/").
bool selects_no_element(const std::string& step) {
  if (step.empty()) return true;
  if (step.front() == '(') {
    int depth = 0;
    char quote = 0;
    for (std::size_t i = 0; i < step.size(); ++i) {
      if (quote) {  // a bracket inside a string literal is text
        if (step[i] == quote) quote = 0;
      } else if (step[i] == '\'' || step[i] == '"') {
        quote = step[i];
      } else if (step[i] == '(') {
        ++depth;
      } else if (step[i] == ')' && --depth == 0) {
        return no_branch_selects_elements(step.substr(1, i - 1));
      }
    }
    return false;
  }
  if (step.front() == '@') return true;
  std::string test = step;
  const std::size_t axis_end = step.find("::");
  if (axis_end != std::string::npos && step.find_first_of("[(") > axis_end) {
    const std::string axis = step.substr(0, axis_end);
    if (axis == "attribute" || axis == "namespace") return true;
    test = step.substr(axis_end + 2);
  }
  for (const char* start : {"text(", "comment(", "processing-instruction("})
    if (test.rfind(start, 0) == 0) return true;
  return false;
}

}  // namespace

// The editor's XPath evaluated on `doc`, with the prefix "tei" bound to the TEI namespace:
// the ordinal paths of the elements it selects. Error(usage) if it does not compile or
// gives something other than nodes.
std::set<std::vector<int>> select_elements(xmlDocPtr doc, const std::string& expression) {
  std::unique_ptr<xmlXPathContext, void (*)(xmlXPathContextPtr)> ctx(xmlXPathNewContext(doc), xmlXPathFreeContext);
  XPathErrors errors;
  ctx->error = on_xpath_error;
  ctx->userData = &errors;
  xmlXPathRegisterNs(ctx.get(), BAD_CAST "tei", BAD_CAST "http://www.tei-c.org/ns/1.0");
  // Relative paths (".//tei:sp", "*") from the root element, as lxml's tree.xpath() and
  // most XPath tools take them; libxml2 leaves the context node unset, so they found nothing.
  ctx->node = xmlDocGetRootElement(doc);
  std::unique_ptr<xmlXPathObject, void (*)(xmlXPathObjectPtr)> result(
      xmlXPathEvalExpression(BAD_CAST expression.c_str(), ctx.get()), xmlXPathFreeObject);
  if (!result) {
    throw Error(ErrorKind::usage, "the XPath '" + expression + "' does not compile" +
                                      (errors.message.empty() ? "" : ": " + errors.message) +
                                      " (TEI elements need the prefix tei:, e.g. //tei:div[@type='poem'])");
  }
  std::set<std::vector<int>> targets;
  if (result->type == XPATH_NODESET) {
    // Attributes, text, the document node: nothing a segment can be, so passed by. (A unit
    // that can select nothing else is refused before any file is read, check_xpath_unit; a
    // union may select elements in one file and attributes alone in another.)
    if (result->nodesetval)
      for (int i = 0; i < result->nodesetval->nodeNr; ++i) {
        xmlNodePtr node = result->nodesetval->nodeTab[i];
        if (node->type == XML_ELEMENT_NODE) targets.insert(ordinal_path(node));
      }
  } else {
    throw Error(ErrorKind::usage, "the XPath '" + expression + "' does not select elements");
  }
  return targets;
}

std::string unprefixed_name_hint(const std::string& unit) {
  constexpr std::string_view kPrefix = "xpath:";
  if (unit.rfind(kPrefix, 0) != 0) return {};
  // Every location step outside predicates and string literals ("//div/tei:p", "(//lg)[1]",
  // "a | b"), each judged by its node test: a bare name ("lg", "child::lg") is the mistake;
  // a prefixed one, "*", "." and a name followed by "(" (text(), a function) are not.
  const std::string expression = unit.substr(kPrefix.size());
  std::string step;
  int brackets = 0;
  char quote = 0;
  auto judge = [&](char next) -> std::string {
    std::string test = step;
    step.clear();
    test.erase(std::remove_if(test.begin(), test.end(), [](char c) { return std::isspace(static_cast<unsigned char>(c)); }),
               test.end());
    if (const std::size_t axis_end = test.find("::"); axis_end != std::string::npos) test.erase(0, axis_end + 2);
    const bool name = next != '(' && !test.empty() &&
                      (std::isalpha(static_cast<unsigned char>(test.front())) || test.front() == '_') &&
                      std::all_of(test.begin(), test.end(), [](char c) {
                        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-' || c == '.';
                      });
    return name ? test : std::string();
  };
  std::string found;
  for (const char c : expression + '/') {
    if (quote) {
      if (c == quote) quote = 0;
      continue;
    }
    if (c == '\'' || c == '"') {
      quote = c;
      continue;
    }
    if (c == '[' && brackets++ == 0) {
      if (found.empty()) found = judge('[');
      continue;
    }
    if (c == ']' && brackets > 0) {
      --brackets;
      continue;
    }
    if (brackets > 0) continue;
    if (c == '/' || c == '|' || c == '(' || c == ')') {
      const std::string name = judge(c);
      if (found.empty()) found = name;
    } else {
      step += c;
    }
  }
  if (found.empty()) return {};
  return "; '" + found + "' names an element outside any namespace, and TEI's are in TEI's own: write tei:" + found;
}

void check_xpath_unit(const std::string& expression) {
  static const char kEmptyTei[] = "<TEI xmlns=\"http://www.tei-c.org/ns/1.0\"/>";
  std::unique_ptr<xmlDoc, void (*)(xmlDocPtr)> doc(
      xmlReadMemory(kEmptyTei, sizeof kEmptyTei - 1, "unit.xml", nullptr, XML_PARSE_NONET), xmlFreeDoc);
  if (!doc) throw Error(ErrorKind::internal, "could not make the document that checks an XPath");
  select_elements(doc.get(), expression);
  // An empty document selects nothing, attributes neither: what a path ends on is read
  // from the expression itself, so that a batch does not record every file as failing.
  if (no_branch_selects_elements(expression)) throw Error(ErrorKind::usage, not_elements_message(expression));
}

}  // namespace manicule
