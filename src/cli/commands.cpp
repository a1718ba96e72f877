#include "cli/commands.h"

namespace manicule::cli {

std::vector<CommandEntry> all_commands() {
  return {{"segments", add_segments_command},
          {"profile", add_profile_command},
          {"distances", add_distances_command},
          {"map", add_map_command},
          {"tree", add_tree_command},
          {"annotate", add_annotate_command},
          {"show", add_show_command},
          {"export", add_export_command},
          {"batch", add_batch_command},
          {"analyse-store", add_analyse_store_command},
          {"merge", add_merge_command},
          {"attribute", add_attribute_command},
          {"verify", add_verify_command},
          {"evaluate", add_evaluate_command}};
}

}  // namespace manicule::cli
