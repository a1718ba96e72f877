#include "standoff/standoff_wording.h"

#include <algorithm>
#include <cstdio>
#include <map>

#include "attribution/size_warnings.h"
#include "profile/feature_spec.h"

namespace manicule {

namespace {

std::string rounded(double v, const char* format = "%.3f") {
  char buf[64];
  std::snprintf(buf, sizeof buf, format, v);
  return buf;
}

std::string k_nearest(const Analysis& analysis) {
  std::size_t k = 0;
  if (analysis.distances)
    for (const auto& n : analysis.distances->nearest) k = std::max(k, n.size());
  return std::to_string(k);
}

// A result's warnings quote a candidate by its label (attribution/size_warnings.h:
// "candidate '#p-pellow' has little text"); the note names it as the rest of the note does.
// The fs keeps the warnings as they were computed.
std::string warning_naming(std::string warning, const CandidateNames& names, const std::string& candidate) {
  const std::string quoted = quoted_candidate(candidate);
  const std::string named = candidate_word(names, candidate);
  if (named == candidate) return warning;
  for (std::size_t at = warning.find(quoted); at != std::string::npos; at = warning.find(quoted, at + 1))
    warning.replace(at, quoted.size(), "candidate " + named);
  return warning;
}

std::string warnings_sentences(std::vector<std::string> warnings, const CandidateNames& names,
                               const std::vector<std::string>& candidates) {
  std::string out;
  for (auto& w : warnings) {
    for (const auto& c : candidates) w = warning_naming(w, names, c);
    out += " Warning: " + w + (w.empty() || w.back() == '.' ? "" : ".");
  }
  return out;
}

}  // namespace

// Only pointers get a name: any other candidate label (an author's name from a titleStmt,
// a speaker "play#anna", a labels file's word) already is what people call it. The name
// most of the author's letters of sure sender give, else of any sender; also under the
// label of a sender id told apart by file ("brink#p1": segment_roles.cpp), from that
// file's letters.
CandidateNames candidate_names(const Analysis& analysis) {
  std::map<std::string, std::map<std::string, std::size_t>> sure, any;
  for (const SegmentSummary& s : analysis.segments) {
    if (s.author.size() < 2 || s.author[0] != '#' || s.unit == "speaker") continue;
    if (s.label.empty() || s.label == s.local_id || s.label == s.author) continue;
    for (const std::string& key : {s.author, s.id_prefix() + s.author}) {
      ++any[key][s.label];
      if (s.authorship == Authorship::known) ++sure[key][s.label];
    }
  }
  CandidateNames names;
  for (const auto& [author, votes] : any) {
    auto known = sure.find(author);
    const auto& counted = known != sure.end() ? known->second : votes;
    std::string best;
    std::size_t most = 0;
    for (const auto& [label, count] : counted)
      if (count > most) best = label, most = count;
    names[author] = best;
  }
  return names;
}

// The pointer stays beside the name, at every mention: it is what the fs and the candidate
// ptr carry, and a bare name would read like a letter's sender.
std::string candidate_word(const CandidateNames& names, const std::string& candidate) {
  auto it = names.find(candidate);
  return it == names.end() || it->second.empty() ? candidate : it->second + " (" + candidate + ")";
}

std::string authorship_word(Authorship a) {
  return a == Authorship::known ? "known" : a == Authorship::conjectured ? "conjectured" : "unknown";
}

std::string measure_word(const Analysis& analysis) {
  return analysis.distances ? std::string(measure_info(analysis.distances->measure).name) : "";
}

std::string scaling_word(const Analysis& analysis) {
  if (!analysis.distances) return "";
  return measure_info(analysis.distances->measure).input == MeasureInput::z_scores ? "z-scores"
                                                                                    : "relative-frequencies";
}

std::string profile_note(const Analysis& analysis, const SegmentSummary& segment, const std::string& label,
                         const std::vector<std::pair<std::string, double>>& nearest) {
  const std::string noun = segment.unit == "whole" ? "text" : segment.unit == "xpath" ? "segment" : segment.unit;
  std::string note = "Style profile of the " + noun + " " + label + ": " + std::to_string(segment.tokens) +
                     " words, " + std::to_string(segment.types) + " different.";
  if (!segment.measured) {
    note += " Not compared with other segments";
    note += segment.excluded_reason.empty() ? "." : ": " + segment.excluded_reason + ".";
    return note;
  }
  if (!nearest.empty()) {
    note += " Nearest in style by " + measure_word(analysis) + " over " +
            std::to_string(analysis.table.feature_count()) + " " + describe(analysis.table.spec) + ":";
    for (std::size_t i = 0; i < nearest.size(); ++i)
      note += (i ? ", " : " ") + nearest[i].first + " " + rounded(nearest[i].second);
    note += ".";
  }
  return note;
}

std::string distances_note(const Analysis& analysis, bool all_pairs, std::size_t pairs) {
  const MeasureInfo& info = measure_info(analysis.distances->measure);
  std::string k = k_nearest(analysis);
  return "Stylistic distances between segments (" + std::to_string(pairs) + (pairs == 1 ? " pair, " : " pairs, ") +
         (all_pairs ? "every pair" : "each segment with its " + (k == "1" ? std::string("nearest") : k + " nearest")) +
         "): " +
         std::string(info.name) + " (" + std::string(info.citation) + ") over the " +
         std::to_string(analysis.table.feature_count()) + " most frequent " + describe(analysis.table.spec) +
         ". Smaller means more alike. A distance assesses style with this method and these settings; it is "
         "not an attribution.";
}

std::string pca_note(const Analysis& analysis) {
  const PcaResult& pca = *analysis.pca;
  std::string note = "Principal components of the " + std::to_string(pca.segment_ids.size()) + " measured segments (" +
                     analysis.provenance.parameter("pca input") + " of " + std::to_string(pca.features.size()) + " features):";
  for (Eigen::Index c = 0; c < pca.explained_variance_ratio.size(); ++c)
    note += (c ? ", " : " ") + std::string("PC") + std::to_string(c + 1) + " explains " +
            rounded(100 * pca.explained_variance_ratio(c), "%.1f") + "%";
  return note + " of the variance.";
}

std::string settings_description(const Analysis& analysis, bool all_pairs, const std::vector<std::string>& inputs) {
  const Provenance& p = analysis.provenance;
  std::string d = "Selection: " + p.selection + ". Tokenizer: " + p.tokenizer + ". Features: " + p.features +
                  ", ranks " + analysis.provenance.parameter("feature ranks") + " (" + analysis.provenance.parameter("features used") +
                  " used), culling " + analysis.provenance.parameter("culling") + ", minimum segment size " +
                  analysis.provenance.parameter("minimum segment size") + "; " + analysis.provenance.parameter("segments measured") +
                  " segments measured.";
  if (const std::string stop = analysis.provenance.parameter("stop words"); !stop.empty())
    d += " Stop words left out: " + stop + ".";
  if (analysis.distances) {
    d += " Measure: " + analysis.provenance.parameter("measure") + "; pairs written: " +
         (all_pairs ? std::string("all") : "each segment's " + k_nearest(analysis) + " nearest") + ".";
  }
  if (analysis.pca) d += " PCA on " + analysis.provenance.parameter("pca input") + ".";
  if (!analysis.attributions.empty() || !analysis.verifications.empty()) {
    d += " Attribution:";
    bool first = true;
    for (const char* key : {"candidate rule", "z-score limit", "labels", "candidates", "questioned segments", "seed",
                            "stability", "general impostors", "impostor files"}) {
      std::string v = analysis.provenance.parameter(key);
      if (v.empty()) continue;
      d += std::string(first ? " " : "; ") + key + " " + v;
      first = false;
    }
    d += ".";
  }
  if (!inputs.empty()) {
    d += " Results point into:";
    for (std::size_t i = 0; i < inputs.size(); ++i) d += (i ? "; " : " ") + inputs[i];
    d += ".";
  }
  return d;
}

std::string run_measure_word(const Analysis& analysis) {
  if (analysis.distances) return measure_word(analysis);
  std::string m = analysis.provenance.parameter("measure");
  return m.substr(0, m.find(" ("));
}

namespace {

// How a note names the author the edition conjectures for segment `s`: as a candidate; a
// sender named without @ref (keyed by the case-folded name, "hester vantry") as the
// letter's label gives the name, as the edition writes it.
std::string conjecture_word(const SegmentSummary& s, const std::string& conjecture, const CandidateNames& names) {
  const std::string named = candidate_word(names, conjecture);
  if (s.unit == "letter" && named == conjecture && conjecture[0] != '#' && !s.label.empty() && s.label != s.local_id)
    return s.label;
  return named;
}

}  // namespace

std::string attribution_note(const Analysis& analysis, const AttributionResult& result, const std::string& label,
                             const CandidateNames& names) {
  const SegmentSummary& s = analysis.segments[result.segment];
  // "(301 words)" straight after "Kit Dunnock (L12, conjectured)" would read as a second
  // name; other units' notes stay as they were.
  const std::string words = std::to_string(s.tokens) + " words";
  const bool bracketed = s.unit == "letter" && !label.empty() && label.back() == ')';
  std::string note = "Candidates for the " + (s.unit == "whole" ? std::string("text") : s.unit) + " " + label +
                     (bracketed ? ", " + words : " (" + words + ")") + ", nearest first by " +
                     run_measure_word(analysis) + " (" + result.rule + "):";
  std::vector<std::string> candidates;
  for (std::size_t i = 0; i < result.candidates.size(); ++i) {
    candidates.push_back(result.candidates[i].candidate);
    note += (i ? ", " : " ") + candidate_word(names, result.candidates[i].candidate) + " " +
            rounded(result.candidates[i].distance);
  }
  note += ".";
  if (result.candidates.size() > 1) note += " Margin between the first two: " + rounded(result.margin) + ".";
  if (result.resamples > 0 && !result.candidates.empty())
    note += " " + candidate_word(names, result.candidates.front().candidate) + " first in " +
            rounded(100 * result.stability, "%.0f") + "% of " + std::to_string(result.resamples) +
            " random subsets of " + rounded(100 * result.resample_share, "%.0f") + "% of the features.";
  if (!result.edition_conjecture.empty())
    note += " The edition conjectures " + conjecture_word(s, result.edition_conjecture, names) + ".";
  return note + warnings_sentences(result.warnings, names, candidates);
}

std::string verification_note(const Analysis& analysis, const VerificationResult& result, const std::string& label,
                              const CandidateNames& names) {
  const SegmentSummary& s = analysis.segments[result.segment];
  std::string note = "General Impostors verification (Koppel & Winter 2014) of the " +
                     (s.unit == "whole" ? std::string("text") : s.unit) + " " + label + " against " +
                     candidate_word(names, result.candidate) + ": score " + rounded(result.score, "%.2f") +
                     " (share of " + std::to_string(result.iterations) + " rounds in which " +
                     candidate_word(names, result.candidate) +
                     " was nearer than every impostor, " +
                     std::to_string(std::min(result.impostors_per_iteration, result.impostor_pool)) +
                     " drawn each round from " + std::to_string(result.impostor_pool) + " impostor(s), other authors " +
                     "or impostor files, with " + std::to_string(result.impostor_segments) + " segment(s)); " +
                     (result.decision == "same-author"        ? std::string("same author")
                      : result.decision == "different-author" ? std::string("different author")
                                                              : result.decision);
  if (analysis.verification_band && analysis.verification_band->calibrated)
    note += " under the undecided band " + rounded(analysis.verification_band->low, "%.2f") + "-" +
            rounded(analysis.verification_band->high, "%.2f") + " calibrated on this run's labelled segments";
  else if (analysis.verification_band)
    note += " read against 0.5 (too few labelled segments to calibrate an undecided band)";
  note += ".";
  if (!result.edition_conjecture.empty())
    note += " The edition conjectures " + conjecture_word(s, result.edition_conjecture, names) + ".";
  return note + warnings_sentences(result.warnings, names, {result.candidate});
}

}  // namespace manicule
