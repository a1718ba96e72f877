#include "measure/newick.h"

#include <algorithm>
#include <charconv>
#include <vector>

namespace manicule {

std::string newick_label(std::string_view label) {
  const bool plain = !label.empty() && label.find_first_of(" \t\r\n()[]':;,_") == std::string_view::npos;
  if (plain) return std::string(label);
  std::string quoted = "'";
  for (char c : label) {
    if (c == '\'') quoted += '\'';
    quoted += c;
  }
  quoted += '\'';
  return quoted;
}

std::string newick_number(double value) {
  char buffer[32];
  const auto [end, error] = std::to_chars(buffer, buffer + sizeof buffer, value);
  return std::string(buffer, error == std::errc{} ? end : buffer);
}

namespace {

void write_node(const Dendrogram& tree, std::size_t node, std::string& out) {
  const std::size_t n = tree.labels.size();
  if (node < n) {
    out += newick_label(tree.labels[node]);
    return;
  }
  const Merge& merge = tree.merges[node - n];
  out += '(';
  bool first = true;
  for (std::size_t child : {merge.a, merge.b}) {
    if (!first) out += ',';
    first = false;
    write_node(tree, child, out);
    const double child_height = child < n ? 0.0 : tree.merges[child - n].height;
    out += ':';
    out += newick_number(std::max(0.0, merge.height - child_height));
  }
  out += ')';
}

}  // namespace

std::string to_newick(const Dendrogram& tree) {
  std::string out;
  if (tree.labels.size() == 1) {
    out = newick_label(tree.labels[0]);
  } else if (!tree.labels.empty()) {
    write_node(tree, 2 * tree.labels.size() - 2, out);
  }
  return out + ";";
}

}  // namespace manicule
