// `manicule profile`: the feature table itself, one row a measured segment and one column
// a feature (rank order), as TSV for R or Python: counts, relative frequencies (default)
// or z-scores, every number in the shortest form that reads back exactly.
#include "cli/commands.h"
#include "cli/measure_output.h"
#include "cli/table_output.h"

namespace manicule::cli {

CommandRunner add_profile_command(CLI::App& app) {
  auto* command = app.add_subcommand("profile", "Write the feature table (segments x features) as TSV");
  auto options = std::make_shared<MeasureCommandOptions>();
  auto values = std::make_shared<std::string>("relative");
  options->add_to(*command, {"tsv"}, false);
  command->add_option("--values", *values, "counts, relative (frequencies) or z (z-scores)")
      ->check(CLI::IsMember({"counts", "relative", "z"}))
      ->capture_default_str();
  return [=]() -> int {
    Request request = options->to_request();
    request.compute_distances = false;
    const Analysis analysis = run_analysis(request);
    const FeatureTable& table = analysis.table;
    const RowMatrix counts = *values == "counts" ? feature_counts(table) : RowMatrix();
    const RowMatrix& numbers = *values == "counts" ? counts : *values == "z" ? table.z : table.relative;
    write_output(options->output, [&](std::ostream& out) {
      write_analysis_parameters(out, analysis);
      write_tsv_parameters(out, {{"values", *values == "counts"     ? "raw counts"
                                            : *values == "z"        ? "z-scores (sample sd, divisor n - 1)"
                                                                    : "relative frequencies (count / all tokens of the segment)"}});
      std::vector<std::string> row{"segment"};
      row.insert(row.end(), table.features.begin(), table.features.end());
      write_tsv_row(out, row);
      for (std::size_t r = 0; r < table.segment_count(); ++r) {
        row.assign(1, table.segment_ids[r]);
        for (Eigen::Index c = 0; c < numbers.cols(); ++c)
          row.push_back(exact_number(numbers(static_cast<Eigen::Index>(r), c)));
        write_tsv_row(out, row);
      }
    });
    return 0;
  };
}

}  // namespace manicule::cli
