// Opening a file the user named for reading, refusing what is not a regular file: a named
// pipe would block the open (or the read) for ever, a device such as /dev/zero would be read
// without end, and a folder reads as nothing. The open itself does not block (O_NONBLOCK,
// dropped again once the file is known to be regular).
#pragma once
#include <cstdio>
#include <string>

namespace manicule {

// An open stream for `path`, or an Error (bad_input) naming `path` and saying why, with
// `what` ("the file", "the stop list") in the message.
std::FILE* open_regular_file(const std::string& path, const std::string& what = "the file");

// The whole of such a file, read through open_regular_file; Error(bad_input) "cannot read "
// + `what` on a read error.
std::string read_regular_file(const std::string& path, const std::string& what);

}  // namespace manicule
