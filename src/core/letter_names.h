// How a letter is named to a reader, in plots and in the notes written into an edition
// alike. Its label is its sender, who may have written other letters or none (or be a
// placeholder such as "Unknown"): the letter's id always goes with the name, so that the
// letter can be found, and a sender the edition only conjectures (TEI P5 @cert below high,
// att.global.responsibility) is marked so, never shown as known.
#pragma once
#include <string>

#include "core/analysis.h"

namespace manicule {

// "Ambrose Pellow (L01)", "Kit Dunnock (L12, conjectured)", "L07" (no sender named), with
// `id` in place of the local id where that does not tell letters apart (a whole segment id).
std::string letter_name(const SegmentSummary& letter, const std::string& id);
inline std::string letter_name(const SegmentSummary& letter) { return letter_name(letter, letter.local_id); }

}  // namespace manicule
