#include "export/label_placement.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <numeric>

namespace manicule {

namespace {

double overlap_area(const Box& a, const Box& b) {
  const double w = std::min(a.right, b.right) - std::max(a.left, b.left);
  const double h = std::min(a.bottom, b.bottom) - std::max(a.top, b.top);
  return w > 0 && h > 0 ? w * h : 0;
}

double outside_area(const Box& box, const Box& bounds) {
  return box.width() * box.height() - overlap_area(box, bounds);
}

double distance_to_box(double x, double y, const Box& box) {
  const double dx = std::max({box.left - x, 0.0, x - box.right});
  const double dy = std::max({box.top - y, 0.0, y - box.bottom});
  return std::hypot(dx, dy);
}

// Does the segment from (x1, y1) to (x2, y2) pass through `box`? (Liang-Barsky clipping.)
bool segment_crosses(double x1, double y1, double x2, double y2, const Box& box) {
  double t0 = 0, t1 = 1;
  const double dx = x2 - x1, dy = y2 - y1;
  const double p[4] = {-dx, dx, -dy, dy};
  const double q[4] = {x1 - box.left, box.right - x1, y1 - box.top, box.bottom - y1};
  for (int k = 0; k < 4; ++k) {
    if (p[k] == 0) {
      if (q[k] < 0) return false;
      continue;
    }
    const double t = q[k] / p[k];
    if (p[k] < 0) t0 = std::max(t0, t);
    else t1 = std::min(t1, t);
    if (t0 > t1) return false;
  }
  return true;
}

// The label box whose nearest edge is `reach` px from (x, y) in direction (dx, dy).
Box candidate_box(const LabelRequest& label, int dx, int dy, double reach) {
  const double cx = label.x + dx * (reach + label.width / 2);
  const double cy = label.y + dy * (reach + label.height / 2);
  return {cx - label.width / 2, cy - label.height / 2, cx + label.width / 2, cy + label.height / 2};
}

// Positions in order of preference: beside, then above/below, then the corners.
constexpr int kDirections[8][2] = {{1, 0}, {-1, 0}, {0, -1}, {0, 1}, {1, -1}, {1, 1}, {-1, -1}, {-1, 1}};
constexpr double kGaps[] = {2, 8, 16, 26, 38, 52, 70, 92};
constexpr double kLeaderBeyond = 12;  // gaps above this get a leader line
constexpr double kClearance = 5;      // another point must be this much further from a label than its own
constexpr double kCrowdedWithin = 24;  // px between two points below which each label gets a leader line

}  // namespace

namespace {

struct Placement {
  PlacedLabel label;
  std::array<double, 4> leader_line{};  // point to the nearest spot of the box
  bool done = false;
};

// The best place for label i, given the labels already placed (all but i).
Placement best_place(std::size_t i, const std::vector<LabelRequest>& labels, const std::vector<Box>& points,
                     const std::vector<Placement>& placed, const Box& bounds, double point_radius) {
  const LabelRequest& label = labels[i];
  const std::size_t n = labels.size();
  // A point with another close by gets a leader line wherever its label goes: beside two
  // close points of one colour a label reads as either's.
  bool crowded = false;
  for (std::size_t p = 0; p < n && !crowded; ++p)
    crowded = p != i && std::hypot(labels[p].x - label.x, labels[p].y - label.y) < kCrowdedWithin;
  Placement best;
  double best_cost = INFINITY;
  for (double gap : kGaps) {
    for (const auto& d : kDirections) {
      const double reach = point_radius + (d[0] != 0 && d[1] != 0 ? gap * 0.7 : gap);
      const Box box = candidate_box(label, d[0], d[1], reach);
      const double own = distance_to_box(label.x, label.y, box);
      const bool leader = crowded || gap > kLeaderBeyond;
      const std::array<double, 4> line{label.x, label.y, std::clamp(label.x, box.left, box.right),
                                       std::clamp(label.y, box.top, box.bottom)};
      double cost = 50 * outside_area(box, bounds);
      for (std::size_t p = 0; p < n; ++p) {
        cost += 2 * overlap_area(box, points[p]);
        if (p == i) continue;
        // A label nearer to another point than to its own would be read as that one's.
        const double other = distance_to_box(labels[p].x, labels[p].y, box);
        if (other < own + kClearance) cost += 60 * (own + kClearance - other);
        if (leader && segment_crosses(line[0], line[1], line[2], line[3], points[p])) cost += 300;
      }
      for (std::size_t j = 0; j < n; ++j) {
        if (j == i || !placed[j].done) continue;
        const Placement& o = placed[j];
        cost += overlap_area(box, o.label.box);
        if (leader && segment_crosses(line[0], line[1], line[2], line[3], o.label.box)) cost += 300;
        const auto& l = o.leader_line;  // never write over another leader line
        if (o.label.leader && segment_crosses(l[0], l[1], l[2], l[3], box)) cost += 300;
      }
      if (cost + gap * 0.5 < best_cost) {  // among equal costs, the nearer place
        best_cost = cost + gap * 0.5;
        best.label.box = box;
        best.label.anchor = d[0] > 0 ? TextAnchor::start : d[0] < 0 ? TextAnchor::end : TextAnchor::middle;
        best.label.x = d[0] > 0 ? box.left : d[0] < 0 ? box.right : (box.left + box.right) / 2;
        best.label.baseline = box.bottom - label.height * 0.25;
        best.label.leader = leader;
        best.label.overlap = cost;
        best.leader_line = line;
        best.done = true;
      }
    }
    if (best.label.overlap < 1) break;  // a free spot at this distance: nothing further is better
  }
  return best;
}

constexpr int kRefinements = 3;  // passes that move each label again, knowing all the others

}  // namespace

std::vector<PlacedLabel> place_labels(const std::vector<LabelRequest>& labels, const Box& bounds,
                                      double point_radius) {
  const std::size_t n = labels.size();
  std::vector<Box> points(n);
  for (std::size_t i = 0; i < n; ++i)
    points[i] = {labels[i].x - point_radius, labels[i].y - point_radius, labels[i].x + point_radius,
                 labels[i].y + point_radius};
  // Crowded points first: they have the fewest free spots.
  std::vector<std::size_t> crowding(n, 0);
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = 0; j < n; ++j)
      if (i != j && std::abs(labels[i].x - labels[j].x) < labels[i].width + 10 &&
          std::abs(labels[i].y - labels[j].y) < 3 * labels[i].height)
        ++crowding[i];
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return crowding[a] > crowding[b]; });

  std::vector<Placement> placed(n);
  for (std::size_t i : order) placed[i] = best_place(i, labels, points, placed, bounds, point_radius);
  for (int pass = 0; pass < kRefinements; ++pass) {
    bool moved = false;
    for (std::size_t i : order) {
      if (placed[i].label.overlap < 1) continue;
      // The current place is among the candidates, so the best one is never worse.
      Placement again = best_place(i, labels, points, placed, bounds, point_radius);
      moved = moved || again.label.box.left != placed[i].label.box.left || again.label.box.top != placed[i].label.box.top;
      placed[i] = again;
    }
    if (!moved) break;
  }
  std::vector<PlacedLabel> out;
  for (const auto& p : placed) out.push_back(p.label);
  return out;
}

}  // namespace manicule
