#include "standoff/splice_check.h"

#include <map>
#include <set>

#include "core/error.h"
#include "standoff/edition_splice.h"
#include "tei/xml_events.h"

namespace manicule {

namespace {

class SpliceChecker : public XmlEventHandler {
 public:
  explicit SpliceChecker(const SpliceExpectations& e) : expected_(e) {
    for (const auto& id : e.added_ids) added_seen_[id] = 0;
  }

  void start(const StartTag& tag) override {
    std::string local(tag.local);
    bool tei = tag.in_tei_namespace;
    std::string id(tag.attribute("id", kXmlNamespace));
    if (!id.empty() && added_seen_.count(id)) ++added_seen_[id];
    // Ids hidden in entity text are invisible to the byte scan: catch clashes with ours.
    if (id.rfind(kOurIdPrefix, 0) == 0 && !ours_seen_.insert(id).second)
      problem("the xml:id \"" + id + "\" occurs twice");
    if (tei && local == "standOff" && id == expected_.standoff_id) {
      ++standoffs_;
      if (stack_.size() != 1) problem("our standOff is not a child of the root element");
    }
    if (tei && local == "application" && !expected_.application_id.empty() && id == expected_.application_id) {
      ++applications_;
      if (!path_is({"teiHeader", "encodingDesc", "appInfo"})) problem("our application is not in teiHeader/encodingDesc/appInfo");
    }
    if (tei && local == "change" && tag.attribute("target") == "#" + expected_.standoff_id && !in_standoff()) {
      ++changes_;
      if (!path_is({"teiHeader", "revisionDesc"}) && !path_is({"teiHeader", "revisionDesc", "listChange"}))
        problem("our change is not in teiHeader/revisionDesc");
    }
    stack_.push_back(Frame{tei ? local : "{" + std::string(tag.ns) + "}" + local, tei && local == "standOff" && id == expected_.standoff_id});
  }
  void end() override { stack_.pop_back(); }
  void text(std::string_view) override {}

  void finish(const std::string& name) {
    if (standoffs_ != 1) problem("our standOff was found " + std::to_string(standoffs_) + " times instead of once");
    if (!expected_.application_id.empty() && applications_ != 1)
      problem("our application was found " + std::to_string(applications_) + " times instead of once");
    if (expected_.change && changes_ != 1)
      problem("our change was found " + std::to_string(changes_) + " times instead of once");
    for (const auto& [id, n] : added_seen_)
      if (n != 1) problem("the added xml:id \"" + id + "\" occurs " + std::to_string(n) + " times");
    if (!problem_.empty())
      throw Error(ErrorKind::internal, "the spliced document failed its check (" + problem_ + "); nothing was written",
                  name);
  }

 private:
  struct Frame {
    std::string name;
    bool our_standoff;
  };
  bool in_standoff() const {
    for (const auto& f : stack_)
      if (f.our_standoff) return true;
    return false;
  }
  // The open elements below the root are exactly `names`.
  bool path_is(std::initializer_list<const char*> names) const {
    if (stack_.size() != names.size() + 1) return false;
    std::size_t i = 1;
    for (const char* n : names)
      if (stack_[i++].name != n) return false;
    return true;
  }
  void problem(const std::string& what) {
    if (problem_.empty()) problem_ = what;
  }

  const SpliceExpectations& expected_;
  std::vector<Frame> stack_;
  std::map<std::string, int> added_seen_;
  std::set<std::string> ours_seen_;
  int standoffs_ = 0, applications_ = 0, changes_ = 0;
  std::string problem_;
};

}  // namespace

void check_spliced(std::string_view bytes, const std::string& name, const SpliceExpectations& expected) {
  SpliceChecker checker(expected);
  try {
    parse_xml(XmlSource::buffer(name, bytes.data(), bytes.size()), checker);
  } catch (const Error& e) {
    throw Error(ErrorKind::internal,
                std::string("the spliced document is not well-formed (") + e.what() + "); nothing was written", name);
  }
  checker.finish(name);
}

}  // namespace manicule
