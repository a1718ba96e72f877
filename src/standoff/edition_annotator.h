// Writing a run's results into editions: the whole of `annotate` below the command line.
//  1. Snapshot every edition (bytes, size, modification time, SHA-256) before analysing.
//  2. Analyse (analyse_for_standoff: profiles are written even where too few segments
//     are long enough for distances).
//  3. prepare_annotation: per edition, in memory: decode (UTF-16 -> UTF-8), scan, take out
//     what an earlier run of ours inserted, optionally give segment elements xml:ids,
//     build our standOff and header entries, splice them in, check the result with the
//     hardened parser, encode back. Nothing is written yet; any error stops here.
//  4. write_prepared: checks that each edition is unchanged on disk, then writes it
//     through a temporary file and a rename (safe_file.h).
// With several editions, each gets the results of its own segments; links to segments
// of another edition point there with a relative URI (other.xml#id). A separate results
// file (--standoff-file) is a TEI document of its own: teiHeader and our standOff only,
// pointing into the editions as edition.xml#id.
#pragma once
#include <string>
#include <vector>

#include "core/analysis.h"
#include "core/request.h"
#include "standoff/safe_file.h"
#include "standoff/standoff_builder.h"

namespace manicule {

enum class AnnotateMode { in_place, output, standoff_file };

struct AnnotateSettings {
  AnnotateMode mode = AnnotateMode::in_place;
  std::string output;  // the annotated copy (output) or the results file (standoff_file)
  bool add_ids = false;
  bool backup = false;
  StandoffOptions standoff;
};

struct PreparedOutput {
  std::string path;                   // where it goes
  std::string bytes;                  // the whole new file
  const FileSnapshot* replacing = nullptr;  // in-place: the edition as read
  std::vector<std::string> notes;     // for the user (header entries left out, ...)
  bool left_as_it_was = false;        // an edition without segments of the run: not written
  std::size_t ids_added = 0;
};

// Reads and analyses like analyse(); when distances need more long segments than there
// are, the analysis is repeated without them and a note says so.
Analysis analyse_for_standoff(const Request& request, const std::vector<std::string>& files);

// `analysis` must come from `editions` (same paths), and may hold segments of further
// files that were read but are not written into (impostor texts): nothing is written
// about those. With add_ids the editions' segments are renamed to the ids given. Throws Error(usage) for a bad combination of settings,
// Error(bad_input) for an edition that cannot be written into safely.
std::vector<PreparedOutput> prepare_annotation(Analysis& analysis, const std::vector<FileSnapshot>& editions,
                                               const AnnotateSettings& settings);

void write_prepared(const PreparedOutput& output, const AnnotateSettings& settings);

}  // namespace manicule
