#include "cli/store_report.h"

#include "store/unfinished_work.h"

#include "attribution/attribution_result.h"

namespace manicule::cli {

void report_batch(std::ostream& out, const std::string& store, const store::BatchSummary& s) {
  const store::RunCounters& c = s.counters;
  if (!s.recorded()) {
    out << "store " << store << ": nothing changed: " << c.files_found << " file(s) as stored, " << c.files_failed
        << " failing; no batch run recorded\n";
    return;
  }
  out << "store " << store << ": batch run " << s.run_id << ": " << c.files_found << " file(s): " << c.files_read
      << " read, " << c.files_hashed << " hashed and known, " << c.files_unchanged << " unchanged, " << c.files_failed
      << " failing";
  if (!s.removed.empty()) {
    out << "; " << s.removed.size() << " no longer found";
    if (s.removed_content_kept)
      out << " (" << s.removed_content_kept << " of them with their content now under another path: moved or renamed?)";
  }
  if (s.files_respelled) out << "; " << s.files_respelled << " now under another spelling of their path";
  out << '\n';
}

void report_failures(std::ostream& err, const store::BatchSummary& s, bool every_one) {
  // A large archive may hold hundreds of failing files, named again at each run: past a
  // screenful the rest are counted, and the store lists them all.
  constexpr std::size_t kNamedAtMost = 20;
  const bool cut = !every_one && s.failures.size() > kNamedAtMost;
  const std::size_t named = cut ? kNamedAtMost / 2 : s.failures.size();
  for (std::size_t i = 0; i < named; ++i) err << "manicule: failed: " << s.failures[i].message << '\n';
  if (cut)
    err << "manicule: note: " << s.failures.size() - named
        << " more failing file(s) not named here: --verbose names them all, as does the store: SELECT path, error "
           "FROM file_list WHERE status = 'failed'\n";
  for (const auto& folder : s.unlisted)
    err << "manicule: failed: " << folder.path << ": cannot list the folder: " << folder.reason
        << "; its files were not looked at, and those stored from it before are kept\n";
}

void report_files_without_segments(std::ostream& err, const store::BatchSummary& s, const std::string& unit) {
  if (!s.files_without_segments) return;
  err << "manicule: note: " << s.files_without_segments << " of the " << s.files_read_cleanly
      << " file(s) read hold no segment of --unit " << unit;
  if (s.files_without_segments == s.files_read_cleanly && !s.store_holds_segments)
    err << ": is it the unit meant? (manicule segments FILE --unit UNIT lists what a unit takes from a file)";
  err << '\n';
}

void report_left_aside(std::ostream& err, const store::BatchSummary& s) {
  if (s.left_aside.count)
    err << "manicule: note: " << s.left_aside.count << " other file(s) below the folders left aside, such as "
        << s.left_aside.first << " (a folder's files are read when named *.xml or *.tei)\n";
  if (s.left_aside.hidden)
    err << "manicule: note: " << s.left_aside.hidden << " hidden file(s) or folder(s) passed by, such as "
        << s.left_aside.first_hidden << "\n";
}

void report_analysis(std::ostream& out, std::ostream& err, const store::StoreAnalysisResult& r) {
  out << "analysis run " << r.run_id << (r.reused ? " (unchanged, reused)" : "") << ": " << r.files << " file(s), "
      << r.measured << " segment(s) measured, " << r.features << " feature(s)";
  if (r.attributions) out << ", " << r.attributions << " attribution row(s)";
  out << '\n';
  if (r.attributions) out << "caution: " << kAttributionCaution << '\n';
  for (const auto& note : r.notes) err << "manicule: note: " << note << '\n';
  if (r.files_failed) err << "manicule: note: " << r.files_failed << " file(s) stored as failed were left out\n";
  if (r.files_not_read)
    err << "manicule: note: " << r.files_not_read
        << " file(s) in the store were not read with these settings (run batch with them)\n";
}

void report_merge(std::ostream& out, const std::string& input, const store::MergeSummary& s) {
  out << "merged " << input << ": " << s.readings_added << " content(s), " << s.segments_added << " segment(s), "
      << s.files_added << " file(s) added, " << s.files_updated << " updated\n";
}

void report_unfinished_work(std::ostream& err, store::Database& db, std::int64_t settings_id) {
  for (const std::string& note : store::unfinished_work(db, settings_id))
    err << "manicule: note: " << db.path() << ": " << note << "; the analysis measures what the store holds now\n";
}

}  // namespace manicule::cli
