#include "cli/measure_output.h"

#include <iostream>

#include "cli/table_output.h"
#include "core/error.h"
#include "core/facade.h"
#include "measure/newick.h"

namespace manicule::cli {

void MeasureCommandOptions::add_to(CLI::App& command, const std::vector<std::string>& formats, bool with_measure,
                                   bool with_neighbours) {
  selection.add_to(command);
  analysis.add_to(command, with_measure, with_neighbours);
  format = formats.front();
  std::string names;
  for (const auto& f : formats) names += (names.empty() ? "" : ", ") + f;
  command.add_option("--format", format, names)->check(CLI::IsMember(formats))->capture_default_str();
  command.add_option("--output,-o", output, "write to this file (default: standard output)");
}

Request MeasureCommandOptions::to_request() const {
  Request request = selection.to_request();
  analysis.apply_to(request);
  refuse_output_over_input(output, request.inputs);
  return request;
}

Analysis run_analysis(const Request& request) {
  Analysis analysis = analyse(request);
  for (const auto& note : analysis.notes) std::cerr << "manicule: note: " << note << '\n';
  return analysis;
}

std::string exact_number(double value) { return newick_number(value); }

nlohmann::json measure_json(DistanceMeasure measure) {
  const MeasureInfo& info = measure_info(measure);
  return {{"name", std::string(info.name)},
          {"citation", std::string(info.citation)},
          {"computed_on", info.input == MeasureInput::z_scores ? "z-scores" : "relative frequencies"}};
}

nlohmann::json segment_json(const SegmentSummary& s) {
  nlohmann::json j{{"segment", s.id}, {"label", s.label},   {"author", s.author}, {"file", s.file},
                   {"unit", s.unit},  {"tokens", s.tokens}, {"types", s.types},   {"measured", s.measured}};
  if (!s.measured) j["left_out_because"] = s.excluded_reason;
  return j;
}

nlohmann::json analysis_json_head(const Analysis& analysis) {
  nlohmann::json segments = nlohmann::json::array();
  for (const auto& s : analysis.segments) segments.push_back(segment_json(s));
  return {{"provenance", provenance_json(analysis.provenance)}, {"notes", analysis.notes}, {"segments", segments}};
}

void write_analysis_parameters(std::ostream& out, const Analysis& analysis) {
  write_tsv_parameters(out, provenance_pairs(analysis.provenance));
  std::vector<std::pair<std::string, std::string>> extra;
  for (const auto& note : analysis.notes) extra.emplace_back("note", note);
  for (const auto& s : analysis.segments)
    if (!s.measured) extra.emplace_back("left out", s.id + ": " + s.excluded_reason);
  write_tsv_parameters(out, extra);
}

}  // namespace manicule::cli
