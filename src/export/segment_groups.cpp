#include "export/segment_groups.h"

#include <algorithm>
#include <map>
#include <set>

#include "core/segment_id_prefixes.h"

namespace manicule {

namespace {

const char* const kPalette[] = {"#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000"};
constexpr std::size_t kPaletteSize = sizeof kPalette / sizeof kPalette[0];
const char* const kUnknownColour = "#8C8C8C";

std::vector<std::string> distinct_labels(const Analysis& analysis, const std::vector<std::size_t>& plotted) {
  std::vector<std::string> labels;
  std::map<std::string, std::vector<std::size_t>> by_label;  // label -> positions in plotted
  for (std::size_t p = 0; p < plotted.size(); ++p) {
    const SegmentSummary& s = analysis.segments[plotted[p]];
    labels.push_back(s.label.empty() ? s.local_id : s.label);
    by_label[labels.back()].push_back(p);
  }
  for (const auto& [label, positions] : by_label) {
    if (positions.size() < 2) continue;
    std::set<std::string> local_ids;
    for (std::size_t p : positions) local_ids.insert(analysis.segments[plotted[p]].local_id);
    const bool ids_differ = local_ids.size() == positions.size();
    for (std::size_t p : positions) {
      const SegmentSummary& s = analysis.segments[plotted[p]];
      const std::string& tell = ids_differ && s.local_id != label ? s.local_id : file_stem(s.file);
      if (tell != label) labels[p] = label + " (" + tell + ")";
    }
  }
  return labels;
}

// The name people know an author by: the label most of the author's segments carry.
std::string author_name(const Analysis& analysis, const std::vector<std::size_t>& plotted, const std::string& key) {
  std::map<std::string, std::size_t> votes;
  for (std::size_t index : plotted) {
    const SegmentSummary& s = analysis.segments[index];
    if (s.author == key && !s.label.empty()) ++votes[s.label];
  }
  std::string best;
  std::size_t most = 0;
  for (const auto& [label, count] : votes)
    if (count > most) best = label, most = count;
  if (!best.empty()) return best;
  return !key.empty() && key.front() == '#' ? key.substr(1) : key;
}

}  // namespace

SegmentGrouping group_segments(const Analysis& analysis, const std::vector<std::size_t>& plotted) {
  SegmentGrouping result;
  result.labels = distinct_labels(analysis, plotted);
  std::map<std::string, std::size_t> author_counts;
  std::set<std::string> files;
  for (std::size_t index : plotted) {
    const SegmentSummary& s = analysis.segments[index];
    if (!s.author.empty()) ++author_counts[s.author];
    files.insert(s.file);
  }
  const bool shared_author = std::any_of(author_counts.begin(), author_counts.end(),
                                         [](const auto& entry) { return entry.second >= 2; });
  std::vector<std::string> keys;  // per plotted segment
  for (std::size_t index : plotted) {
    const SegmentSummary& s = analysis.segments[index];
    keys.push_back(shared_author ? s.author : files.size() > 1 ? s.file : std::string());
  }
  result.legend_title = shared_author ? (analysis.segments[plotted.front()].unit == "speaker" ? "speaker" : "author")
                        : files.size() > 1 ? "edition"
                                           : "";
  // Groups in order of first appearance; the unknown author last.
  std::map<std::string, std::size_t> group_index;
  bool has_unknown = false;
  for (const auto& key : keys) {
    if (shared_author && key.empty()) {
      has_unknown = true;
      continue;
    }
    if (group_index.count(key)) continue;
    const std::size_t g = result.groups.size();
    group_index[key] = g;
    GroupStyle style;
    style.name = shared_author ? author_name(analysis, plotted, key) : files.size() > 1 ? file_stem(key) : "";
    style.colour = kPalette[g % kPaletteSize];
    style.shape = static_cast<MarkerShape>((g / kPaletteSize) % 4);
    result.groups.push_back(style);
  }
  if (has_unknown) {
    group_index[""] = result.groups.size();
    result.groups.push_back({"unknown", kUnknownColour, MarkerShape::circle});
  }
  for (const auto& key : keys) result.group_of.push_back(group_index.at(key));
  return result;
}

}  // namespace manicule
