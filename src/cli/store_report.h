// What the archive-store commands print when they finish: one line per run done, with
// the counters a user checks (files read, unchanged, failed; segments measured), and each
// failing file with its error. Plain text on stdout; failures and notes on stderr.
#pragma once
#include <ostream>
#include <string>

#include "store/batch_run.h"
#include "store/store_analysis.h"
#include "store/store_merge.h"

namespace manicule::cli {

void report_batch(std::ostream& out, const std::string& store, const store::BatchSummary& summary);
// The failing files, each with its reason: all of them with `every_one`, else at most a
// screenful (the first ten of more than twenty, then how many more and where they are listed).
void report_failures(std::ostream& err, const store::BatchSummary& summary, bool every_one);
// How many files below the input folders were not taken for TEI by their names, and how
// many hidden ones were passed by, with one of each.
void report_left_aside(std::ostream& err, const store::BatchSummary& summary);
// Files read without failing that hold no segment of `unit`, if any.
void report_files_without_segments(std::ostream& err, const store::BatchSummary& summary, const std::string& unit);
void report_analysis(std::ostream& out, std::ostream& err, const store::StoreAnalysisResult& result);
void report_merge(std::ostream& out, const std::string& input, const store::MergeSummary& summary);
// Before an analysis: the store's unfinished work under these settings (unfinished_work.h),
// a note each, for the analysis then measures part of the archive.
void report_unfinished_work(std::ostream& err, store::Database& db, std::int64_t settings_id);

}  // namespace manicule::cli
