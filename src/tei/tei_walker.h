// TeiWalker: the selection state machine. It receives the element and text events of one
// file (from the streaming parser) and builds the segments of the requested unit: it
// opens a unit at each unit element, leaves out skipped subtrees (keeping their tails),
// resolves choice and app, joins words across <lb break="no"/>, tracks xml:lang, and reads
// the header for speaker names, letter senders, titles and authors.
#pragma once
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "core/segment.h"
#include "tei/header_info.h"
#include "tei/selection_rules.h"
#include "tei/xml_events.h"

namespace manicule {

class TeiWalker : public XmlEventHandler {
 public:
  // `xpath_targets`, for UnitKind::xpath, lists the selected elements by their path of
  // element ordinals from the root (1-based), as found by the XPath pre-pass.
  TeiWalker(const SelectionRules& rules, std::string file, std::string stem,
            const std::set<std::vector<int>>* xpath_targets = nullptr);
  ~TeiWalker() override;

  void start(const StartTag& tag) override;
  void end() override;
  void text(std::string_view chars) override;

  // The finished segments, in document order of their first text.
  std::vector<Segment> finish();

  // The edition's own metadata: the header of the first TEI element seen (empty if none),
  // with a teiCorpus's own title and authors where its header gives them.
  HeaderInfo file_header() const;

 private:
  struct State;
  std::unique_ptr<State> s_;
};

}  // namespace manicule
