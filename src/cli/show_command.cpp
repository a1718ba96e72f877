// `manicule show`: lists the results stored in an annotated edition (or a separate
// results file) without recomputing anything: each segment's profile and nearest
// segments, the distances written, the PCA coordinates, attribution and verification
// results with their caution, and the run's settings.
#include <iostream>

#include <nlohmann/json.hpp>

#include "attribution/attribution_result.h"
#include "cli/commands.h"
#include "cli/table_output.h"
#include "core/utf8_text.h"
#include "standoff/stored_results.h"

namespace manicule::cli {

namespace {

std::string cell(const nlohmann::json& v) {
  if (v.is_string()) return v.get<std::string>();
  if (v.is_null()) return "";
  return json_text(v);
}

// The stored results in the shape `show --format json` prints.
nlohmann::json results_json(const StoredResults& r) {
  nlohmann::json segments = nlohmann::json::array(), distances = nlohmann::json::array();
  nlohmann::json pca = nlohmann::json::object();
  for (const auto& a : r.annotations) {
    for (const auto& [type, target] : a.pointers) {
      auto v = r.values.find(target.size() > 1 ? target.substr(1) : "");
      if (type != "profile" || v == r.values.end()) continue;
      nlohmann::json row = v->second;
      row.erase("type");
      row["target"] = a.target;
      for (const auto& [pca_type, pca_target] : a.pointers) {
        auto p = r.values.find(pca_target.size() > 1 ? pca_target.substr(1) : "");
        if (pca_type != "pca" || p == r.values.end()) continue;
        nlohmann::json coordinates = p->second;
        coordinates.erase("type");
        coordinates.erase("segment");
        row["pca"] = coordinates;
      }
      segments.push_back(row);
    }
  }
  for (const auto& link : r.links) {
    auto v = r.values.find(link.ana.size() > 1 ? link.ana.substr(1) : "");
    if (v == r.values.end()) continue;
    nlohmann::json row = v->second;
    row.erase("type");
    if (row.contains("segments") && row["segments"].size() == 2) {
      row["segment_a"] = row["segments"][0];
      row["segment_b"] = row["segments"][1];
      row.erase("segments");
    }
    row["link"] = link.id;
    row["target"] = link.target;
    distances.push_back(row);
  }
  for (const auto& [id, value] : r.values)
    if (value.value("type", "") == "pcaSummary") pca = value;
  nlohmann::json attributions = nlohmann::json::array(), verifications = nlohmann::json::array();
  for (const auto& a : r.annotations)
    for (const auto& [type, target] : a.pointers) {
      auto v = r.values.find(target.size() > 1 ? target.substr(1) : "");
      if (type != "result" || v == r.values.end()) continue;
      nlohmann::json row = v->second;
      const std::string kind = row.value("type", "");
      row.erase("type");
      row["target"] = a.target;
      if (kind == "attributionResult") attributions.push_back(row);
      if (kind == "verificationResult") verifications.push_back(row);
    }
  nlohmann::json out = {{"file", r.file},
          {"standoff", r.standoff_id},
          {"application", {{"version", r.version}, {"when", r.when}, {"settings", r.settings}}},
          {"segments", segments},
          {"distances", distances},
          {"pca", pca}};
  if (!attributions.empty()) out["attributions"] = attributions;
  if (!verifications.empty()) out["verifications"] = verifications;
  if (!attributions.empty() || !verifications.empty()) out["caution"] = kAttributionCaution;
  return out;
}

// A result's warnings, a row each ("warning"): the short-text and few-impostor warnings
// belong beside the figures they qualify.
void write_warnings(const char* kind, const std::string& segment, const std::string& other, const nlohmann::json& result) {
  // Written as a vColl of strings (standoff/feature_values.h), read back as a list.
  if (!result.contains("warnings") || !result["warnings"].is_array()) return;
  for (const auto& w : result["warnings"]) write_tsv_row(std::cout, {kind, segment, other, "warning", cell(w)});
}

void print_tsv(const nlohmann::json& doc) {
  std::vector<std::pair<std::string, std::string>> head{
      {"file", doc["file"].get<std::string>()},
      {"written by", "manicule " + doc["application"]["version"].get<std::string>()},
      {"when", doc["application"]["when"].get<std::string>()},
      {"settings", doc["application"]["settings"].get<std::string>()}};
  if (doc.contains("caution")) head.emplace_back("caution", doc["caution"].get<std::string>());
  write_tsv_parameters(std::cout, head);
  write_tsv_row(std::cout, {"kind", "segment", "other", "name", "value"});
  for (const auto& s : doc["segments"]) {
    std::string seg = cell(s.value("segment", nlohmann::json()));
    for (const char* key : {"label", "unitType", "tokens", "types", "language", "authorship", "measured", "excludedBecause"})
      if (s.contains(key)) write_tsv_row(std::cout, {"profile", seg, "", key, cell(s[key])});
    if (s.contains("nearest"))
      for (const auto& n : s["nearest"])
        write_tsv_row(std::cout, {"nearest", seg, cell(n.value("segment", nlohmann::json())),
                                  "rank " + cell(n.value("rank", nlohmann::json())), cell(n.value("distance", nlohmann::json()))});
    if (s.contains("pca"))
      for (const auto& [component, value] : s["pca"].items()) write_tsv_row(std::cout, {"pca", seg, "", component, cell(value)});
  }
  for (const auto& d : doc["distances"])
    write_tsv_row(std::cout, {"distance", cell(d.value("segment_a", nlohmann::json())),
                              cell(d.value("segment_b", nlohmann::json())), cell(d.value("measure", nlohmann::json())),
                              cell(d.value("value", nlohmann::json()))});
  for (const auto& [key, value] : doc["pca"].items())
    if (value.is_object() && value.contains("explainedVarianceRatio"))
      write_tsv_row(std::cout, {"pca-variance", "", "", key, cell(value["explainedVarianceRatio"])});
  const nlohmann::json none;
  for (const auto& a : doc.value("attributions", nlohmann::json::array())) {
    std::string seg = cell(a.value("segment", none));
    for (const auto& c : a.value("candidates", nlohmann::json::array()))
      write_tsv_row(std::cout, {"candidate", seg, cell(c.value("candidate", none)), "rank " + cell(c.value("rank", none)),
                                cell(c.value("distance", none))});
    for (const char* key : {"margin", "stability"})
      if (a.contains(key)) write_tsv_row(std::cout, {"attribution", seg, "", key, cell(a[key])});
    write_warnings("attribution", seg, "", a);
  }
  // With the score, what it may be read against: whether the band was calibrated, how
  // many impostors there were, and each warning, as the TEI and JSON give them.
  for (const auto& v : doc.value("verifications", nlohmann::json::array())) {
    const std::string seg = cell(v.value("segment", none)), candidate = cell(v.value("candidate", none));
    for (const char* key : {"score", "calibratedScore", "decision", "bandCalibrated", "impostorPool"})
      if (v.contains(key)) write_tsv_row(std::cout, {"verification", seg, candidate, key, cell(v[key])});
    write_warnings("verification", seg, candidate, v);
  }
}

}  // namespace

CommandRunner add_show_command(CLI::App& app) {
  auto* command = app.add_subcommand("show", "List the results stored in an annotated edition, without recomputing");
  auto file = std::make_shared<std::string>();
  auto format = std::make_shared<std::string>("tsv");
  command->add_option("file", *file, "an edition annotated by manicule, or a results file (--standoff-file)")
      ->required();
  command->add_option("--format", *format, "tsv or json")->check(CLI::IsMember({"tsv", "json"}))->capture_default_str();
  return [=]() -> int {
    nlohmann::json doc = results_json(read_stored_results(*file));
    if (*format == "json")
      std::cout << json_text(doc, 2) << '\n';
    else
      print_tsv(doc);
    return 0;
  };
}

}  // namespace manicule::cli
