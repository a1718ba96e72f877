#include "export/segment_groups.h"

#include <algorithm>
#include <map>
#include <set>

#include "core/letter_names.h"
#include "core/segment_id_prefixes.h"

namespace manicule {

namespace {

const char* const kPalette[] = {"#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000"};
constexpr std::size_t kPaletteSize = sizeof kPalette / sizeof kPalette[0];
const char* const kUnknownColour = "#8C8C8C";

// A segment whose author the edition only conjectures is coloured as that author's, so
// its label says so: a plot must not show a conjecture as a fact.
std::string with_conjecture(const SegmentSummary& s, std::string label, const std::string& tell) {
  const bool conjectured = s.authorship == Authorship::conjectured;
  if (tell.empty()) return conjectured ? label + " (author conjectured)" : label;
  return label + " (" + tell + (conjectured ? ", conjectured)" : ")");
}

std::vector<std::string> distinct_labels(const Analysis& analysis, const std::vector<std::size_t>& plotted) {
  std::vector<std::string> labels;
  std::map<std::string, std::vector<std::size_t>> by_label;  // label without conjecture -> positions
  for (std::size_t p = 0; p < plotted.size(); ++p) {
    const SegmentSummary& s = analysis.segments[plotted[p]];
    labels.push_back(s.unit == "letter" ? letter_name(s) : s.label.empty() ? s.local_id : s.label);
    by_label[labels.back()].push_back(p);
  }
  std::vector<std::string> shown(labels.size());
  for (const auto& [label, positions] : by_label) {
    // What tells the segments of one label apart: their local ids, else their files, else
    // both (two "CHAPTER IV." of one novel's two volumes, and another novel's too).
    std::set<std::string> local_ids, stems;
    for (std::size_t p : positions) {
      local_ids.insert(analysis.segments[plotted[p]].local_id);
      stems.insert(file_stem(analysis.segments[plotted[p]].file));
    }
    const bool ids_differ = local_ids.size() == positions.size();
    const bool files_differ = stems.size() == positions.size();
    for (std::size_t p : positions) {
      const SegmentSummary& s = analysis.segments[plotted[p]];
      if (s.unit == "letter") {  // core/letter_names.h; the whole id where local ids repeat
        shown[p] = letter_name(s, positions.size() < 2 ? s.local_id : s.id);
        continue;
      }
      std::string tell;
      if (positions.size() >= 2)
        tell = ids_differ && s.local_id != label ? s.local_id : files_differ ? file_stem(s.file) : s.id;
      shown[p] = with_conjecture(s, label, tell == label ? std::string() : tell);
    }
  }
  return shown;
}

// The name people know an author by: the label most of the author's segments carry.
std::string author_name(const Analysis& analysis, const std::vector<std::size_t>& plotted, const std::string& key) {
  // Only a letter's label (its sender) or a speaker's (its name) names the author; a
  // chapter's is its heading and a whole text's its title, which would make the legend
  // read "CHAPTER I." for a novelist.
  std::map<std::string, std::size_t> votes;
  for (std::size_t index : plotted) {
    const SegmentSummary& s = analysis.segments[index];
    const bool label_names_author = s.unit == "letter" || s.unit == "speaker";
    if (s.author == key && label_names_author && !s.label.empty() && s.label != s.local_id) ++votes[s.label];
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
