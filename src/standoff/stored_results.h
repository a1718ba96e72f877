// Reading our results back from an annotated edition or a separate results file, without
// recomputing: our standOff (@type "stylometry", xml:id with our prefix) and our
// application entry, parsed with the hardened reader of src/tei (no network, no external
// entities). The values of each fs come back as JSON: feature name -> number, string,
// true/false, a list, or a nested object for a nested fs (with its "type").
// Consumers: `manicule show`, the Web Annotation export, a host editor.
#pragma once
#include <map>
#include <string>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

namespace manicule {

struct StoredAnnotation {
  std::string id, target, motivation;
  std::string note;
  std::string caution;  // note[@type="caution"] of attribution and verification results
  std::string created;  // revisionDesc/change[@status="created"]/@when
  std::string creator;  // respStmt/name, e.g. "manicule 0.1.0"
  std::string creator_ref;  // its @ref, e.g. "#mcl-app"
  std::vector<std::pair<std::string, std::string>> pointers;  // ptr @type, @target
};

struct StoredLink {
  std::string id, target, ana;
};

struct StoredResults {
  std::string file;
  std::string standoff_id;
  std::string version, when, settings;  // our application entry, if any
  std::vector<StoredAnnotation> annotations;
  std::string link_group_id;  // the linkGrp of distances
  std::vector<StoredLink> links;
  std::map<std::string, std::string> joins;     // join xml:id -> its @target
  std::map<std::string, nlohmann::json> values;  // fs xml:id -> {"type": ..., features...}

};

// Throws Error(bad_input) for unreadable or malformed files and for a file without
// results of ours (the message says how to make them).
StoredResults read_stored_results(const std::string& path);

}  // namespace manicule
