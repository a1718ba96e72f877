// Corpus reading: the first half of every run. Expands the inputs to files, reads them in
// parallel (files are independent), selects segments, tokenises them and counts features.
// Results come back in input order whatever the thread schedule, so runs are repeatable.
#pragma once
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "core/request.h"
#include "core/segment.h"
#include "profile/count_profile.h"

namespace manicule {

struct SegmentRecord {
  Segment segment;          // runs are emptied unless Request::keep_text
  std::size_t tokens = 0;   // word tokens after tokenisation
  std::size_t types = 0;    // distinct word tokens
};

struct FileFailure {
  std::string file;
  std::string message;      // "file:line:column: what is wrong"
  int kind = 0;             // ErrorKind as int
};

struct Corpus {
  std::vector<std::string> files;       // in the order read
  std::vector<std::string> file_sha256;  // SHA-256 of each file's bytes ("" if unreadable)
  std::vector<SegmentRecord> segments;  // in file order, then document order
  CountProfile counts;                  // one SegmentCounts per segment, same order (empty
                                        // when the Request said keep_counts = false)
  std::vector<FileFailure> failures;
  std::size_t bytes = 0;                // input bytes read
};

// Called after each file: (files done, files in all, bytes done). One call at a time, on
// one of the reading threads (read_files_streaming).
using ProgressFn = std::function<void(std::size_t, std::size_t, std::size_t)>;

// A folder below an input that could not be listed (no permission, for one).
struct UnlistedFolder {
  std::string path;
  std::string reason;  // the system's words
};

// Files below an input folder that a folder's walk does not take by their names: how many,
// and the first of them in path order; and the hidden files and folders it passes by.
struct LeftAside {
  std::size_t count = 0;
  std::string first;
  std::size_t hidden = 0;
  std::string first_hidden;
};

// Whether a folder's walk takes a file by its name: *.xml or *.tei, letter case ignored
// (LETTER01.XML from an older system, edition.tei).
bool is_tei_file_name(const std::string& name);

// Lists the TEI files named by `inputs` (files as given; folders searched recursively for
// is_tei_file_name, passing by hidden files and folders, sorted). Throws Error(bad_input)
// for a path that does not exist. A folder below an input that cannot be listed is noted
// in `unlisted` and the rest still listed (for a batch over an archive, which goes on and
// keeps what it stored from there); without `unlisted` it stops the listing with
// Error(bad_input) naming it, never left out unsaid. The other files the folders hold, and
// the hidden ones, are counted in `left_aside`, when given: those `counts` holds, when it
// is given (a batch narrowed to one folder does not speak of what lies outside it).
std::vector<std::string> expand_inputs(const std::vector<std::string>& inputs,
                                       std::vector<UnlistedFolder>* unlisted = nullptr,
                                       LeftAside* left_aside = nullptr,
                                       const std::function<bool(const std::string& path)>& counts = {});

// `path` resolved against the working directory, without following links: equal for the
// spellings of one file's path (arch/x.xml, ./arch/x.xml, /home/editor/arch/x.xml).
std::string resolved_path(const std::string& path);

// Reads `files` (already expanded). A file that fails is recorded in `failures`; the
// others are still read. Throws only for a bad request, such as one file named twice
// (under one spelling of its path or two), or no file at all (nothing_selected).
Corpus read_corpus(const Request& request, const std::vector<std::string>& files,
                   const ProgressFn& progress = {});

}  // namespace manicule
