// Analyses over the stored archive, reading no XML: builds a Corpus from the store
// (load_stored_corpus) for one settings and a filter, runs the facade's analyse_corpus
// (distances with the k nearest segments, PCA when asked), ranks the candidate authors of
// the questioned segments when asked (src/attribution, with Request::attribution), and
// records the result as an analysis run. An identical earlier analysis (same parameters,
// same files and contents) is reused unless `recompute`.
#pragma once
#include <cstdint>
#include <future>
#include <string>
#include <vector>

#include "core/analysis_progress.h"
#include "core/request.h"
#include "store/archive_filter.h"
#include "store/fresh_counts.h"
#include "store/sqlite_db.h"

namespace manicule::store {

struct StoreAnalysisResult {
  std::int64_t run_id = 0;
  bool reused = false;            // an identical analysis was in the store already
  std::size_t files = 0;          // files whose segments were analysed
  std::size_t segments = 0;       // segments loaded (long enough)
  std::size_t measured = 0;       // rows of the feature table
  std::size_t features = 0;
  std::size_t files_failed = 0;   // stored as failed, left out
  std::size_t files_not_read = 0; // in the store but not read under these settings
  std::size_t attributions = 0;
  std::vector<std::string> notes;
};

struct StoreAnalysisOptions {
  ArchiveFilter filter;
  bool attribute = false;  // rank candidates for the questioned segments
  bool recompute = false;
  AnalysisProgress progress;  // each step as it starts, and how far (may be empty)
};

// Opens, on a thread of its own, the BLAS the analysis of `request` takes its Gram matrix
// from (a few milliseconds of loading and thread start); an invalid future when the
// measure needs none. analyse_store does this itself; a caller that knows earlier that an
// analysis will follow (a batch that reads files) can start it sooner and wait before.
std::future<void> open_blas_ahead(const Request& request);

// `request` gives the analysis options (feature space, measure, neighbours, PCA,
// attribution) and must carry the reading settings of `settings_id`. Throws
// Error(nothing_selected) when the filter leaves fewer than two segments. With `attribute`,
// a run without questioned segments or candidates records none and says so in the notes.
// `fresh`, from a batch run just before in this process, spares reading back what that run
// stored (it is used up).
StoreAnalysisResult analyse_store(Database& db, std::int64_t settings_id, const Request& request,
                                  const StoreAnalysisOptions& options, FreshCounts* fresh = nullptr);

}  // namespace manicule::store
