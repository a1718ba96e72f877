// Newick trees (the PHYLIP format: Felsenstein's conventions as written down by Olsen,
// "Newick's 8:45" rules).
//  - A label that is empty or holds a blank, tab, newline or one of ( ) [ ] ' : ; , _ is
//    written in single quotes, with each ' inside doubled; others are written as they are
//    (an unquoted _ would be read as a blank, so it is quoted).
//  - Branch lengths are written in the shortest form that reads back to the same double.
//  - A dendrogram's branch length is parent height minus child height (leaves at 0); the
//    root has none. The tree ends with ';'.
#pragma once
#include <string>
#include <string_view>

#include "measure/linkage.h"

namespace manicule {

std::string newick_label(std::string_view label);
std::string newick_number(double value);
std::string to_newick(const Dendrogram& tree);

}  // namespace manicule
