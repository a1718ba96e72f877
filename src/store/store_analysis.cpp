#include "store/store_analysis.h"

#include <algorithm>
#include <future>
#include <map>

#include "attribution/attribute.h"
#include "attribution/candidate_ranking.h"
#include "attribution/segment_roles.h"
#include "core/error.h"
#include "core/facade.h"
#include "core/side_task.h"
#include "core/utf8_text.h"
#include "measure/cosine_gram.h"
#include "measure/pairwise_distances.h"
#include "profile/stop_list.h"
#include "store/analysis_tables.h"
#include "store/store_settings.h"
#include "store/stored_corpus.h"
#include "tei/xpath_name_hint.h"

namespace manicule::store {

namespace {

nlohmann::json analysis_parameters(Database& db, std::int64_t settings_id, const Request& r,
                                   const StoreAnalysisOptions& options) {
  const ArchiveFilter& filter = options.filter;
  const FeatureSpaceOptions& fs = r.feature_space;
  nlohmann::json p = {{"settings_key", settings_key(db, settings_id)},
                      {"filter", filter.describe()},
                      {"ranks", std::to_string(fs.rank_first) + "-" + std::to_string(fs.rank_last)},
                      {"culling_percent", fs.culling_percent},
                      // as the analysis compares them (normalised like the tokens): the
                      // key of a question is that of its answer
                      {"stop_words", normalised_stop_words(fs.stop_words, r.tokenizer)},
                      {"min_tokens", fs.min_segment_tokens},
                      {"measure", std::string(measure_info(r.measure).name)},
                      {"neighbours", r.neighbours},
                      {"pca", r.compute_pca}};
  if (options.attribute) {
    const AttributionOptions& a = r.attribution;
    p["attribution"] = {{"rule", rule_option_name(a.rule)}, {"weight_spread", a.weight_spread}, {"z_limit", a.z_limit},
                        {"resamples", a.resamples}, {"resample_share", a.resample_share}, {"seed", a.seed},
                        {"reliable_words", a.reliable_words}, {"caution", kAttributionCaution}};
  }
  if (r.compute_pca)
    p["pca_options"] = {{"components", r.pca.components},
                        {"input", r.pca.input == PcaInput::z_scores ? "z-scores" : "relative frequencies"}};
  return p;
}

// The attribution layer's ranking of candidates for every questioned segment, as rows.
std::vector<AttributionRow> attribution_rows(const Request& request, Analysis& analysis,
                                             std::vector<std::string>& notes) {
  AttributionOptions options = request.attribution;
  options.labels_option = false;  // the store's analyses take the edition's labels alone
  SegmentRoles roles = assign_roles(analysis, options);
  notes.insert(notes.end(), roles.warnings.begin(), roles.warnings.end());
  try {
    analysis.attributions =
        attribute_questioned(analysis, roles, request.measure, options, request.threads);
  } catch (const Error& e) {
    if (e.kind() != ErrorKind::nothing_selected) throw;
    notes.push_back(std::string("no attribution: ") + e.what());
    return {};
  }
  std::vector<AttributionRow> rows;
  for (const auto& result : analysis.attributions) {
    for (const auto& c : result.candidates) {
      rows.push_back(AttributionRow{analysis.segments[result.segment].id, c.rank, c.candidate, c.distance,
                                    analysis.segments[c.nearest_segment].id, c.nearest_distance, result.margin,
                                    result.stability, result.rule, json_text(nlohmann::json(result.warnings))});
    }
  }
  return rows;
}

// Says which of the reasons holds, with what to do about it: the store holds no file, no
// file passes the filter, no file was read with these settings, the files hold no segment
// of this unit, or their segments are too short.
Error too_little_to_analyse(const ArchiveFilter& filter, const StoredSelection& selection, const StoredCorpus& stored,
                            const Request& request, bool other_settings_stored) {
  const std::size_t files = selection.paths.size();
  const std::size_t long_enough = stored.corpus.segments.size();
  const std::size_t found = long_enough + stored.segments_too_short;
  const std::size_t other_years = stored.segments_other_years + stored.segments_undated;
  const std::string of_files = std::to_string(files) + " stored file(s)" +
                               (filter.empty() ? "" : " passing the filter (" + filter.describe() + ")");
  std::string what;
  if (selection.files_in_store == 0) {
    what = "the store holds no file (run batch over the archive first)";
  } else if (files == 0 && selection.files_filtered_out == selection.files_in_store) {
    what = "none of the " + std::to_string(selection.files_in_store) + " stored file(s) passes the filter (" +
           filter.describe() + "): widen it";
    if (!filter.title.empty() && filter.title.find('*') == std::string::npos)
      what += " (a title pattern matches whole titles: '*" + filter.title + "*' finds it inside one)";
  } else if (files == 0) {
    what = "none of the stored files" + std::string(filter.empty() ? "" : " passing the filter") +
           " was read with these settings (" + std::to_string(selection.files_not_read) + " not read with them, " +
           std::to_string(selection.files_failed) + " failed): run batch with the same unit and options";
  } else if (found == 0 && stored.segments_other_texts > 0 && stored.segments_other_language == 0 &&
             stored.segments_other_years + stored.segments_undated == 0) {
    what = "none of the " + std::to_string(stored.segments_other_texts) + " segment(s) of the " + std::to_string(files) +
           " file(s) chosen belongs to a text whose own header passes the filter (" + filter.describe() +
           "; a teiCorpus's texts are taken by their own headers)";
  } else if (found == 0 && stored.segments_other_language > 0) {
    what = "none of the " + std::to_string(stored.segments_other_language) + " segment(s) of the " + std::to_string(files) +
           " file(s) chosen is in language " + filter.language + " (by its xml:lang, else its file's langUsage)";
  } else if (found == 0 && other_years > 0) {
    what = "none of the " + std::to_string(other_years) + " segment(s) of the " + std::to_string(files) +
           " file(s) chosen is dated in the years asked (by its own date, a letter's, else its file's): widen --years";
  } else if (found == 0) {
    what = "the " + of_files + " hold no segment of --unit " + request.unit + ": try another --unit in batch" +
           unprefixed_name_hint(request.unit) +
           std::string(other_settings_stored ? ", or the store's counts under other settings (analyse-store "
                                               "--settings, see --list-settings)"
                                             : "");
  } else if (long_enough == found) {  // every segment long enough: too few of them, not too short
    what = "the " + of_files + " hold " + std::to_string(found) + " segment(s) of this unit" +
           (filter.empty() ? "" : ": widen the filter or") + (filter.empty() ? ": " : " ") + "run batch over more files";
  } else {
    what = "of the " + std::to_string(found) + " segment(s) of the " + of_files + ", " + std::to_string(long_enough) +
           (long_enough == 1 ? " has " : " have ") + std::to_string(request.feature_space.min_segment_tokens) +
           " words or more: lower --min-tokens" + (filter.empty() ? "" : ", widen the filter") +
           " or run batch over more files";
  }
  return Error(ErrorKind::nothing_selected, "nothing to analyse, which needs two segments: " + what);
}

// Said when the segments analysed are in more than one language: the most frequent words
// are then taken from all of them together, and the nearest segments follow the language
// before the style. Empty when they share one (segments of unknown language aside). Only the
// segments measured count: one the feature table set aside (too short for a word pair) was
// not analysed, whatever its language.
std::string mixed_languages_note(const StoredCorpus& stored, const Analysis& analysis) {
  std::map<std::string, std::size_t> by_language;
  for (std::size_t i = 0; i < stored.sources.size() && i < analysis.segments.size(); ++i)
    if (analysis.segments[i].measured) ++by_language[stored.sources[i].language];
  std::vector<std::pair<std::string, std::size_t>> languages(by_language.begin(), by_language.end());
  const auto known = std::count_if(languages.begin(), languages.end(), [](const auto& l) { return !l.first.empty(); });
  if (known < 2) return {};
  std::stable_sort(languages.begin(), languages.end(), [](const auto& a, const auto& b) { return a.second > b.second; });
  std::string counts, unknown;
  for (const auto& [language, segments] : languages) {
    if (language.empty())
      unknown = "; " + std::to_string(segments) + " of unknown language";
    else
      counts += (counts.empty() ? "" : ", ") + language + " " + std::to_string(segments);
  }
  return "the segments analysed are in " + std::to_string(known) + " languages (" + counts + unknown +
         "): their most frequent words are taken from all of them together, so the nearest segments follow the "
         "language before the style; --language LANG analyses one language at a time";
}

// Said when one content is analysed under several paths (a file copied into another folder
// of the archive): each copy's segments are measured apart, each the other's nearest at
// distance 0, and count twice in the features' means. Empty when there is no copy.
std::string copies_note(const StoredCorpus& stored) {
  std::map<std::string, std::vector<std::string>> paths_of;  // content -> paths, in order read
  for (std::size_t f = 0; f < stored.corpus.files.size(); ++f)
    if (f < stored.corpus.file_sha256.size() && !stored.corpus.file_sha256[f].empty())
      paths_of[stored.corpus.file_sha256[f]].push_back(stored.corpus.files[f]);
  std::size_t contents = 0;
  std::string shown;
  for (const auto& [content, paths] : paths_of) {
    if (paths.size() < 2) continue;
    if (++contents > 3) continue;
    // Two paths of each, with how many more: 500 copies of one play made a line of 24,000
    // characters, stored with the run's notes too.
    std::string same = paths[0] + " = " + paths[1];
    if (paths.size() > 2) same += " and " + std::to_string(paths.size() - 2) + " more";
    shown += (shown.empty() ? "" : "; ") + same;
  }
  if (!contents) return {};
  return std::to_string(contents) + " content(s) analysed under more than one path, each copy measured apart (each " +
         "the other's nearest segments, at distance 0): " + shown + (contents > 3 ? "; and more" : "") +
         " (--folder takes one folder's copy; the files table gives each path's sha256)";
}

// What the choice of segments left out or mixed, as notes for the user: segments in several
// languages, too few words, no year for --years, files with no segment long enough.
void add_selection_notes(const ArchiveFilter& filter, std::size_t min_tokens, const StoredSelection& selection,
                         const StoredCorpus& stored, const Analysis& analysis, std::size_t files_used,
                         std::vector<std::string>& notes) {
  if (const std::string note = mixed_languages_note(stored, analysis); !note.empty()) notes.push_back(note);
  if (const std::string note = copies_note(stored); !note.empty()) notes.push_back(note);
  if (stored.segments_too_short)
    notes.push_back(std::to_string(stored.segments_too_short) + " segment(s) shorter than " +
                    std::to_string(min_tokens) + " words left out");
  // Files the filter passed by whole, said so that a sub-corpus's size needs no guessing
  // (--years 1850-1880 on an archive of novels leaves out most of its chapters this way,
  // before any is counted as a segment of other years). Undated ones are told apart below.
  if (const std::size_t outside = selection.files_filtered_out - selection.files_undated; outside && !filter.empty())
    notes.push_back(std::to_string(outside) + " of the " + std::to_string(selection.files_in_store) +
                    " stored file(s) left out by the filter (" + filter.describe() + ")");
  if (selection.files_undated)
    notes.push_back(std::to_string(selection.files_undated) +
                    " file(s) left out by --years for want of a year in their header (docs/store.md)");
  if (stored.segments_other_texts)
    notes.push_back(std::to_string(stored.segments_other_texts) +
                    " segment(s) of the files chosen left out by --author or --title: their own text's header "
                    "(a text of a teiCorpus) does not pass");
  if (stored.segments_undated)
    notes.push_back(std::to_string(stored.segments_undated) +
                    " segment(s) left out by --years for want of a year, their own or their file's");
  if (stored.segments_other_years)
    notes.push_back(std::to_string(stored.segments_other_years) +
                    " segment(s) of the files chosen left out by --years: dated by their own date "
                    "(a letter's), else their file's, outside the years");
  // Said, so that fewer files in the report than in the archive need no guessing.
  // Files without any segment of the unit (a play in a letter archive) are told apart from
  // those whose segments are too short or outside the filter: the remedies differ.
  const std::size_t unused = selection.paths.size() > files_used ? selection.paths.size() - files_used : 0;
  const std::size_t empty = std::min(unused, selection.files_without_segments);
  if (empty)
    notes.push_back(std::to_string(empty) + " of the " + std::to_string(selection.paths.size()) +
                    " file(s) selected hold no segment of this unit at all");
  if (unused > empty)
    notes.push_back(std::to_string(unused - empty) + " of the " + std::to_string(selection.paths.size()) +
                    " file(s) selected hold no segment of " + std::to_string(min_tokens) + " words or more" +
                    (filter.language.empty() ? "" : " in the language asked for") +
                    (filter.asks_years() ? " dated in the years asked" : ""));
}

}  // namespace

std::future<void> open_blas_ahead(const Request& request) {
  if (!uses_gram_matrix(request.measure)) return {};
  return start_side_task(open_blas);
}

StoreAnalysisResult analyse_store(Database& db, std::int64_t settings_id, const Request& request,
                                  const StoreAnalysisOptions& options, FreshCounts* fresh) {
  const ArchiveFilter& filter = options.filter;
  const StoredSelection selection = select_stored_files(db, settings_id, filter);
  StoreAnalysisResult result;
  result.files_failed = selection.files_failed;
  result.files_not_read = selection.files_not_read;
  const nlohmann::json parameters = analysis_parameters(db, settings_id, request, options);
  // The key takes the filter as a question, not as spelled: --author "Tide, Mara" finds
  // the analysis made for --author "mara tide" (the parameters keep the spelling given).
  nlohmann::json question = parameters;
  question["filter"] = filter.question_key();
  const std::string key = analysis_key(question, selection);
  if (!options.recompute) {
    if (auto existing = find_analysis(db, key)) {
      result.run_id = *existing;
      result.reused = true;
      // The files and measured segments are counted as the analysis recorded them in its
      // run (files_found, and the results in its parameters): counting distinct paths, or
      // the measured rows, would read every segment row of the analysis (1-4 ms).
      Statement count = db.prepare(
          "SELECT (SELECT files_found FROM runs WHERE run_id = ?1), "
          "(SELECT count(*) FROM analysis_segments WHERE run_id = ?1), "
          "COALESCE((SELECT CAST(json_extract(parameters, '$.results.\"segments measured\"') AS INTEGER) "
          "FROM runs WHERE run_id = ?1), "
          "(SELECT count(*) FROM analysis_segments WHERE run_id = ?1 AND measured = 1)), "
          "(SELECT count(*) FROM features WHERE run_id = ?1), (SELECT count(*) FROM attributions WHERE run_id = ?1), "
          "(SELECT json_extract(parameters, '$.notes') FROM runs WHERE run_id = ?1), "
          "(SELECT json_extract(parameters, '$.filter') FROM runs WHERE run_id = ?1)");
      count.bind(1, *existing);
      count.step();
      result.files = static_cast<std::size_t>(count.int64_at(0));
      result.segments = static_cast<std::size_t>(count.int64_at(1));
      result.measured = static_cast<std::size_t>(count.int64_at(2));
      result.features = static_cast<std::size_t>(count.int64_at(3));
      result.attributions = static_cast<std::size_t>(count.int64_at(4));
      // Asked before in other words (--author "Tide, Mara" after "mara tide"): its notes
      // name the filter in those, so they are said first.
      if (const std::string asked = count.text_at(6); asked != filter.describe())
        result.notes.push_back("the same question was asked before as " +
                               (asked.empty() ? std::string("(no filter)") : "(" + asked + ")") +
                               "; its analysis is given again, with its notes in those words");
      // Its notes, said again: the same segments give the same cautions.
      const nlohmann::json notes = nlohmann::json::parse(count.text_at(5), nullptr, false);
      if (notes.is_array())
        for (const auto& note : notes)
          if (note.is_string()) result.notes.push_back(note.get<std::string>());
      return result;
    }
  }

  // Cosine measures take their Gram matrix from the BLAS: it is opened while the corpus loads.
  std::future<void> blas = open_blas_ahead(request);
  StoredCorpus stored = load_stored_corpus(db, settings_id, request.features, filter, selection,
                                           request.feature_space.min_segment_tokens, fresh, options.progress);
  result.files = stored.corpus.files.size();
  result.segments = stored.corpus.segments.size();
  if (stored.corpus.segments.size() < 2)
    throw too_little_to_analyse(filter, selection, stored, request, list_settings(db).size() > 1);
  if (blas.valid()) blas.get();
  // The log holds what the batch just stored (up to 64 MiB): copying it into the database
  // waits on the disk (two syncs, 30 and 18 ms after the novels' batch), which the store's
  // closing would otherwise spend after everything else. It is done now, on another
  // thread, while the analysis computes; nothing below uses the store (whose connection
  // has no mutex) until the results are written, and an error waits for it too.
  std::future<void> checkpoint = start_side_task([&db] { db.checkpoint(); });
  Request analysis_request = request;
  analysis_request.compute_distances = true;
  analysis_request.keep_distance_matrix = false;  // the store keeps each segment's nearest only
  // Nothing reads the relative frequencies when the measure (also the attribution's) and
  // the PCA take z-scores: the z-scores are computed in their place.
  analysis_request.feature_space.keep_relative =
      measure_info(request.measure).input != MeasureInput::z_scores ||
      (request.compute_pca && request.pca.input == PcaInput::relative_frequencies);
  Analysis analysis = analyse_corpus_freeing_counts(analysis_request, stored.corpus, options.progress);
  std::vector<std::string> notes;
  std::vector<AttributionRow> attributions;
  if (options.attribute) {
    report_step(options.progress, "candidate authors");
    attributions = attribution_rows(analysis_request, analysis, notes);
  }
  report_step(options.progress, "storing results");
  checkpoint.get();
  result.measured = analysis.table.segment_count();
  result.features = analysis.table.feature_count();
  result.attributions = attributions.size();
  result.notes = analysis.notes;
  result.notes.insert(result.notes.end(), notes.begin(), notes.end());
  add_selection_notes(filter, request.feature_space.min_segment_tokens, selection, stored, analysis, result.files,
                      result.notes);
  result.run_id = write_analysis(db, settings_id, parameters, key, analysis, stored, result.notes,
                                 selection.files_failed, attributions);
  return result;
}

}  // namespace manicule::store
