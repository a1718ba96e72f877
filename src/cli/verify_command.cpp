// `manicule verify`: open-set verification by General Impostors: for each questioned
// segment and candidate, a score in [0, 1], read against an undecided band calibrated on
// the run's labelled segments, so that "none of these candidates" remains an answer.
#include "attribution/verify.h"
#include "cli/attribution_cli_options.h"
#include "cli/attribution_output.h"
#include "core/utf8_text.h"

namespace manicule::cli {

CommandRunner add_verify_command(CLI::App& app) {
  return attribution_command(
      app, "verify", "Test whether a candidate wrote each questioned segment (General Impostors, calibrated band)",
      AttributionTask::verify,
      [](AttributionRun& run, const Request& request, const AttributionCommandOptions&) {
        VerificationRun verified =
            verify_questioned(run.analysis, run.roles, request.measure, request.attribution, request.threads);
        run.analysis.verifications = std::move(verified.results);
        run.analysis.verification_band = verified.band;
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions&) {
        out << json_text(verifications_json(analysis), 2) << '\n';
      },
      [](std::ostream& out, const Analysis& analysis, const AttributionCommandOptions&) {
        write_verifications_tsv(out, analysis);
      });
}

}  // namespace manicule::cli
