// Exit codes of the manicule command (also in the README and DEVELOPERS.md):
//   0  success
//   1  finished, but some input files failed (batch runs; each failure is reported)
//   2  usage: unknown option, bad value, missing argument
//   3  bad input: a file is unreadable, malformed, hostile or not TEI (file:line:column)
//   4  nothing selected: the selection found no text to work on
//   5  an output could not be written (the edition is left as it was)
//   6  the edition changed on disk between reading and writing (nothing written)
//  70  internal error (a bug)
// 130  interrupted by Ctrl-C (143: by SIGTERM) during a batch run; what was stored is kept
#pragma once

namespace manicule::cli {
inline constexpr int kExitOk = 0;
inline constexpr int kExitSomeFilesFailed = 1;
inline constexpr int kExitUsage = 2;
}  // namespace manicule::cli
