#include "export/web_annotation.h"

#include <vector>

#include "core/utf8_text.h"
#include "standoff/uri_reference.h"

namespace manicule {

namespace {

const char* const kContext = "http://www.w3.org/ns/anno.jsonld";

// A TEI pointer (one, no spaces) as one or more WADM targets.
void add_targets(const StoredResults& results, const std::string& base, const std::string& pointer,
                 nlohmann::ordered_json& targets) {
  std::size_t hash = pointer.find('#');
  std::string document = hash == std::string::npos ? pointer : pointer.substr(0, hash);
  std::string fragment = hash == std::string::npos ? "" : pointer.substr(hash + 1);
  if (pointer.rfind("xpath(", 0) == 0) {  // a bare TEI pointer: into this document
    document.clear();
    fragment = pointer;
  }
  std::string source = document.empty() ? without_fragment(base) : resolve_uri(base, document);
  if (fragment.rfind("xpath(", 0) == 0 && fragment.back() == ')') {
    targets.push_back({{"type", "SpecificResource"},
                       {"source", source},
                       {"selector", {{"type", "XPathSelector"},
                                     {"value", namespace_free_xpath(fragment.substr(6, fragment.size() - 7))}}}});
    return;
  }
  auto join = results.joins.find(fragment);
  if (document.empty() && join != results.joins.end()) {
    std::size_t i = 0;
    const std::string& parts = join->second;
    while (i < parts.size()) {
      std::size_t space = parts.find(' ', i);
      if (space == std::string::npos) space = parts.size();
      if (space > i) add_targets(results, base, parts.substr(i, space - i), targets);
      i = space + 1;
    }
    return;
  }
  targets.push_back(fragment.empty() ? source : source + "#" + fragment);
}

nlohmann::ordered_json target_of(const StoredResults& results, const std::string& base, const std::string& pointers) {
  nlohmann::ordered_json targets = nlohmann::ordered_json::array();
  std::size_t i = 0;
  while (i < pointers.size()) {
    std::size_t space = pointers.find(' ', i);
    if (space == std::string::npos) space = pointers.size();
    if (space > i) add_targets(results, base, pointers.substr(i, space - i), targets);
    i = space + 1;
  }
  return targets.size() == 1 ? targets.front() : targets;
}

nlohmann::ordered_json values_body(const StoredResults& results, const std::string& base, const std::string& fs_id) {
  nlohmann::ordered_json body = nlohmann::ordered_json::array();
  auto it = results.values.find(fs_id);
  if (it == results.values.end()) return body;
  body.push_back({{"type", "TextualBody"}, {"value", json_text(it->second)}, {"format", "application/json"}});
  body.push_back({{"id", without_fragment(base) + "#" + fs_id}, {"type", "Dataset"}, {"format", "application/tei+xml"}});
  return body;
}

nlohmann::ordered_json annotation_json(const StoredAnnotation& a, const std::string& base, const std::string& id,
                               const nlohmann::ordered_json& target, const std::string& note, nlohmann::ordered_json bodies,
                               const nlohmann::ordered_json& generator, const std::string& generated) {
  nlohmann::ordered_json body = nlohmann::ordered_json::array();
  if (!note.empty())
    body.push_back({{"type", "TextualBody"}, {"value", note}, {"format", "text/plain"}, {"language", "en"}});
  // The caution of an attribution travels with it (W3C Web Annotation purpose "commenting").
  if (!a.caution.empty())
    body.push_back({{"type", "TextualBody"}, {"purpose", "commenting"}, {"value", a.caution},
                    {"format", "text/plain"}, {"language", "en"}});
  for (auto& b : bodies) body.push_back(std::move(b));
  nlohmann::ordered_json out{{"@context", kContext}, {"id", id}, {"type", "Annotation"}};
  if (!a.motivation.empty()) out["motivation"] = a.motivation;
  if (!a.creator.empty()) {
    nlohmann::ordered_json creator{{"type", "Software"}, {"name", a.creator}};
    if (!a.creator_ref.empty()) creator["id"] = resolve_uri(base, a.creator_ref);
    out["creator"] = creator;
  }
  if (!a.created.empty()) out["created"] = a.created;
  out["generator"] = generator;
  out["generated"] = generated;
  if (!body.empty()) out["body"] = body;
  out["target"] = target;
  return out;
}

}  // namespace

std::string namespace_free_xpath(const std::string& path) {
  std::string out;
  std::size_t i = 0;
  while (i < path.size() && path[i] == '/') {
    std::size_t open = path.find('[', i);
    std::size_t next = path.find('/', i + 1);
    if (open == std::string::npos || (next != std::string::npos && next < open)) return path;  // not our form
    std::size_t close = path.find(']', open);
    if (close == std::string::npos) return path;
    out += "/*[local-name()='" + path.substr(i + 1, open - i - 1) + "']" + path.substr(open, close - open + 1);
    i = close + 1;
  }
  return i == path.size() ? out : path;
}

nlohmann::ordered_json web_annotations(const StoredResults& results, const std::string& base_uri,
                               const std::string& generated) {
  const std::string doc = without_fragment(base_uri);
  nlohmann::ordered_json generator{{"type", "Software"}, {"name", "manicule " + results.version}};
  nlohmann::ordered_json items = nlohmann::ordered_json::array();
  for (const StoredAnnotation& a : results.annotations) {
    if (!results.link_group_id.empty() && a.target == "#" + results.link_group_id) {
      // One assessment per pair, targeting the pair's two segments (what the TEI link
      // points at), so that a viewer shows it on both texts; its id is the link's.
      for (const StoredLink& link : results.links) {
        std::string fs_id = link.ana.empty() ? "" : link.ana.substr(1);
        std::string note;
        auto v = results.values.find(fs_id);
        if (v != results.values.end() && v->second.contains("segments") && v->second.contains("value")) {
          const auto& s = v->second["segments"];
          note = v->second.value("measure", std::string("distance")) + " distance between " +
                 s[0].get<std::string>() + " and " + s[1].get<std::string>() + ": " + json_text(v->second["value"]) +
                 " (smaller means more alike).";
        }
        items.push_back(annotation_json(a, doc, doc + "#" + link.id, target_of(results, doc, link.target), note,
                                        values_body(results, doc, fs_id), generator, generated));
      }
      continue;
    }
    nlohmann::ordered_json bodies = nlohmann::ordered_json::array();
    for (const auto& [type, target] : a.pointers) {
      nlohmann::ordered_json part = values_body(results, doc, target.empty() ? "" : target.substr(1));
      for (auto& b : part) bodies.push_back(std::move(b));
    }
    if (a.pointers.empty() && a.target.size() > 1) bodies = values_body(results, doc, a.target.substr(1));
    items.push_back(annotation_json(a, doc, doc + "#" + a.id, target_of(results, doc, a.target), a.note, bodies,
                                    generator, generated));
  }
  nlohmann::ordered_json collection{{"@context", kContext},
                            {"id", doc + "#" + results.standoff_id},
                            {"type", "AnnotationCollection"},
                            {"label", "Stylometric results (manicule " + results.version + ")"},
                            {"total", items.size()}};
  collection["first"] = {{"id", doc + "#" + results.standoff_id + "/page1"}, {"type", "AnnotationPage"},
                         {"startIndex", 0}, {"items", items}};
  return collection;
}

}  // namespace manicule
