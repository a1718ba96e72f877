// Placing point labels on a scatter plot so that they neither overlap each other nor hide
// the points, nor sit nearer to another point than to their own. Greedy, then refined:
// the most crowded points choose first; each label tries positions around its point
// (right, left, above, below, the diagonals) at growing distances and takes the cheapest,
// where overlap with labels and points, leaving the bounds, crossing a leader line and
// being nearer to another point all cost; then each label moves again knowing all the
// others (a few passes). A label moved away from its point gets a leader line.
#pragma once
#include <vector>

namespace manicule {

struct Box {
  double left = 0, top = 0, right = 0, bottom = 0;
  double width() const { return right - left; }
  double height() const { return bottom - top; }
};

struct LabelRequest {
  double x = 0, y = 0;        // the point, px
  double width = 0;           // the label's estimated size, px
  double height = 0;
};

enum class TextAnchor { start, middle, end };

struct PlacedLabel {
  // Where the text is anchored: the box's side or middle nearest the point, so that an
  // error in the width estimate never moves the text away from its point.
  double x = 0, baseline = 0;
  TextAnchor anchor = TextAnchor::start;
  Box box;
  bool leader = false;         // far from its point: draw a line to it
  double overlap = 0;          // px^2 of overlap left (0 when it found a free spot)
};

// `point_radius`: the space each point itself needs. Labels stay within `bounds` where
// they can.
std::vector<PlacedLabel> place_labels(const std::vector<LabelRequest>& labels, const Box& bounds,
                                      double point_radius);

}  // namespace manicule
