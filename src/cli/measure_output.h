// What the measuring commands (profile, distances, map, tree) share: reading the same
// options into one Request, running the facade with the user told what was left out,
// the head every JSON result starts with (provenance, notes, segments), the TSV parameter
// header, numbers written so that they read back to the same double, and writing to a
// file or to standard output.
#pragma once
#include <functional>
#include <memory>
#include <ostream>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include "cli/analysis_options.h"
#include "cli/output_file.h"
#include "cli/selection_options.h"
#include "core/analysis.h"

namespace manicule::cli {

struct MeasureCommandOptions {
  SelectionOptions selection;
  AnalysisOptions analysis;
  std::string format;
  std::string output;  // "" or "-": standard output

  // Adds the selection and analysis options, --format (first of `formats` is the
  // default) and --output; --neighbours only where the output lists nearest segments.
  void add_to(CLI::App& command, const std::vector<std::string>& formats, bool with_measure,
              bool with_neighbours = false);
  Request to_request() const;
};

// Runs the facade; prints the run's notes to standard error as "manicule: note: ...".
Analysis run_analysis(const Request& request);

// The shortest decimal form that reads back to the same double ("0.1", "1e-05").
std::string exact_number(double value);

// {"name", "citation", "computed_on"} of a distance measure.
nlohmann::json measure_json(DistanceMeasure measure);

// One segment as JSON: id, label, author, file, unit, tokens, measured / why not.
nlohmann::json segment_json(const SegmentSummary& segment);
// {"provenance", "notes", "segments"} for every JSON result.
nlohmann::json analysis_json_head(const Analysis& analysis);

// Provenance, parameters, notes and left-out segments as "# key: value" lines.
void write_analysis_parameters(std::ostream& out, const Analysis& analysis);

}  // namespace manicule::cli
