#include "standoff/stored_results.h"

#include <cerrno>
#include <charconv>
#include <cstdint>
#include <cstdlib>
#include <memory>

#include "core/error.h"
#include "standoff/edition_splice.h"
#include "tei/tei_root.h"
#include "tei/xml_events.h"

namespace manicule {

namespace {

// A small tree of the parts we read back.
struct Node {
  std::string name;
  std::map<std::string, std::string> attributes;  // "xml:id", "target", ...
  std::vector<std::unique_ptr<Node>> children;
  std::string text;  // all text inside, in order

  const std::string& attr(const std::string& key) const {
    static const std::string none;
    auto it = attributes.find(key);
    return it == attributes.end() ? none : it->second;
  }
  const Node* child(const std::string& n) const {
    for (const auto& c : children)
      if (c->name == n) return c.get();
    return nullptr;
  }
};

class ResultsCollector : public XmlEventHandler {
 public:
  std::vector<std::unique_ptr<Node>> standoffs, applications;

  explicit ResultsCollector(std::string file) : file_(std::move(file)) {}

  void start(const StartTag& tag) override {
    // Said before "no results": a file that is not TEI at all was most likely named by mistake.
    if (depth_ == 0)
      require_tei_root(tag, file_, "; manicule's results are kept in a TEI edition or a TEI results file");
    auto node = std::make_unique<Node>();
    node->name = tag.in_tei_namespace ? std::string(tag.local) : "{" + std::string(tag.ns) + "}" + std::string(tag.local);
    for (int i = 0; i < tag.attribute_count; ++i) {
      const xmlChar** a = tag.attributes + 5 * i;
      std::string local(reinterpret_cast<const char*>(a[0]));
      std::string uri = a[2] ? reinterpret_cast<const char*>(a[2]) : "";
      std::string key = uri == kXmlNamespace ? "xml:" + local : uri.empty() ? local : "{" + uri + "}" + local;
      node->attributes[key] = std::string(reinterpret_cast<const char*>(a[3]), static_cast<std::size_t>(a[4] - a[3]));
    }
    ++depth_;
    if (!open_.empty()) {
      Node* parent = open_.back();
      parent->children.push_back(std::move(node));
      open_.push_back(parent->children.back().get());
      return;
    }
    bool standoff = node->name == "standOff" && depth_ == 2 && node->attr("type") == kOurStandoffType &&
                    node->attr("xml:id").rfind(kOurIdPrefix, 0) == 0;
    bool application = node->name == "application" && node->attr("ident") == kOurApplicationIdent;
    if (standoff || application) {
      auto& list = standoff ? standoffs : applications;
      list.push_back(std::move(node));
      open_.push_back(list.back().get());
    }
  }
  void end() override {
    if (!open_.empty()) {
      Node* done = open_.back();
      open_.pop_back();
      if (!open_.empty()) open_.back()->text += done->text;
    }
    --depth_;
  }
  void text(std::string_view chars) override {
    if (!open_.empty()) open_.back()->text.append(chars);
  }

 private:
  std::string file_;
  std::vector<Node*> open_;
  int depth_ = 0;
};

std::string collapse(const std::string& text) {
  std::string out;
  bool space = false;
  for (char c : text) {
    if (c == ' ' || c == '\n' || c == '\t' || c == '\r') {
      space = !out.empty();
    } else {
      if (space) out += ' ';
      space = false;
      out += c;
    }
  }
  return out;
}

nlohmann::json value_of(const Node& v);

nlohmann::json fs_json(const Node& fs) {
  nlohmann::json out = nlohmann::json::object();
  if (!fs.attr("type").empty()) out["type"] = fs.attr("type");
  if (!fs.attr("corresp").empty()) out["corresp"] = fs.attr("corresp");
  for (const auto& f : fs.children) {
    if (f->name != "f" || f->children.empty()) continue;
    out[f->attr("name")] = value_of(*f->children.front());
  }
  return out;
}

nlohmann::json value_of(const Node& v) {
  if (v.name == "numeric") {
    const std::string& n = v.attr("value");
    if (n.find_first_of(".eEnN") == std::string::npos) {
      // Whole numbers exactly: a verification's seed fills 64 unsigned bits, which a signed
      // reading clamped (and a double would round), so the run could not be repeated.
      const char* end = n.data() + n.size();
      std::int64_t whole = 0;
      if (auto [at, ec] = std::from_chars(n.data(), end, whole); ec == std::errc() && at == end) return whole;
      std::uint64_t large = 0;
      if (auto [at, ec] = std::from_chars(n.data(), end, large); ec == std::errc() && at == end) return large;
      // "+5" or " 5", written by hand, as strtoll reads them; beyond 64 bits, the digits as
      // the file has them (a double would round them)
      errno = 0;
      char* rest = nullptr;
      const long long by_hand = std::strtoll(n.c_str(), &rest, 10);
      if (errno == 0 && rest != n.c_str() && *rest == '\0') return by_hand;
      return n;
    }
    return std::strtod(n.c_str(), nullptr);
  }
  if (v.name == "symbol") return v.attr("value");
  if (v.name == "binary") return v.attr("value") == "true" || v.attr("value") == "1";
  if (v.name == "string") return v.text;
  if (v.name == "fs") return fs_json(v);
  if (v.name == "vColl") {
    nlohmann::json list = nlohmann::json::array();
    for (const auto& c : v.children) list.push_back(value_of(*c));
    return list;
  }
  return collapse(v.text);
}

StoredAnnotation annotation_of(const Node& a) {
  StoredAnnotation s;
  s.id = a.attr("xml:id");
  s.target = a.attr("target");
  s.motivation = a.attr("motivation");
  for (const auto& c : a.children) {
    if (c->name == "note") (c->attr("type") == "caution" ? s.caution : s.note) = collapse(c->text);
    if (c->name == "ptr") s.pointers.emplace_back(c->attr("type"), c->attr("target"));
    if (c->name == "respStmt")
      if (const Node* name = c->child("name")) {
        s.creator = collapse(name->text);
        s.creator_ref = name->attr("ref");
      }
    if (c->name == "revisionDesc")
      for (const auto& change : c->children)
        if (change->attr("status") == "created") s.created = change->attr("when");
  }
  return s;
}

void collect(const Node& n, StoredResults& out) {
  if (n.name == "annotation") out.annotations.push_back(annotation_of(n));
  if (n.name == "link") out.links.push_back(StoredLink{n.attr("xml:id"), n.attr("target"), n.attr("ana")});
  if (n.name == "linkGrp" && n.attr("type") == "styleDistance") out.link_group_id = n.attr("xml:id");
  if (n.name == "join") out.joins[n.attr("xml:id")] = n.attr("target");
  if (n.name == "fs" && !n.attr("xml:id").empty()) {
    out.values[n.attr("xml:id")] = fs_json(n);
    return;  // nested fs are part of its value
  }
  for (const auto& c : n.children) collect(*c, out);
}

}  // namespace

StoredResults read_stored_results(const std::string& path) {
  ResultsCollector collector(path);
  parse_xml(XmlSource::file(path), collector);
  if (collector.standoffs.empty())
    throw Error(ErrorKind::bad_input, "no results of manicule in this file (no <standOff type=\"stylometry\">); "
                                      "write them with manicule annotate", path);
  StoredResults out;
  out.file = path;
  const Node& standoff = *collector.standoffs.front();
  out.standoff_id = standoff.attr("xml:id");
  collect(standoff, out);
  if (!collector.applications.empty()) {
    const Node& app = *collector.applications.front();
    out.version = app.attr("version");
    out.when = app.attr("when");
    if (const Node* desc = app.child("desc")) out.settings = collapse(desc->text);
  }
  return out;
}

}  // namespace manicule
