#include "store/store_analysis.h"

#include "core/error.h"
#include "core/facade.h"
#include "store/analysis_tables.h"
#include "store/store_settings.h"
#include "store/stored_corpus.h"

namespace manicule::store {

namespace {

nlohmann::json analysis_parameters(Database& db, std::int64_t settings_id, const Request& r,
                                   const ArchiveFilter& filter) {
  std::string settings_key;
  for (const auto& s : list_settings(db))
    if (s.id == settings_id) settings_key = s.settings.key;
  const FeatureSpaceOptions& fs = r.feature_space;
  nlohmann::json p = {{"settings_key", settings_key},
                      {"filter", filter.describe()},
                      {"ranks", std::to_string(fs.rank_first) + "-" + std::to_string(fs.rank_last)},
                      {"culling_percent", fs.culling_percent},
                      {"stop_words", fs.stop_words},
                      {"min_tokens", fs.min_segment_tokens},
                      {"measure", std::string(measure_info(r.measure).name)},
                      {"neighbours", r.neighbours},
                      {"pca", r.compute_pca}};
  if (r.compute_pca)
    p["pca_options"] = {{"components", r.pca.components},
                        {"input", r.pca.input == PcaInput::z_scores ? "z-scores" : "relative frequencies"}};
  return p;
}

// Hook for the attribution layer (src/attribution): once it offers a ranking of candidate
// authors for the questioned segments of an Analysis, convert its result to AttributionRow
// here; write_analysis stores the rows in the attributions table. Until then: none.
std::vector<AttributionRow> attribute_questioned(const Request&, const Analysis&) { return {}; }

}  // namespace

StoreAnalysisResult analyse_store(Database& db, std::int64_t settings_id, const Request& request,
                                  const ArchiveFilter& filter, bool recompute) {
  const StoredSelection selection = select_stored_files(db, settings_id, filter);
  StoreAnalysisResult result;
  result.files_failed = selection.files_failed;
  result.files_not_read = selection.files_not_read;
  const nlohmann::json parameters = analysis_parameters(db, settings_id, request, filter);
  const std::string key = analysis_key(parameters, selection);
  if (!recompute) {
    if (auto existing = find_analysis(db, key)) {
      result.run_id = *existing;
      result.reused = true;
      Statement count = db.prepare(
          "SELECT (SELECT count(DISTINCT path) FROM analysis_segments WHERE run_id = ?1), "
          "(SELECT count(*) FROM analysis_segments WHERE run_id = ?1), "
          "(SELECT count(*) FROM analysis_segments WHERE run_id = ?1 AND measured = 1), "
          "(SELECT count(*) FROM features WHERE run_id = ?1), (SELECT count(*) FROM attributions WHERE run_id = ?1)");
      count.bind(1, *existing);
      count.step();
      result.files = static_cast<std::size_t>(count.int64_at(0));
      result.segments = static_cast<std::size_t>(count.int64_at(1));
      result.measured = static_cast<std::size_t>(count.int64_at(2));
      result.features = static_cast<std::size_t>(count.int64_at(3));
      result.attributions = static_cast<std::size_t>(count.int64_at(4));
      return result;
    }
  }

  StoredCorpus stored = load_stored_corpus(db, settings_id, request.features, filter, selection,
                                           request.feature_space.min_segment_tokens);
  result.files = stored.corpus.files.size();
  result.segments = stored.corpus.segments.size();
  result.too_short = stored.segments_too_short;
  if (stored.corpus.segments.size() < 2)
    throw Error(ErrorKind::nothing_selected,
                std::to_string(stored.corpus.segments.size()) + " stored segment(s) of at least " +
                    std::to_string(request.feature_space.min_segment_tokens) +
                    " words pass the filter; an analysis needs two (lower --min-tokens, widen the filter, or run batch "
                    "over more files)");
  Request analysis_request = request;
  analysis_request.compute_distances = true;
  Analysis analysis = analyse_corpus(analysis_request, stored.corpus);
  std::vector<AttributionRow> attributions = attribute_questioned(analysis_request, analysis);
  result.run_id = write_analysis(db, settings_id, parameters, key, analysis, stored, attributions);
  result.measured = analysis.table.segment_count();
  result.features = analysis.table.feature_count();
  result.attributions = attributions.size();
  result.notes = analysis.notes;
  if (stored.segments_too_short)
    result.notes.push_back(std::to_string(stored.segments_too_short) + " segment(s) shorter than " +
                           std::to_string(request.feature_space.min_segment_tokens) + " words left out");
  return result;
}

}  // namespace manicule::store
