// Why a file could not be opened, in words an editor can act on.
#pragma once
#include <string>

namespace manicule {

// The system's reason for errno value `error_number` from opening `path`; for a symbolic
// link whose target is missing it says so and names the target, since the system's "No
// such file or directory" reads as if the link itself were missing from the archive.
std::string open_failure_reason(const std::string& path, int error_number);

}  // namespace manicule
