// `manicule distances`: every measured segment against every other under one published
// measure. TSV in long form (segment_a, segment_b, value; each unordered pair once, a
// before b in row order) under the "# key: value" parameter header, or JSON with the
// provenance, the segments, the measure and its citation, the pairs and each segment's
// nearest neighbours.
#include <iostream>

#include "cli/commands.h"
#include "cli/measure_output.h"
#include "cli/table_output.h"
#include "core/utf8_text.h"

namespace manicule::cli {

namespace {

nlohmann::json distances_json(const Analysis& analysis) {
  const DistanceResult& d = *analysis.distances;
  nlohmann::json doc = analysis_json_head(analysis);
  doc["measure"] = measure_json(d.measure);
  nlohmann::json pairs = nlohmann::json::array();
  const auto n = static_cast<Eigen::Index>(d.rows.size());
  for (Eigen::Index i = 0; i < n; ++i)
    for (Eigen::Index j = i + 1; j < n; ++j)
      pairs.push_back({{"segment_a", analysis.segments[d.rows[i]].id},
                       {"segment_b", analysis.segments[d.rows[j]].id},
                       {"value", d.values(i, j)}});
  doc["pairs"] = pairs;
  nlohmann::json nearest = nlohmann::json::array();
  for (std::size_t r = 0; r < d.rows.size(); ++r) {
    nlohmann::json list = nlohmann::json::array();
    for (const auto& nb : d.nearest[r])
      list.push_back({{"segment", analysis.segments[nb.segment].id}, {"distance", nb.distance}});
    nearest.push_back({{"segment", analysis.segments[d.rows[r]].id}, {"nearest", list}});
  }
  doc["nearest_neighbours"] = nearest;
  return doc;
}

}  // namespace

CommandRunner add_distances_command(CLI::App& app) {
  auto* command = app.add_subcommand("distances", "Measure the distance between every two segments");
  auto options = std::make_shared<MeasureCommandOptions>();
  options->add_to(*command, {"tsv", "json"}, true, true);
  // Here the nearest are a part of the JSON alone: the TSV holds every pair already.
  CLI::Option* neighbours = command->get_option("--neighbours");
  neighbours->description("nearest segments listed per segment in the JSON output (the TSV holds every pair)");
  return [=]() -> int {
    if (neighbours->count() > 0 && options->format != "json")
      std::cerr << "manicule: note: --neighbours shapes the JSON output's lists of nearest segments; the TSV "
                   "holds every pair whatever it is (sort it by value for the nearest)\n";
    Request request = options->to_request();
    request.compute_distances = true;
    const Analysis analysis = run_analysis(request);
    write_output(options->output, [&](std::ostream& out) {
      if (options->format == "json") {
        out << json_text(distances_json(analysis), 2) << '\n';
        return;
      }
      write_analysis_parameters(out, analysis);
      const DistanceResult& d = *analysis.distances;
      write_tsv_row(out, {"segment_a", "segment_b", "value"});
      const auto n = static_cast<Eigen::Index>(d.rows.size());
      for (Eigen::Index i = 0; i < n; ++i)
        for (Eigen::Index j = i + 1; j < n; ++j)
          write_tsv_row(out, {analysis.segments[d.rows[i]].id, analysis.segments[d.rows[j]].id,
                              exact_number(d.values(i, j))});
    });
    return 0;
  };
}

}  // namespace manicule::cli
