#include "profile/feature_space.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <string_view>
#include <unordered_set>

#include "core/error.h"
#include "core/parallel_items.h"
#include "profile/large_matrix.h"

namespace manicule {

void validate_feature_space_options(const FeatureSpec& spec, const FeatureSpaceOptions& options) {
  if (options.rank_first < 1 || options.rank_last < options.rank_first) {
    throw Error(ErrorKind::usage, "feature ranks must satisfy 1 <= first <= last, not " +
                                      std::to_string(options.rank_first) + ".." +
                                      std::to_string(options.rank_last));
  }
  if (!(options.culling_percent >= 0.0 && options.culling_percent <= 100.0)) {
    throw Error(ErrorKind::usage, "culling must be a share between 0 and 100 %");
  }
  if (spec.kind == FeatureKind::char_ngram && !options.stop_words.empty()) {
    throw Error(ErrorKind::usage, "a stop list applies to words, not to character n-grams");
  }
}

namespace {

// Indices of the segments to keep; the others go to the report.
std::vector<std::size_t> keep_large_segments(const CountProfile& profile,
                                             const FeatureSpaceOptions& options,
                                             FeatureSelectionReport& report) {
  std::vector<std::size_t> kept;
  for (std::size_t s = 0; s < profile.segments.size(); ++s) {
    const SegmentCounts& segment = profile.segments[s];
    if (segment.tokens < options.min_segment_tokens || segment.tokens == 0) {
      report.excluded_segments.push_back(
          {segment.id, segment.tokens,
           std::to_string(segment.tokens) + " tokens, fewer than the minimum of " +
               std::to_string(std::max<std::size_t>(options.min_segment_tokens, 1))});
    } else if (segment.feature_total == 0) {
      report.excluded_segments.push_back(
          {segment.id, segment.tokens, "too short to hold a feature (" + describe(profile.spec) + ")"});
    } else {
      kept.push_back(s);
    }
  }
  if (kept.empty()) {
    // Lowering the minimum helps only where it is above one word and some segment has a word.
    std::size_t largest = 0;
    for (const SegmentCounts& segment : profile.segments) largest = std::max(largest, segment.tokens);
    throw Error(ErrorKind::nothing_selected,
                largest == 0 ? "no segment holds a word: all " + std::to_string(profile.segments.size()) +
                                   " are empty (choose another unit, or check what the selection leaves out)"
                             : "no segment is large enough: all " + std::to_string(profile.segments.size()) +
                                   " have fewer than " + std::to_string(options.min_segment_tokens) +
                                   " words, the largest " + std::to_string(largest) + " (lower it with --min-tokens)");
  }
  return kept;
}

bool contains_stop_word(std::string_view form, FeatureKind kind,
                        const std::unordered_set<std::string_view>& stop) {
  if (kind == FeatureKind::word) return stop.count(form) > 0;
  while (true) {  // word n-gram: words joined by single spaces
    const std::size_t space = form.find(' ');
    if (stop.count(form.substr(0, space))) return true;
    if (space == std::string_view::npos) return false;
    form.remove_prefix(space + 1);
  }
}

}  // namespace

FeatureTable build_feature_table(const CountProfile& profile, const FeatureSpaceOptions& options,
                                 unsigned threads) {
  validate_feature_space_options(profile.spec, options);
  FeatureTable table;
  table.spec = profile.spec;
  FeatureSelectionReport& report = table.report;
  report.rank_first = options.rank_first;
  report.rank_last = options.rank_last;
  const std::vector<std::size_t> kept = keep_large_segments(profile, options, report);

  const Vocabulary& vocabulary = profile.vocabulary;
  // Each part of the segments is counted into arrays of its own, added up after: integer
  // sums, the same in any order. At most 4 parts: each costs 12 bytes per form of the
  // vocabulary, and adding it up a pass over them.
  constexpr std::size_t kMostParts = 4;
  const std::size_t parts =
      std::min<std::size_t>({resolve_thread_count(threads), (kept.size() + 255) / 256, kMostParts});
  std::vector<std::vector<std::uint64_t>> part_totals(parts);
  std::vector<std::vector<std::uint32_t>> part_segments_with(parts);
  parallel_items(parts, threads, [&](std::size_t part) {
    part_totals[part].assign(vocabulary.size(), 0);
    part_segments_with[part].assign(vocabulary.size(), 0);
    for (std::size_t k = part * kept.size() / parts; k < (part + 1) * kept.size() / parts; ++k) {
      for (const auto& [id, count] : profile.segments[kept[k]].counts) {
        part_totals[part][id] += count;
        ++part_segments_with[part][id];
      }
    }
  });
  std::vector<std::uint64_t> totals = std::move(part_totals[0]);
  std::vector<std::uint32_t> segments_with = std::move(part_segments_with[0]);
  for (std::size_t part = 1; part < parts; ++part) {
    for (std::size_t id = 0; id < totals.size(); ++id) {
      totals[id] += part_totals[part][id];
      segments_with[id] += part_segments_with[part][id];
    }
  }

  const std::unordered_set<std::string_view> stop(options.stop_words.begin(),
                                                  options.stop_words.end());
  const double needed_share = options.culling_percent / 100.0 * static_cast<double>(kept.size());
  std::vector<FeatureId> candidates;
  for (FeatureId id = 0; id < vocabulary.size(); ++id) {
    if (totals[id] == 0) continue;  // occurs only in left-out segments
    if (!stop.empty() && contains_stop_word(vocabulary.form(id), profile.spec.kind, stop)) {
      ++report.stopped;
    } else if (static_cast<double>(segments_with[id]) < needed_share) {
      ++report.culled;
    } else {
      candidates.push_back(id);
    }
  }
  report.candidates = candidates.size();
  if (candidates.size() < options.rank_first) {
    throw Error(ErrorKind::nothing_selected,
                "features from rank " + std::to_string(options.rank_first) + " were asked for, " +
                    "but only " + std::to_string(candidates.size()) + " features are available");
  }
  const std::size_t last = std::min(options.rank_last, candidates.size());
  report.fewer_than_asked = last < options.rank_last;
  auto more_frequent = [&](FeatureId a, FeatureId b) {
    if (totals[a] != totals[b]) return totals[a] > totals[b];
    return vocabulary.form(a) < vocabulary.form(b);  // char_traits compares bytes unsigned
  };
  std::partial_sort(candidates.begin(), candidates.begin() + static_cast<std::ptrdiff_t>(last),
                    candidates.end(), more_frequent);

  std::vector<std::int64_t> column_of(vocabulary.size(), -1);
  for (std::size_t rank = options.rank_first; rank <= last; ++rank) {
    const FeatureId id = candidates[rank - 1];
    column_of[id] = static_cast<std::int64_t>(table.features.size());
    table.features.emplace_back(vocabulary.form(id));
    table.feature_ranks.push_back(rank);
    table.feature_totals.push_back(totals[id]);
  }

  const auto rows = static_cast<Eigen::Index>(kept.size());
  const auto cols = static_cast<Eigen::Index>(table.features.size());
  for (std::size_t s : kept) {
    const SegmentCounts& segment = profile.segments[s];
    table.segment_ids.push_back(segment.id);
    table.segment_tokens.push_back(segment.tokens);
    table.segment_totals.push_back(segment.feature_total);
  }
  // Rows are zeroed and filled by whichever thread takes them: a table of many megabytes is
  // fresh memory, and its first writes (page faults) are much of the cost.
  table.relative = uninitialised_matrix<RowMatrix>(rows, cols);
  constexpr Eigen::Index kRowsATask = 64;
  parallel_items(static_cast<std::size_t>((rows + kRowsATask - 1) / kRowsATask), threads, [&](std::size_t task) {
    const Eigen::Index end = std::min(rows, static_cast<Eigen::Index>(task + 1) * kRowsATask);
    for (Eigen::Index r = static_cast<Eigen::Index>(task) * kRowsATask; r < end; ++r) {
      table.relative.row(r).setZero();
      const SegmentCounts& segment = profile.segments[kept[static_cast<std::size_t>(r)]];
      const double denominator = static_cast<double>(segment.feature_total);
      for (const auto& [id, count] : segment.counts) {
        const std::int64_t c = column_of[id];
        if (c < 0) continue;
        table.relative(r, c) = count / denominator;
      }
    }
  });
  standardise(table, options.keep_relative);
  return table;
}

RowMatrix feature_counts(const FeatureTable& table) {
  RowMatrix counts(table.relative.rows(), table.relative.cols());
  for (Eigen::Index r = 0; r < counts.rows(); ++r) {
    const double total = static_cast<double>(table.segment_totals[static_cast<std::size_t>(r)]);
    for (Eigen::Index c = 0; c < counts.cols(); ++c) counts(r, c) = std::round(table.relative(r, c) * total);
  }
  return counts;
}

}  // namespace manicule
