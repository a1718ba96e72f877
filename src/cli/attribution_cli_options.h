// Options shared by `attribute`, `verify` and `evaluate`: the measuring options (with
// 2,000 most frequent features by default, see docs/attribution.md), the labels file,
// impostor folders, the candidate rule and the resampling and impostor settings.
// run_attribution() turns them into an Analysis with the segment roles assigned and the
// attribution settings recorded in the provenance.
#pragma once
#include <functional>
#include <memory>
#include <ostream>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "attribution/segment_roles.h"
#include "cli/commands.h"
#include "cli/measure_output.h"

namespace manicule::cli {

enum class AttributionTask { attribute, verify, evaluate };

struct AttributionCommandOptions {
  MeasureCommandOptions measuring;
  std::string labels_file;
  std::vector<std::string> impostor_inputs;
  std::string rule = "weighted-centroid";
  AttributionOptions settings;
  bool with_verification = false;  // evaluate: also General Impostors
  std::size_t top = 0;             // attribute: candidates listed per segment (0 = all)
  std::string table = "predictions";  // evaluate: which TSV table

  void add_to(CLI::App& command, AttributionTask task);
  Request to_request() const;
};

struct AttributionRun {
  Analysis analysis;
  SegmentRoles roles;
};

// Reads and measures (no distance matrix), assigns roles, prints notes to standard error.
AttributionRun run_attribution(const Request& request, AttributionTask task);

// A whole attribution command: its options, the run, `compute` (which fills the
// Analysis) and the output in the chosen format.
using AttributionStep = std::function<void(AttributionRun&, const Request&, const AttributionCommandOptions&)>;
using AttributionWriter = std::function<void(std::ostream&, const Analysis&, const AttributionCommandOptions&)>;
CommandRunner attribution_command(CLI::App& app, const std::string& name, const std::string& description,
                                  AttributionTask task, AttributionStep compute, AttributionWriter write_json,
                                  AttributionWriter write_tsv);

}  // namespace manicule::cli
