// `manicule attribute`: for each questioned segment, the candidates ranked by distance,
// with the margin between the first two, the stability of the first place under
// resampled features, the nearest single segment of each candidate, size warnings, and
// the caution that this is evidence to weigh, not proof.
#include "attribution/attribute.h"
#include "cli/attribution_cli_options.h"
#include "cli/attribution_output.h"
#include "core/utf8_text.h"

namespace manicule::cli {

CommandRunner add_attribute_command(CLI::App& app) {
  return attribution_command(
      app, "attribute", "Rank the candidate authors of each questioned segment, with margins, stability and warnings",
      AttributionTask::attribute,
      [](AttributionRun& run, const Request& request, const AttributionCommandOptions&) {
        run.analysis.attributions =
            attribute_questioned(run.analysis, run.roles, request.measure, request.attribution, request.threads);
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions& options) {
        out << json_text(attributions_json(analysis, options.top), 2) << '\n';
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions& options) {
        write_attributions_tsv(out, analysis, options.top);
      });
}

}  // namespace manicule::cli
