// `manicule map`: a PCA of the measured segments. TSV: one row a segment with its
// coordinates, under a header that adds each component's explained variance and its
// strongest loadings at either pole. JSON: the same with every loading. SVG: the labelled
// scatter plot of two components (src/export/pca_plot.h).
#include <cstdio>

#include "cli/commands.h"
#include "cli/measure_output.h"
#include "cli/number_checks.h"
#include "cli/table_output.h"
#include "core/error.h"
#include "core/utf8_text.h"
#include "export/pca_plot.h"
#include "export/plot_captions.h"

namespace manicule::cli {

namespace {

std::string component_name(Eigen::Index k) { return "PC" + std::to_string(k + 1); }

nlohmann::json weights_json(const PcaResult& pca, const std::vector<FeatureWeight>& weights) {
  nlohmann::json list = nlohmann::json::array();
  for (const auto& w : weights) list.push_back({{"feature", pca.features[w.feature]}, {"loading", w.loading}});
  return list;
}

nlohmann::json map_json(const Analysis& analysis) {
  const PcaResult& pca = *analysis.pca;
  nlohmann::json doc = analysis_json_head(analysis);
  nlohmann::json components = nlohmann::json::array();
  for (Eigen::Index k = 0; k < pca.coordinates.cols(); ++k) {
    const auto pole = static_cast<std::size_t>(k);
    components.push_back({{"component", component_name(k)},
                          {"explained_variance", pca.explained_variance(k)},
                          {"explained_variance_ratio", pca.explained_variance_ratio(k)},
                          {"positive_pole", pole < pca.poles.size() ? weights_json(pca, pca.poles[pole].positive) : nlohmann::json::array()},
                          {"negative_pole", pole < pca.poles.size() ? weights_json(pca, pca.poles[pole].negative) : nlohmann::json::array()}});
  }
  doc["pca"] = {{"input", analysis.provenance.parameter("pca input")},
                {"total_variance", pca.total_variance},
                {"components", components}};
  nlohmann::json coordinates = nlohmann::json::array();
  for (std::size_t r = 0; r < analysis.table_rows.size(); ++r) {
    const SegmentSummary& s = analysis.segments[analysis.table_rows[r]];
    std::vector<double> values;
    for (Eigen::Index k = 0; k < pca.coordinates.cols(); ++k) values.push_back(pca.coordinates(static_cast<Eigen::Index>(r), k));
    coordinates.push_back({{"segment", s.id}, {"label", s.label}, {"author", s.author}, {"coordinates", values}});
  }
  doc["coordinates"] = coordinates;
  nlohmann::json loadings = nlohmann::json::array();
  for (Eigen::Index f = 0; f < pca.loadings.rows(); ++f) {
    std::vector<double> values;
    for (Eigen::Index k = 0; k < pca.loadings.cols(); ++k) values.push_back(pca.loadings(f, k));
    loadings.push_back({{"feature", pca.features[static_cast<std::size_t>(f)]}, {"loadings", values}});
  }
  doc["loadings"] = loadings;
  return doc;
}

std::string weights_text(const PcaResult& pca, const std::vector<FeatureWeight>& weights) {
  std::string out;
  char number[32];
  for (const auto& w : weights) {
    std::snprintf(number, sizeof number, "%.4f", w.loading);
    out += (out.empty() ? "" : ", ") + pca.features[w.feature] + " " + number;
  }
  return out;
}

void write_map_tsv(std::ostream& out, const Analysis& analysis) {
  const PcaResult& pca = *analysis.pca;
  write_analysis_parameters(out, analysis);
  std::vector<std::pair<std::string, std::string>> components;
  for (Eigen::Index k = 0; k < pca.coordinates.cols(); ++k) {
    const auto pole = static_cast<std::size_t>(k);
    components.emplace_back(component_name(k) + " explained variance ratio", exact_number(pca.explained_variance_ratio(k)));
    if (pole >= pca.poles.size()) continue;
    components.emplace_back(component_name(k) + " negative pole", weights_text(pca, pca.poles[pole].negative));
    components.emplace_back(component_name(k) + " positive pole", weights_text(pca, pca.poles[pole].positive));
  }
  write_tsv_parameters(out, components);
  std::vector<std::string> row{"segment", "label", "author"};
  for (Eigen::Index k = 0; k < pca.coordinates.cols(); ++k) row.push_back(component_name(k));
  write_tsv_row(out, row);
  for (std::size_t r = 0; r < analysis.table_rows.size(); ++r) {
    const SegmentSummary& s = analysis.segments[analysis.table_rows[r]];
    row = {s.id, s.label, s.author};
    for (Eigen::Index k = 0; k < pca.coordinates.cols(); ++k)
      row.push_back(exact_number(pca.coordinates(static_cast<Eigen::Index>(r), k)));
    write_tsv_row(out, row);
  }
}

// "1,2" -> {0, 1}.
std::pair<std::size_t, std::size_t> parse_axes(const std::string& text) {
  unsigned x = 0, y = 0;
  char tail = 0;
  if (std::sscanf(text.c_str(), "%u,%u%c", &x, &y, &tail) != 2 || x < 1 || y < 1 || x == y)
    throw Error(ErrorKind::usage, "--axes takes two different component numbers, e.g. 1,2; got '" + text + "'");
  return {x - 1, y - 1};
}

}  // namespace

CommandRunner add_map_command(CLI::App& app) {
  auto* command = app.add_subcommand("map", "Principal components of the segments: coordinates, variance, loadings, plot");
  auto options = std::make_shared<MeasureCommandOptions>();
  auto components = std::make_shared<std::size_t>(2);
  auto top = std::make_shared<std::size_t>(10);
  auto input = std::make_shared<std::string>("z");
  auto axes = std::make_shared<std::string>("1,2");
  auto title = std::make_shared<std::string>();
  options->add_to(*command, {"tsv", "json", "svg"}, false);
  command->add_option("--components", *components, "principal components computed (1 or more)")
      ->check(at_least_one())
      ->capture_default_str();
  command->add_option("--top", *top, "features listed per pole of each component (the SVG plot names up to 6 beside each axis)")->capture_default_str();
  command->add_option("--pca-input", *input, "z (z-scores) or relative (relative frequencies)")
      ->check(CLI::IsMember({"z", "relative"}))
      ->capture_default_str();
  command->add_option("--axes", *axes, "components plotted on x and y (svg)")->capture_default_str();
  command->add_option("--title", *title, "plot title (svg)");
  return [=]() -> int {
    Request request = options->to_request();
    const auto [x, y] = parse_axes(*axes);
    request.compute_distances = false;
    request.compute_pca = true;
    request.pca.components = std::max({*components, x + 1, y + 1});
    request.pca.top_features = *top;
    request.pca.input = *input == "relative" ? PcaInput::relative_frequencies : PcaInput::z_scores;
    const Analysis analysis = run_analysis(request);
    write_output(options->output, [&](std::ostream& out) {
      if (options->format == "json") {
        out << json_text(map_json(analysis), 2) << '\n';
      } else if (options->format == "svg") {
        PcaPlotOptions plot;
        plot.x_component = x;
        plot.y_component = y;
        plot.title = *title;
        out << render_svg_scatter(pca_scatter(analysis, plot));
      } else {
        write_map_tsv(out, analysis);
      }
    });
    return 0;
  };
}

}  // namespace manicule::cli
