// The facade: the one entry point both faces (cli/, plugin_api/) call. It takes a Request
// and returns an Analysis; neither face computes anything itself.
#pragma once
#include "core/analysis.h"
#include "core/analysis_progress.h"
#include "core/corpus.h"
#include "core/request.h"

namespace manicule {

// Reads the request's files, selects, counts, builds the feature table and computes what
// the request asks for. Throws Error(bad_input) for the first file that fails (naming it),
// Error(nothing_selected) if no segment has text, Error(usage) for bad options.
Analysis analyse(const Request& request, const ProgressFn& progress = {});

// Throws Error(usage) for analysis options no corpus could satisfy (feature ranks out of
// order, say), so that a command can refuse them before reading any file.
void check_analysis_options(const Request& request);

// The same from counts already read (e.g. from the archive store): `corpus` supplies the
// segments and their counts in one order. `progress` (unlike analyse's ProgressFn, which
// counts files read) hears of the analysis' steps as they start: the feature table, the
// nearest-segment search with its share done (when only each segment's nearest are kept)
// and the principal components.
Analysis analyse_corpus(const Request& request, const Corpus& corpus, const AnalysisProgress& progress = {});

// analyse_corpus for a caller that needs the corpus' counts no more: they are released
// (CountProfile::release_counts) once the feature table is built, unless the clustering
// asked for needs them, so that the search for nearest segments does not carry them. The
// rest of `corpus` is left as it was.
Analysis analyse_corpus_freeing_counts(const Request& request, Corpus& corpus, const AnalysisProgress& progress = {});

// Segment summaries of a corpus, without measures (what `segments` lists).
std::vector<SegmentSummary> summarise_segments(const Corpus& corpus);

// Throws the error of the first failed file, if any, naming a few of the others.
void throw_first_failure(const Corpus& corpus);

// Records the feature settings of a run in its provenance: ranks asked, features used,
// culling, minimum segment size, segments measured.
void record_feature_parameters(const Request& request, std::size_t features_used, std::size_t segments_measured,
                               Provenance& provenance);

}  // namespace manicule
