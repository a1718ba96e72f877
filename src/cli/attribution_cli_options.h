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

// What a run computes, for the parameters it records (annotate may rank and verify at once).
struct AttributionSteps {
  bool ranking = false;     // attribute: candidates ranked, stability
  bool impostors = false;   // verify / evaluate: General Impostors
  bool evaluation = false;  // evaluate: leave-one-out
};

// Ranks of the most frequent features attribution uses by default (docs/attribution.md).
inline constexpr const char* kAttributionRanks = "1-2000";

// `options.apply_to(request)`, with kAttributionRanks instead of the measuring default when
// the run attributes and `command` was given no --ranks.
void apply_measuring_options(const AnalysisOptions& options, const CLI::App& command, bool attributing,
                             Request& request);

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
  // Only the attribution settings (labels, rule, z limit, seed, warnings), with the
  // stability and the General Impostors options as asked: for a command that has its own
  // selection and analysis options (annotate).
  void add_settings(CLI::App& command, bool stability, bool impostors);
  Request to_request() const;
  // Fills request.attribution; impostor folders are added to the inputs.
  void apply_settings(Request& request) const;
};

struct AttributionRun {
  Analysis analysis;
  SegmentRoles roles;
};

// Reads and measures (no distance matrix), assigns roles, prints notes to standard error.
AttributionRun run_attribution(const Request& request, AttributionTask task);

// Assigns the segment roles of an analysed run, prints and keeps the notes, and records
// the attribution settings in the provenance.
SegmentRoles assign_roles_noting(Analysis& analysis, const Request& request, AttributionSteps steps);

// A whole attribution command: its options, the run, `compute` (which fills the
// Analysis) and the output in the chosen format.
using AttributionStep = std::function<void(AttributionRun&, const Request&, const AttributionCommandOptions&)>;
using AttributionWriter = std::function<void(std::ostream&, const Analysis&, const AttributionCommandOptions&)>;
CommandRunner attribution_command(CLI::App& app, const std::string& name, const std::string& description,
                                  AttributionTask task, AttributionStep compute, AttributionWriter write_json,
                                  AttributionWriter write_tsv);

}  // namespace manicule::cli
