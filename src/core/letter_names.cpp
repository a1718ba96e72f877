#include "core/letter_names.h"

namespace manicule {

std::string letter_name(const SegmentSummary& letter, const std::string& id) {
  const bool conjectured = letter.authorship == Authorship::conjectured;
  if (letter.label.empty() || letter.label == letter.local_id) return id + (conjectured ? " (sender conjectured)" : "");
  return letter.label + " (" + id + (conjectured ? ", conjectured)" : ")");
}

}  // namespace manicule
