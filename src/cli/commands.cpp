#include "cli/commands.h"

namespace manicule::cli {

std::vector<CommandAdder> all_commands() {
  return {add_segments_command,
          add_profile_command, add_distances_command, add_map_command, add_tree_command,
          add_annotate_command, add_show_command, add_export_command,
          add_batch_command, add_analyse_store_command, add_merge_command,
          add_attribute_command, add_verify_command, add_evaluate_command};
}

}  // namespace manicule::cli
