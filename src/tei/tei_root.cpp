#include "tei/tei_root.h"

#include "core/error.h"

namespace manicule {

void require_tei_root(const StartTag& root, const std::string& file, std::string_view what_then) {
  if (root.in_tei_namespace && (root.local == "TEI" || root.local == "teiCorpus")) return;
  const std::string got = root.ns.empty() ? "<" + std::string(root.local) + "> in no namespace"
                                          : "<" + std::string(root.local) + "> in namespace " + std::string(root.ns);
  throw Error(ErrorKind::bad_input, "not a TEI document: the root element is " + got + std::string(what_then), file,
              root.line);
}

}  // namespace manicule
