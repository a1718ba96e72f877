// How the plots name and colour segments.
//  - Label: the segment's label (speaker's name, chapter's heading, title), else its local
//    id. Labels that would appear twice get what tells them apart: "(L04)" when their
//    local ids differ, else the edition's file stem, else the whole segment id. A letter is its sender's name with
//    the letter's id, always ("Ann Lee (L10)"): the sender is not the letter. A segment
//    whose author the edition conjectures says so ("Ann Lee (L12, conjectured)").
//  - Group (the colour): the author, when at least two of the plotted segments share one
//    (segments without an author form the group "unknown"); otherwise the edition, when
//    they come from more than one file; otherwise one group and no legend.
//  - Colours: the colour-blind-safe palette of Okabe & Ito (2008, "Color Universal
//    Design"), without its yellow; after seven groups the marker shape changes.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "core/analysis.h"

namespace manicule {

enum class MarkerShape { circle, square, triangle, diamond };

struct GroupStyle {
  std::string name;
  std::string colour;  // #rrggbb
  MarkerShape shape = MarkerShape::circle;
};

struct SegmentGrouping {
  std::string legend_title;           // "author", "edition"; "" when there is one group
  std::vector<GroupStyle> groups;     // legend order
  std::vector<std::string> labels;    // per plotted segment
  std::vector<std::size_t> group_of;  // per plotted segment, index into groups
};

// `plotted`: indices into analysis.segments, in plot order.
SegmentGrouping group_segments(const Analysis& analysis, const std::vector<std::size_t>& plotted);

}  // namespace manicule
