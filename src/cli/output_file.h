// Where a command's results go (-o FILE, else standard output).
#pragma once
#include <functional>
#include <ostream>
#include <string>
#include <vector>

namespace manicule::cli {

// Writes through `write` to `path`, or to standard output when path is "" or "-".
// - A file is written into a temporary beside it (".<name>.manicule-tmp-<pid>"), streamed,
//   and renamed over it once whole: a failure half-way (a full disk) leaves the earlier
//   file as it was. A symbolic link keeps pointing where it did; the file keeps its mode.
// - A device, a pipe or a descriptor (/dev/stdout, /dev/fd/N, /proc/...) is written to as
//   it is, at its end: /dev/stdout may lead to a log file the shell appends to, which is
//   neither replaced nor emptied.
// - Where no temporary can be made beside the file (a folder one may not write in, a file
//   one may), the file is written in place, as before.
// Error(write_failed) naming the file if it cannot be written.
void write_output(const std::string& path, const std::function<void(std::ostream&)>& write);

// Error(usage) when `output` is one of the files `inputs` names (given, or found in a
// folder given): the results would take the place of an edition.
void refuse_output_over_input(const std::string& output, const std::vector<std::string>& inputs);

}  // namespace manicule::cli
