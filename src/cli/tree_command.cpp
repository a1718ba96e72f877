// `manicule tree`: hierarchical clustering of the measured segments (Ward, average or
// complete linkage) as Newick, an SVG dendrogram or JSON. With --bootstrap (a list of
// feature rank ranges) or --bootstrap-step (growing ranges within --ranks), a
// majority-rule consensus of one tree per range, each group carrying its support: as the
// internal node's label in Newick (whole percent) and beside the branching in the SVG.
#include <cstdio>

#include "cli/commands.h"
#include "cli/measure_output.h"
#include "core/error.h"
#include "core/utf8_text.h"
#include "export/tree_plot.h"
#include "measure/newick.h"

namespace manicule::cli {

namespace {

std::vector<RankRange> parse_ranges(const std::string& text) {
  std::vector<RankRange> ranges;
  std::size_t start = 0;
  while (start <= text.size()) {
    std::size_t comma = text.find(',', start);
    if (comma == std::string::npos) comma = text.size();
    const std::string part = text.substr(start, comma - start);
    unsigned long first = 0, last = 0;
    char tail = 0;
    if (std::sscanf(part.c_str(), "%lu-%lu%c", &first, &last, &tail) != 2 || first < 1 || last < first)
      throw Error(ErrorKind::usage, "--bootstrap takes rank ranges FIRST-LAST separated by commas, e.g. "
                                    "100-200,100-300; got '" + part + "'");
    ranges.emplace_back(first, last);
    start = comma + 1;
  }
  return ranges;
}

// FIRST..(each multiple of step above FIRST up to LAST): 1-100, 1-200, ... for 1-1000 step 100.
std::vector<RankRange> stepped_ranges(const FeatureSpaceOptions& ranks, std::size_t step) {
  const std::size_t last_min = (ranks.rank_first / step + 1) * step;
  if (step < 1 || last_min > ranks.rank_last)
    throw Error(ErrorKind::usage, "--bootstrap-step " + std::to_string(step) + " leaves no range within --ranks " +
                                      std::to_string(ranks.rank_first) + "-" + std::to_string(ranks.rank_last));
  return growing_ranges(ranks.rank_first, last_min, ranks.rank_last, step);
}

std::vector<std::string> leaf_ids(const Analysis& analysis) {
  std::vector<std::string> ids;
  for (std::size_t index : analysis.clustering->leaves) ids.push_back(analysis.segments[index].id);
  return ids;
}

std::string newick_of(const ClusteringResult& result) {
  return result.tree ? to_newick(*result.tree) : to_newick(*result.consensus);
}

// The run's parameters as a Newick comment ([...], which Newick readers skip) before the
// tree; brackets inside become parentheses so that the comment cannot end early.
void write_newick(std::ostream& out, const Analysis& analysis) {
  std::vector<std::string> lines;
  for (const auto& [key, value] : provenance_pairs(analysis.provenance)) lines.push_back(key + ": " + value);
  for (const auto& note : analysis.notes) lines.push_back("note: " + note);
  out << "[";
  for (std::string& line : lines) {
    for (char& c : line) c = c == '[' ? '(' : c == ']' ? ')' : c;
    out << line << '\n';
  }
  out << "]\n" << newick_of(*analysis.clustering) << '\n';
}

nlohmann::json tree_json(const Analysis& analysis) {
  const ClusteringResult& result = *analysis.clustering;
  nlohmann::json doc = analysis_json_head(analysis);
  const std::vector<std::string> ids = leaf_ids(analysis);
  nlohmann::json tree{{"linkage", std::string(linkage_method_name(result.method))},
                      {"measure", measure_json(result.measure)},
                      {"leaves", ids},
                      {"newick", newick_of(result)}};
  if (result.tree) {
    nlohmann::json merges = nlohmann::json::array();
    for (const Merge& m : result.tree->merges)
      merges.push_back({{"a", m.a}, {"b", m.b}, {"height", m.height}, {"size", m.size}});
    tree["merges"] = merges;
  } else {
    nlohmann::json ranges = nlohmann::json::array();
    for (const auto& [first, last] : result.ranges) ranges.push_back({first, last});
    nlohmann::json groups = nlohmann::json::array();
    for (const auto& clade : result.consensus->clades) {
      std::vector<std::string> members;
      for (std::size_t m : clade.members) members.push_back(ids[m]);
      groups.push_back({{"segments", members}, {"trees", clade.appearances}, {"support", clade.support}});
    }
    tree["consensus"] = {{"trees", result.consensus->trees}, {"ranges", ranges}, {"groups", groups}};
  }
  doc["tree"] = tree;
  return doc;
}

}  // namespace

CommandRunner add_tree_command(CLI::App& app) {
  auto* command = app.add_subcommand("tree", "Cluster the segments hierarchically: Newick, SVG dendrogram or JSON");
  auto options = std::make_shared<MeasureCommandOptions>();
  auto linkage = std::make_shared<std::string>("ward");
  auto bootstrap = std::make_shared<std::string>();
  auto step = std::make_shared<std::size_t>(0);
  auto title = std::make_shared<std::string>();
  options->add_to(*command, {"newick", "svg", "json"}, true);
  command->add_option("--linkage", *linkage, "ward, average or complete")
      ->check(CLI::IsMember({"ward", "average", "complete"}))
      ->capture_default_str();
  auto* ranges = command->add_option("--bootstrap", *bootstrap,
                                     "consensus over these feature rank ranges, e.g. 100-200,100-300,100-400");
  command->add_option("--bootstrap-step", *step,
                      "consensus over growing ranges within --ranks: FIRST-STEP, FIRST-2*STEP, ... (e.g. 100)")
      ->excludes(ranges);
  command->add_option("--title", *title, "plot title (svg)");
  return [=]() -> int {
    Request request = options->to_request();
    request.clustering.compute = true;
    request.clustering.method = parse_linkage_method(*linkage);
    if (!bootstrap->empty()) request.clustering.consensus_ranges = parse_ranges(*bootstrap);
    if (*step > 0) request.clustering.consensus_ranges = stepped_ranges(request.feature_space, *step);
    const bool consensus = !request.clustering.consensus_ranges.empty();
    if (consensus) {  // the run's own table spans every range
      request.compute_distances = false;
      request.feature_space.rank_first = request.clustering.consensus_ranges.front().first;
      request.feature_space.rank_last = 0;
      for (const auto& [first, last] : request.clustering.consensus_ranges) {
        request.feature_space.rank_first = std::min(request.feature_space.rank_first, first);
        request.feature_space.rank_last = std::max(request.feature_space.rank_last, last);
      }
    }
    const Analysis analysis = run_analysis(request);
    write_output(options->output, [&](std::ostream& out) {
      if (options->format == "json") {
        out << json_text(tree_json(analysis), 2) << '\n';
      } else if (options->format == "svg") {
        out << render_svg_dendrogram(clustering_plot(analysis, *title));
      } else {
        write_newick(out, analysis);
      }
    });
    return 0;
  };
}

}  // namespace manicule::cli
