#include "core/facade.h"

#include <algorithm>
#include <set>
#include <sstream>

#include "core/error.h"
#include "core/segment_index.h"
#include "measure/nearest_rows.h"
#include "measure/pairwise_distances.h"
#include "profile/stop_list.h"
#include "tei/xpath_name_hint.h"

namespace manicule {

std::vector<SegmentSummary> summarise_segments(const Corpus& corpus) {
  std::vector<SegmentSummary> out;
  out.reserve(corpus.segments.size());
  for (const auto& r : corpus.segments) {
    const Segment& s = r.segment;
    SegmentSummary sum;
    sum.id = s.id;
    sum.file = s.file;
    sum.work = s.own_text ? s.file + "#text" + std::to_string(s.own_text->number) : s.file;
    sum.local_id = s.local_id;
    sum.unit = s.unit;
    sum.label = s.label;
    sum.language = s.language;
    sum.pointers = s.pointers;
    sum.author = s.author;
    sum.authorship = s.authorship;
    sum.tokens = r.tokens;
    sum.types = r.types;
    sum.warnings = s.warnings;
    out.push_back(std::move(sum));
  }
  return out;
}

void throw_first_failure(const Corpus& corpus) {
  if (corpus.failures.empty()) return;
  const FileFailure& f = corpus.failures.front();
  // The others named too (a few), so that a run over a folder is not mended one file a try.
  std::string others;
  const std::size_t more = corpus.failures.size() - 1;
  for (std::size_t i = 1; i < corpus.failures.size() && i <= 3; ++i)
    others += (i > 1 ? ", " : "") + corpus.failures[i].file;
  if (more > 3) others += " and " + std::to_string(more - 3) + " more";
  throw Error(static_cast<ErrorKind>(f.kind),
              more == 0 ? f.message
                        : f.message + "\n  and " + std::to_string(more) + " other file(s) cannot be read either: " +
                              others + " (`manicule segments` with the same inputs says what is wrong in each)");
}

namespace {

// Row numbers of the measured table -> segments.
std::vector<std::vector<Neighbour>> as_neighbours(const std::vector<std::vector<NearRow>>& nearest,
                                                  const std::vector<std::size_t>& rows) {
  std::vector<std::vector<Neighbour>> out(nearest.size());
  for (std::size_t i = 0; i < nearest.size(); ++i)
    for (const NearRow& r : nearest[i]) out[i].push_back(Neighbour{rows[r.row], r.distance});
  return out;
}

}  // namespace

void record_feature_parameters(const Request& request, std::size_t features_used, std::size_t segments_measured,
                               Provenance& provenance) {
  const FeatureSpaceOptions& f = request.feature_space;
  auto& params = provenance.parameters;
  const auto& ranges = request.clustering.consensus_ranges;
  if (ranges.empty()) {
    params.emplace_back("feature ranks", std::to_string(f.rank_first) + "-" + std::to_string(f.rank_last));
    params.emplace_back("features used", std::to_string(features_used));
  } else {
    // A consensus: its table spans the ranges, but each tree takes one range; the ranges are
    // said as they are, and the features used are those some range takes (disjoint ranges
    // leave gaps that "1-400" would hide).
    std::string listed;
    std::set<std::size_t> used;
    const std::size_t beyond = f.rank_first + features_used;  // the first rank the table lacks
    for (const auto& [first, last] : ranges) {
      listed += (listed.empty() ? "" : ", ") + std::to_string(first) + "-" + std::to_string(last);
      for (std::size_t r = first; r <= last && r < beyond; ++r) used.insert(r);
    }
    params.emplace_back("feature ranks", listed + " (a tree each)");
    params.emplace_back("features used", std::to_string(used.size()));
  }
  std::ostringstream culling;  // "0%", "12.5%" rather than to_string's "0.000000%"
  culling << f.culling_percent << "%";
  params.emplace_back("culling", culling.str());
  if (!f.stop_words_source.empty()) params.emplace_back("stop words", f.stop_words_source);
  params.emplace_back("minimum segment size", std::to_string(f.min_segment_tokens) + " words");
  params.emplace_back("segments measured", std::to_string(segments_measured));
}

namespace {

// `counts_to_free`: the corpus' own counts, given back once the table is built; null
// keeps them.
Analysis analyse_counts(const Request& request, const Corpus& corpus, const AnalysisProgress& progress,
                      CountProfile* counts_to_free) {
  Analysis analysis;
  analysis.provenance = make_provenance(request, corpus);
  analysis.segments = summarise_segments(corpus);
  if (analysis.segments.empty())
    throw Error(ErrorKind::nothing_selected,
                "no " + request.unit + " segment found in the input files" + unprefixed_name_hint(request.unit));

  report_step(progress, "feature table");
  FeatureSpaceOptions space = request.feature_space;
  space.stop_words = normalised_stop_words(space.stop_words, request.tokenizer);  // as the tokens were
  FeatureTable table = build_feature_table(corpus.counts, space, request.threads);
  if (counts_to_free && !request.clustering.compute) counts_to_free->release_counts();
  std::vector<std::size_t> rows;
  {
    const SegmentIndex segment_index(analysis.segments);  // views into the ids, left as they are
    for (const auto& excluded : table.report.excluded_segments) {
      const std::size_t i = segment_index.find(excluded.id);
      if (i != SegmentIndex::npos) analysis.segments[i].excluded_reason = excluded.reason;
    }
    for (const auto& id : table.segment_ids) {
      const std::size_t i = segment_index.find(id);
      if (i == SegmentIndex::npos) throw Error(ErrorKind::internal, "table row " + id + " is not a segment");
      analysis.segments[i].measured = true;
      rows.push_back(i);
    }
  }
  analysis.table_rows = rows;
  if (!table.report.excluded_segments.empty()) {
    // A segment without a word is left out under any minimum, 0 among them; one long enough
    // but too short for a single n-gram (a word alone, for word pairs) is left out too, for
    // that reason (feature_space.cpp).
    const std::size_t minimum = std::max<std::size_t>(request.feature_space.min_segment_tokens, 1);
    std::size_t short_ones = 0;
    const ExcludedSegment* featureless = nullptr;
    for (const auto& excluded : table.report.excluded_segments)
      if (excluded.tokens < minimum) ++short_ones;
      else featureless = &excluded;
    if (short_ones)
      analysis.notes.push_back(std::to_string(short_ones) + " segment(s) left out, shorter than the minimum of " +
                               (minimum == 1 ? std::string("1 word: they hold none")
                                             : std::to_string(minimum) + " words"));
    if (featureless)
      analysis.notes.push_back(std::to_string(table.report.excluded_segments.size() - short_ones) +
                               " segment(s) left out, " + featureless->reason);
  }
  record_feature_parameters(request, table.feature_count(), table.segment_count(), analysis.provenance);
  auto& params = analysis.provenance.parameters;

  if (table.report.fewer_than_asked) {
    // Worded for the default ranks as well as for --ranks: a user who gave none asked for nothing.
    analysis.notes.push_back("ranks " + std::to_string(request.feature_space.rank_first) + "-" +
                             std::to_string(request.feature_space.rank_last) + " reach past the " +
                             std::to_string(table.report.candidates) + " features found: " +
                             std::to_string(table.feature_count()) + " used");
  }
  if (table.report.zero_variance > 0) {
    analysis.notes.push_back(std::to_string(table.report.zero_variance) +
                             " feature(s) have the same relative frequency in every segment: their z-scores are 0");
  }
  const bool compares = request.compute_distances || request.compute_pca || request.clustering.compute;
  if (compares && table.segment_count() < 2) {
    // Lowering --min-tokens helps only where segments were left out for their size.
    const std::size_t short_ones = table.report.excluded_segments.size();
    throw Error(ErrorKind::nothing_selected,
                short_ones == 0
                    ? "comparing needs at least two segments; the selection found " +
                          std::to_string(table.segment_count()) + " (choose a unit with more, or add files)"
                    : "comparing needs at least two segments of at least " +
                          std::to_string(request.feature_space.min_segment_tokens) + " words; " +
                          std::to_string(table.segment_count()) + " found, " + std::to_string(short_ones) +
                          " shorter (lower it with --min-tokens)");
  }
  if (request.compute_distances) {
    DistanceOptions options;
    options.threads = request.threads;
    DistanceResult result;
    result.measure = request.measure;
    result.rows = rows;
    if (request.keep_distance_matrix || request.clustering.compute) {
      result.values = std::move(distance_matrix(table, request.measure, options).values);
      result.nearest = as_neighbours(nearest_in_matrix(result.values, request.neighbours, request.threads), rows);
    } else {
      NearestOptions nearest;
      nearest.distance = options;
      // The all-pairs search is the step that grows with the square of the segments.
      if (progress) nearest.progress = [&](double share_done) { progress("nearest segments", share_done); };
      report_step(progress, "nearest segments", 0.0);
      result.nearest = as_neighbours(
          nearest_rows(measure_rows(table, request.measure), request.measure, request.neighbours, nearest), rows);
    }
    analysis.distances = std::move(result);
    const MeasureInfo& info = measure_info(request.measure);
    params.emplace_back("measure", std::string(info.name) + " (" + std::string(info.citation) + ")");
  }
  if (request.clustering.compute) {
    analysis.clustering = cluster_segments(request, corpus.counts, analysis);
    params.emplace_back("clustering", describe_clustering(*analysis.clustering));
  }
  if (request.compute_pca) {
    report_step(progress, "principal components");
    analysis.pca = principal_components(table, request.pca);
    // n segments centred span at most n - 1 directions (and no more than the features).
    if (const auto found = static_cast<std::size_t>(analysis.pca->explained_variance.size());
        found < request.pca.components)
      analysis.notes.push_back(std::to_string(request.pca.components) + " components asked, " + std::to_string(found) +
                               " computed: " + std::to_string(table.segment_count()) + " segments and " +
                               std::to_string(table.feature_count()) + " features give no more");
    params.emplace_back("pca input", request.pca.input == PcaInput::z_scores ? "z-scores" : "relative frequencies");
  }
  analysis.table = std::move(table);
  return analysis;
}

}  // namespace

Analysis analyse_corpus(const Request& request, const Corpus& corpus, const AnalysisProgress& progress) {
  return analyse_counts(request, corpus, progress, nullptr);
}

Analysis analyse_corpus_freeing_counts(const Request& request, Corpus& corpus, const AnalysisProgress& progress) {
  return analyse_counts(request, corpus, progress, &corpus.counts);
}

void check_analysis_options(const Request& request) {
  validate_feature_space_options(request.features, request.feature_space);
}

Analysis analyse(const Request& request, const ProgressFn& progress) {
  check_analysis_options(request);  // before the files are read, not after
  std::vector<std::string> files = expand_inputs(request.inputs);
  Corpus corpus = read_corpus(request, files, progress);
  throw_first_failure(corpus);
  return analyse_corpus(request, corpus);
}

}  // namespace manicule
