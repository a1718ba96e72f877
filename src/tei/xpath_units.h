// Units given as an XPath (--unit xpath:EXPR): the expression evaluated on a document's
// tree, with the prefix "tei" bound to the TEI namespace, gives the elements that make
// segments, as ordinal paths the streaming reader recognises (1-based position among
// element siblings, from the root).
#pragma once
#include <libxml/tree.h>

#include <set>
#include <string>
#include <vector>

namespace manicule {

// The ordinal paths of the elements `expression` selects in `doc`. Error(usage) if it does
// not compile, or gives a number or a string rather than nodes; attributes and text among
// the nodes are passed by (a union may give them alone in one file and elements in another).
std::set<std::vector<int>> select_elements(xmlDocPtr doc, const std::string& expression);

// Error(usage) for an xpath: unit that cannot select elements in any file (it does not
// compile, uses a prefix other than tei:, gives a number or a string, or ends on attributes
// or text in every branch of a union, as //tei:sp/@who), found before any file is read: a batch would otherwise record every file as failing.
void check_xpath_unit(const std::string& expression);

}  // namespace manicule
