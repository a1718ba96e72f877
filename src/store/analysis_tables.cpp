#include "store/analysis_tables.h"

#include "core/sha256.h"
#include "core/utf8_text.h"
#include "store/row_inserter.h"
#include "store/run_log.h"

namespace manicule::store {

std::string analysis_key(const nlohmann::json& parameters, const StoredSelection& selection) {
  Sha256 h;
  std::string p = json_text(parameters);
  h.update(p.data(), p.size());
  // Each file's stem too: the segments' ids begin with it, and it changes when a file of
  // the same name joins the store elsewhere; an analysis stored with the ids of before is
  // then not the answer.
  for (std::size_t i = 0; i < selection.paths.size(); ++i) {
    std::string line = "\n" + selection.paths[i] + "\t" + selection.sha256[i] + "\t" + selection.stems[i];
    h.update(line.data(), line.size());
  }
  return h.hex_digest();
}

std::optional<std::int64_t> find_analysis(Database& db, const std::string& key) {
  Statement find = db.prepare(
      "SELECT run_id FROM runs WHERE kind = 'analysis' AND status = 'done' AND analysis_key = ?1 "
      "ORDER BY run_id DESC LIMIT 1");
  find.bind(1, key);
  if (find.step()) return find.int64_at(0);
  return std::nullopt;
}

namespace {

void write_segments(Database& db, std::int64_t run, const Analysis& a, const StoredCorpus& stored) {
  RowInserter insert(db,
                     "INSERT INTO analysis_segments (run_id, segment, path, sha256, ordinal, label, author, tokens, "
                     "measured, excluded_reason, year)",
                     11);
  for (std::size_t i = 0; i < a.segments.size(); ++i) {
    const SegmentSummary& s = a.segments[i];
    const SegmentSource& src = stored.sources[i];
    insert.add(run, s.id, src.path, src.sha256, src.ordinal, s.label, s.author, s.tokens, s.measured ? 1 : 0,
               s.excluded_reason.empty() ? std::nullopt : std::optional<std::string>(s.excluded_reason),
               src.year ? std::optional<int>(src.year) : std::nullopt);
  }
  insert.finish();
}

void write_features(Database& db, std::int64_t run, const FeatureTable& t) {
  RowInserter insert(db, "INSERT INTO features (run_id, rank, form, total, mean, sd)", 6);
  for (std::size_t j = 0; j < t.feature_count(); ++j) {
    auto col = static_cast<Eigen::Index>(j);
    insert.add(run, t.feature_ranks[j], t.features[j], t.feature_totals[j], t.mean(col), t.sd(col));
  }
  insert.finish();
}

void write_neighbours(Database& db, std::int64_t run, const Analysis& a) {
  if (!a.distances) return;
  RowInserter insert(db, "INSERT INTO neighbours (run_id, segment, rank, neighbour, distance)", 5);
  const DistanceResult& d = *a.distances;
  for (std::size_t r = 0; r < d.rows.size(); ++r)
    for (std::size_t k = 0; k < d.nearest[r].size(); ++k)
      insert.add(run, a.segments[d.rows[r]].id, k + 1, a.segments[d.nearest[r][k].segment].id, d.nearest[r][k].distance);
  insert.finish();
}

void write_pca(Database& db, std::int64_t run, const PcaResult& pca) {
  Statement component = db.prepare(
      "INSERT INTO pca_components (run_id, component, explained_variance, explained_variance_ratio) "
      "VALUES (?1, ?2, ?3, ?4)");
  RowInserter coordinate(db, "INSERT INTO pca_coordinates (run_id, segment, component, value)", 4);
  for (Eigen::Index c = 0; c < pca.coordinates.cols(); ++c) {
    component.run(run, static_cast<std::int64_t>(c + 1), pca.explained_variance(c), pca.explained_variance_ratio(c));
    for (Eigen::Index r = 0; r < pca.coordinates.rows(); ++r)
      coordinate.add(run, pca.segment_ids[static_cast<std::size_t>(r)], static_cast<std::int64_t>(c + 1),
                     pca.coordinates(r, c));
  }
  coordinate.finish();
}

}  // namespace

std::int64_t write_analysis(Database& db, std::int64_t settings_id, const nlohmann::json& parameters,
                            const std::string& key, const Analysis& analysis, const StoredCorpus& stored,
                            const std::vector<std::string>& notes, std::size_t files_failed,
                            const std::vector<AttributionRow>& attributions) {
  nlohmann::json recorded = parameters;
  for (const auto& [k, v] : analysis.provenance.parameters) recorded["results"][k] = v;
  recorded["notes"] = notes;
  Transaction t(db);
  std::int64_t run = begin_run(db, "analysis", settings_id, recorded);
  db.prepare("UPDATE runs SET analysis_key = ?2 WHERE run_id = ?1").run(run, key);
  write_segments(db, run, analysis, stored);
  write_features(db, run, analysis.table);
  write_neighbours(db, run, analysis);
  if (analysis.pca) write_pca(db, run, *analysis.pca);
  RowInserter attribution(db,
                          "INSERT INTO attributions (run_id, segment, rank, candidate, distance, nearest_segment, "
                          "nearest_distance, margin, stability, rule, warnings)",
                          11);
  for (const auto& a : attributions)
    attribution.add(run, a.segment, a.rank, a.candidate, a.distance, a.nearest_segment, a.nearest_distance, a.margin,
                    a.stability, a.rule, a.warnings);
  attribution.finish();
  RunCounters counters;
  counters.files_found = stored.corpus.files.size();
  counters.files_failed = files_failed;
  update_run(db, run, counters);
  finish_run(db, run, "done");
  t.commit();
  return run;
}

}  // namespace manicule::store
