#include "cli/commands.h"

namespace manicule::cli {

std::vector<CommandAdder> all_commands() {
  return {add_segments_command};
}

}  // namespace manicule::cli
