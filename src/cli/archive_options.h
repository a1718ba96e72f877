// Options of the archive-store commands (batch, analyse-store): the store file, header
// filters for sub-corpora, the shard of a cluster array job, and PCA. One definition so
// that every store command spells them alike.
#pragma once
#include <string>

#include <CLI/CLI.hpp>

#include "store/archive_files.h"
#include "store/archive_filter.h"

namespace manicule::cli {

struct ArchiveFilterOptions {
  std::string folder, author, years, language, title;

  void add_to(CLI::App& command);
  // Throws Error(usage) for a malformed --years.
  store::ArchiveFilter to_filter() const;
};

// "K/N" with 1 <= K <= N; throws Error(usage) otherwise.
store::Shard parse_shard(const std::string& text);

}  // namespace manicule::cli
