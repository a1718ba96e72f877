#include "standoff/edition_splice.h"

#include <algorithm>

#include "core/error.h"

namespace manicule {

namespace {

bool has_our_id(const ScannedElement& e) {
  const std::string* id = e.attribute("xml:id");
  return id && id->rfind(kOurIdPrefix, 0) == 0;
}

bool is_our_application(const ScannedElement& e) {
  const std::string* ident = e.attribute("ident");
  return e.local_name() == "application" && ident && *ident == kOurApplicationIdent;
}

// Our change points at our standOff: some token of @target starts with "#mcl-standoff".
bool is_our_change(const ScannedElement& e) {
  if (e.local_name() != "change") return false;
  const std::string* target = e.attribute("target");
  if (!target) return false;
  std::string marker = "#" + std::string(kOurIdPrefix) + "standoff";
  std::size_t i = 0;
  while (i < target->size()) {
    while (i < target->size() && (*target)[i] == ' ') ++i;
    if (target->compare(i, marker.size(), marker) == 0) return true;
    while (i < target->size() && (*target)[i] != ' ') ++i;
  }
  return false;
}

bool is_our_wrapper(const ScannedElement& e) {
  std::string_view n = e.local_name();
  return (n == "appInfo" || n == "encodingDesc" || n == "revisionDesc") && has_our_id(e);
}

bool is_blank(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

std::size_t blank_run_start(std::string_view bytes, std::size_t at) {
  while (at > 0 && is_blank(bytes[at - 1])) --at;
  return at;
}

class Planner {
 public:
  Planner(const ScannedDocument& doc, std::string_view bytes, bool ascii_only)
      : doc_(doc), bytes_(bytes), ascii_only_(ascii_only) {
    unit_ = "  ";
    const ScannedElement& root = doc.root();
    if (!root.children.empty()) {
      auto root_indent = line_indent(bytes, root.start_begin);
      auto child_indent = line_indent(bytes, el(root.children.front()).start_begin);
      if (root_indent && child_indent && child_indent->size() > root_indent->size() &&
          child_indent->compare(0, root_indent->size(), *root_indent) == 0)
        unit_ = child_indent->substr(root_indent->size());
    }
  }

  const ScannedElement& el(int i) const { return doc_.elements[static_cast<std::size_t>(i)]; }

  std::string indent_of(int i) const {
    if (auto indent = line_indent(bytes_, el(i).start_begin)) return *indent;
    std::string out;
    for (int p = el(i).parent; p >= 0; p = el(p).parent) out += unit_;
    return out;
  }

  std::string child_indent(int parent) const {
    for (int c : el(parent).children)
      if (auto indent = line_indent(bytes_, el(c).start_begin)) return *indent;
    return indent_of(parent) + unit_;
  }

  // Refuses to write into an element whose content a markup entity may hide.
  void require_plain(int i) const {
    if (el(i).markup_entity) {
      throw Error(ErrorKind::bad_input,
                  "<" + el(i).name + "> refers to an entity whose text may hold elements, so its bytes do not show "
                  "where results can be written safely; expand the entity, or write the results with "
                  "--standoff-file");
    }
  }

  Insertion insertion(std::size_t at, const std::string& indent, const XmlNode& node, const std::string& kind,
                      int context) const {
    XmlStyle style;
    style.newline = doc_.newline;
    style.indent_unit = unit_;
    style.prefix = std::string(el(context).prefix());
    style.ascii_only = ascii_only_;
    return Insertion{at, doc_.newline + indent + serialise(node, style, indent), kind};
  }

  void plan_standoff(const XmlNode& standoff, SplicePlan& plan) const {
    const int root = 0;
    if (el(root).self_closing) throw Error(ErrorKind::bad_input, "the root element is empty: no TEI header or text");
    require_plain(root);
    std::vector<int> existing = doc_.children_named(root, "standOff");
    if (!existing.empty()) {
      int last = existing.back();
      plan.insertions.push_back(insertion(el(last).end_end, indent_of(last), standoff, "standOff", root));
      return;
    }
    for (int c : el(root).children) {
      std::string_view n = el(c).local_name();
      if (n == "text" || n == "TEI" || n == "teiCorpus") {
        plan.insertions.push_back(insertion(el(c).preceding_content_end, indent_of(c), standoff, "standOff", root));
        return;
      }
    }
    plan.insertions.push_back(insertion(el(root).content_end, child_indent(root), standoff, "standOff", root));
  }

  void plan_application(int header, const XmlNode& application, const SpliceFragments& f, SplicePlan& plan) const {
    int first_open_desc = -1;
    for (int d : doc_.children_named(header, "encodingDesc")) {
      if (el(d).self_closing) continue;
      if (first_open_desc < 0) first_open_desc = d;
      int app_info = doc_.first_child_named(d, "appInfo");
      if (app_info >= 0 && !el(app_info).self_closing) {
        require_plain(d);
        require_plain(app_info);
        plan.insertions.push_back(
            insertion(el(app_info).content_end, child_indent(app_info), application, "application", app_info));
        return;
      }
    }
    XmlNode app_info = XmlNode::element("appInfo", {{"xml:id", f.app_info_id}});
    app_info.add(application);
    if (first_open_desc >= 0) {
      require_plain(first_open_desc);
      plan.insertions.push_back(insertion(el(first_open_desc).content_end, child_indent(first_open_desc), app_info,
                                          "application", first_open_desc));
      return;
    }
    XmlNode encoding_desc = XmlNode::element("encodingDesc", {{"xml:id", f.encoding_desc_id}});
    encoding_desc.add(std::move(app_info));
    int file_desc = doc_.first_child_named(header, "fileDesc");
    if (file_desc >= 0) {
      plan.insertions.push_back(
          insertion(el(file_desc).end_end, indent_of(file_desc), encoding_desc, "application", header));
    } else {
      plan.insertions.push_back(
          insertion(el(header).start_end, child_indent(header), encoding_desc, "application", header));
    }
  }

  void plan_change(int header, const XmlNode& change, const SpliceFragments& f, SplicePlan& plan) const {
    int revision = doc_.first_child_named(header, "revisionDesc");
    if (revision < 0) {
      XmlNode revision_desc = XmlNode::element("revisionDesc", {{"xml:id", f.revision_desc_id}});
      revision_desc.add(change);
      plan.insertions.push_back(
          insertion(el(header).content_end, child_indent(header), revision_desc, "change", header));
      return;
    }
    if (el(revision).self_closing) {
      plan.notes.push_back("the edition's <revisionDesc/> is empty, so no <change> was recorded");
      return;
    }
    require_plain(revision);
    int container = revision;
    int list = doc_.first_child_named(revision, "listChange");
    if (list >= 0) {
      if (el(list).self_closing) {
        plan.notes.push_back("the edition's <listChange/> is empty, so no <change> was recorded");
        return;
      }
      require_plain(list);
      container = list;
    } else if (doc_.first_child_named(revision, "list") >= 0 && doc_.first_child_named(revision, "change") < 0) {
      plan.notes.push_back("the edition's revisionDesc holds a <list>, beside which TEI allows no <change>; "
                           "no <change> was recorded");
      return;
    }
    for (int c : el(container).children) {
      std::string_view n = el(c).local_name();
      if (n == "change" || n == "listChange") {
        plan.insertions.push_back(insertion(el(c).preceding_content_end, indent_of(c), change, "change", container));
        return;
      }
    }
    plan.insertions.push_back(insertion(el(container).content_end, child_indent(container), change, "change", container));
  }

 private:
  const ScannedDocument& doc_;
  std::string_view bytes_;
  bool ascii_only_;
  std::string unit_;
};

}  // namespace

bool is_our_standoff(const ScannedElement& e) {
  const std::string* type = e.attribute("type");
  return e.local_name() == "standOff" && type && *type == kOurStandoffType && has_our_id(e);
}

std::vector<ByteRange> previous_results(const ScannedDocument& doc, std::string_view bytes) {
  const std::size_t n = doc.elements.size();
  std::vector<char> ours(n, 0);
  // Children come after their parents in document order: walk backwards so a wrapper is
  // judged after everything in it.
  for (std::size_t k = n; k-- > 0;) {
    const ScannedElement& e = doc.elements[k];
    if (is_our_standoff(e) && e.parent == 0) {
      ours[k] = 1;
    } else if (is_our_application(e) || is_our_change(e)) {
      ours[k] = 1;
    } else if (is_our_wrapper(e) && !e.self_closing && !e.other_content && !e.children.empty()) {
      bool all = std::all_of(e.children.begin(), e.children.end(),
                             [&](int c) { return ours[static_cast<std::size_t>(c)] != 0; });
      ours[k] = all ? 1 : 0;
    }
  }
  std::vector<ByteRange> ranges;
  for (std::size_t k = 0; k < n; ++k) {
    const ScannedElement& e = doc.elements[k];
    if (!ours[k] || (e.parent >= 0 && ours[static_cast<std::size_t>(e.parent)])) continue;
    ranges.push_back(ByteRange{blank_run_start(bytes, e.start_begin), e.end_end});
  }
  return ranges;
}

std::string without_ranges(std::string_view bytes, const std::vector<ByteRange>& ranges) {
  std::string out;
  out.reserve(bytes.size());
  std::size_t at = 0;
  for (const auto& r : ranges) {
    out.append(bytes.substr(at, r.begin - at));
    at = r.end;
  }
  out.append(bytes.substr(at));
  return out;
}

std::string with_insertions(std::string_view bytes, std::vector<Insertion> insertions) {
  std::stable_sort(insertions.begin(), insertions.end(),
                   [](const Insertion& a, const Insertion& b) { return a.at < b.at; });
  std::size_t extra = 0;
  for (const auto& i : insertions) extra += i.text.size();
  std::string out;
  out.reserve(bytes.size() + extra);
  std::size_t at = 0;
  for (const auto& i : insertions) {
    out.append(bytes.substr(at, i.at - at));
    out.append(i.text);
    at = i.at;
  }
  out.append(bytes.substr(at));
  return out;
}

SplicePlan plan_splice(const ScannedDocument& doc, std::string_view bytes, const SpliceFragments& fragments,
                       bool ascii_only) {
  Planner planner(doc, bytes, ascii_only);
  SplicePlan plan;
  if (fragments.application || fragments.change) {
    int header = doc.first_child_named(0, "teiHeader");
    if (header < 0) {
      plan.notes.push_back("the edition has no teiHeader, so the run is not recorded in a header");
    } else if (doc.elements[static_cast<std::size_t>(header)].self_closing) {
      plan.notes.push_back("the edition's teiHeader is empty, so the run is not recorded in it");
    } else {
      planner.require_plain(header);
      if (fragments.application) planner.plan_application(header, *fragments.application, fragments, plan);
      if (fragments.change) planner.plan_change(header, *fragments.change, fragments, plan);
    }
  }
  planner.plan_standoff(fragments.standoff, plan);
  return plan;
}

int resolve_xpath_pointer(const ScannedDocument& doc, std::string_view pointer) {
  if (pointer.rfind("xpath(", 0) != 0 || pointer.back() != ')') return -1;
  std::string_view path = pointer.substr(6, pointer.size() - 7);
  int current = -1;
  std::size_t i = 0;
  while (i < path.size()) {
    if (path[i] != '/') return -1;
    std::size_t open = path.find('[', i);
    std::size_t close = path.find(']', i);
    if (open == std::string_view::npos || close == std::string_view::npos || close < open) return -1;
    std::string_view name = path.substr(i + 1, open - i - 1);
    int index = std::atoi(std::string(path.substr(open + 1, close - open - 1)).c_str());
    int found = -1;
    if (current < 0) {
      if (doc.root().local_name() == name && index == 1) found = 0;
    } else {
      for (int c : doc.elements[static_cast<std::size_t>(current)].children) {
        const ScannedElement& e = doc.elements[static_cast<std::size_t>(c)];
        if (e.local_name() == name && e.same_name_index == index) {
          found = c;
          break;
        }
      }
    }
    if (found < 0) return -1;
    current = found;
    i = close + 1;
  }
  return current;
}

Insertion id_insertion(const ScannedDocument& doc, int index, const std::string& id) {
  const ScannedElement& e = doc.elements[static_cast<std::size_t>(index)];
  return Insertion{e.start_begin + 1 + e.name.size(), " xml:id=\"" + escape_attribute(id) + "\"", "xml:id"};
}

}  // namespace manicule
