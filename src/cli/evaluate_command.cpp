// `manicule evaluate`: leave-one-out over the labelled segments (or whole files), so an
// editor can see how far the settings can be trusted on their own material: accuracy,
// per-candidate precision and recall, the confusion matrix, each rule's accuracy, and
// optionally the verification figures AUC, c@1 and F0.5u.
#include "attribution/evaluation.h"
#include "cli/attribution_cli_options.h"
#include "cli/attribution_output.h"
#include "core/utf8_text.h"

namespace manicule::cli {

CommandRunner add_evaluate_command(CLI::App& app) {
  return attribution_command(
      app, "evaluate", "Leave-one-out test of attribution (and verification) on the labelled segments of the run",
      AttributionTask::evaluate,
      [](AttributionRun& run, const Request& request, const AttributionCommandOptions& options) {
        run.analysis.evaluation = evaluate_labelled(run.analysis, run.roles, request.measure, request.attribution,
                                                    options.with_verification, request.threads);
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions&) {
        out << json_text(evaluation_json(analysis), 2) << '\n';
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions& options) {
        write_evaluation_tsv(out, analysis, options.table);
      });
}

}  // namespace manicule::cli
