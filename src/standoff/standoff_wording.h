// The sentences our standoff says to people: the notes of annotations and the settings
// in the application's desc. Plain English; numbers rounded for reading (the fs hold
// the exact values).
#pragma once
#include <cstddef>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "core/analysis.h"

namespace manicule {

std::string authorship_word(Authorship a);  // known | conjectured | unknown

// The names the edition gives the candidates that are pointers ("#p-pellow" -> "Ambrose
// Pellow"), from the labels of the segments with that author.
using CandidateNames = std::map<std::string, std::string>;
CandidateNames candidate_names(const Analysis& analysis);
// "Ambrose Pellow (#p-pellow)", or the candidate as it is where no name is known.
std::string candidate_word(const CandidateNames& names, const std::string& candidate);

// "Style profile of Dietrich (speaker): 4812 words, 1203 different. Nearest in style by
// cosine-delta: Erich 0.831, ..." or why the segment was not measured.
std::string profile_note(const Analysis& analysis, const SegmentSummary& segment, const std::string& label,
                         const std::vector<std::pair<std::string, double>>& nearest);

// What the distance links hold and how to read them.
std::string distances_note(const Analysis& analysis, bool all_pairs, std::size_t pairs);

// The components and how much of the variance each explains.
std::string pca_note(const Analysis& analysis);

// "Candidates for the letter Kit Dunnock (L12, conjectured), 301 words, nearest first by
// cosine-delta (weighted centroid): Kit Dunnock (#p-dunnock) 0.866, Ambrose Pellow
// (#p-pellow) 1.223, ... Margin ...; Kit Dunnock first in 100% of 100 random subsets ..."
// plus the size warnings.
std::string attribution_note(const Analysis& analysis, const AttributionResult& result, const std::string& label,
                             const CandidateNames& names);

// "General Impostors verification ... of the letter Unknown (L10) against Cornelius
// Abthorpe (#p-abthorpe): score 1.00 ...; same author ..." plus the warnings.
std::string verification_note(const Analysis& analysis, const VerificationResult& result, const std::string& label,
                              const CandidateNames& names);

// The measure's user name from the run's parameters ("cosine-delta"), with or without
// a distance matrix.
std::string run_measure_word(const Analysis& analysis);

// Everything a reader needs to repeat the run: unit, selection, tokenizer, features,
// measure, pairs written, and the editions (with SHA-256) the results point into.
std::string settings_description(const Analysis& analysis, bool all_pairs, const std::vector<std::string>& inputs);

// The measure's user name, e.g. "cosine-delta", and the name of its input scaling.
std::string measure_word(const Analysis& analysis);
std::string scaling_word(const Analysis& analysis);

}  // namespace manicule
