// StandoffBuilder, continued: attribution and verification results of the questioned
// segments this document holds (tei-conventions.md section 8c, extended with every
// candidate, the stability and the caution).
#include <cstdint>
#include <string>

#include "standoff/edition_splice.h"
#include "standoff/feature_values.h"
#include "standoff/standoff_builder.h"
#include "standoff/standoff_wording.h"

namespace manicule {

using namespace tei_fs;

namespace {

// A candidate label that is a pointer into the edition ("#p-pellow", a person's id from
// @who or correspAction/persName/@ref; "brink#p1", one file's, where files give the id to
// different people), as this document points at it (StandoffTarget).
std::string candidate_pointer(const StandoffTarget& target, const std::string& label, std::size_t nearest_segment) {
  const std::size_t hash = label.rfind('#');
  if (!target.person_pointer || hash == std::string::npos || hash + 1 >= label.size() ||
      label.find(' ') != std::string::npos)
    return "";
  return target.person_pointer(label, nearest_segment);
}

std::string label_key(const std::string& label) {
  return id_key(!label.empty() && label[0] == '#' ? label.substr(1) : label);
}

}  // namespace

void StandoffBuilder::add_attributions(Parts& parts) const {
  const std::string prefix(kOurIdPrefix);
  for (const AttributionResult& r : analysis_.attributions) {
    if (!is_member(r.segment)) continue;
    const std::string key = target_.segment_ids[r.segment].key;
    const std::string value_id = ids_.claim(prefix + "attr-" + key);
    XmlNode fs = XmlNode::element("fs", {{"xml:id", value_id}, {"type", "attributionResult"}});
    add_feature(fs, "segment").add_text_element("string", analysis_.segments[r.segment].id);
    add_feature(fs, "measure").add(symbol(run_measure_word(analysis_)));
    add_feature(fs, "rule").add(symbol(r.rule));
    add_feature(fs, "scoreType").add(symbol("distance"));
    if (!r.candidates.empty()) {
      add_feature(fs, "candidate").add_text_element("string", r.candidates.front().candidate);
      add_feature(fs, "score").add(numeric(r.candidates.front().distance));
    }
    add_feature(fs, "margin").add(numeric(r.margin));
    if (r.resamples > 0) add_feature(fs, "stability").add(numeric(r.stability));  // else not measured
    add_feature(fs, "resamples").add(count(r.resamples));
    add_feature(fs, "resampleShare").add(numeric(r.resample_share));
    add_feature(fs, "seed").add(numeric(std::to_string(r.seed)));
    add_feature(fs, "textTokens").add(count(analysis_.segments[r.segment].tokens));
    if (!r.edition_conjecture.empty()) add_feature(fs, "editionConjecture").add_text_element("string", r.edition_conjecture);
    XmlNode& list = add_feature(fs, "candidates").add(XmlNode::element("vColl", {{"org", "list"}}));
    for (const CandidateDistance& c : r.candidates) {
      XmlNode& entry = list.add(XmlNode::element("fs", {{"type", "candidateDistance"}}));
      std::string pointer = candidate_pointer(target_, c.candidate, c.nearest_segment);
      add_feature(entry, "candidate")
          .add_text_element("string", c.candidate, pointer.empty() ? std::vector<std::pair<std::string, std::string>>{}
                                                                   : std::vector<std::pair<std::string, std::string>>{
                                                                         {"corresp", pointer}});
      add_feature(entry, "rank").add(count(c.rank));
      add_feature(entry, "distance").add(numeric(c.distance));
      add_feature(entry, "nearestSegment").add_text_element("string", analysis_.segments[c.nearest_segment].id);
      add_feature(entry, "nearestDistance").add(numeric(c.nearest_distance));
      add_feature(entry, "nearestRank").add(count(c.nearest_rank));
      add_feature(entry, "segments").add(count(c.segments));
      add_feature(entry, "words").add(count(c.words));
    }
    add_strings(fs, "warnings", r.warnings);
    add_feature(fs, "caution").add_text_element("string", kAttributionCaution);
    parts.values.add(std::move(fs));

    XmlNode a = annotation(ids_.claim(prefix + "ann-attr-" + key), target_.reference(r.segment), "assessing",
                           attribution_note(analysis_, r, label_from_here(r.segment), candidate_names_));
    a.add_text_element("note", kAttributionCaution, {{"type", "caution"}, {"xml:lang", "en"}});
    if (!r.candidates.empty()) {
      const CandidateDistance& first = r.candidates.front();
      std::string pointer = candidate_pointer(target_, first.candidate, first.nearest_segment);
      if (!pointer.empty()) a.add(XmlNode::element("ptr", {{"type", "candidate"}, {"target", pointer}}));
    }
    a.add(XmlNode::element("ptr", {{"type", "result"}, {"target", "#" + value_id}}));
    parts.annotations.add(std::move(a));
  }
}

void StandoffBuilder::add_verifications(Parts& parts) const {
  const std::string prefix(kOurIdPrefix);
  for (const VerificationResult& r : analysis_.verifications) {
    if (!is_member(r.segment)) continue;
    const std::string key = target_.segment_ids[r.segment].key + "-" + label_key(r.candidate);
    const std::string value_id = ids_.claim(prefix + "verif-" + key);
    XmlNode fs = XmlNode::element("fs", {{"xml:id", value_id}, {"type", "verificationResult"}});
    add_feature(fs, "segment").add_text_element("string", analysis_.segments[r.segment].id);
    add_feature(fs, "method").add(symbol("general-impostors"));
    add_feature(fs, "measure").add(symbol(run_measure_word(analysis_)));
    add_feature(fs, "candidate").add_text_element("string", r.candidate);
    add_feature(fs, "score").add(numeric(r.score));
    // Without a calibrated band it would be the score again under another name.
    if (analysis_.verification_band && analysis_.verification_band->calibrated)
      add_feature(fs, "calibratedScore").add(numeric(r.calibrated_score));
    add_feature(fs, "decision").add(symbol(r.decision));
    if (analysis_.verification_band) {
      const VerificationBand& band = *analysis_.verification_band;
      add_feature(fs, "bandLow").add(numeric(band.low));
      add_feature(fs, "bandHigh").add(numeric(band.high));
      add_feature(fs, "bandCalibrated").add(binary(band.calibrated));
    }
    add_feature(fs, "iterations").add(count(r.iterations));
    add_feature(fs, "featureShare").add(numeric(r.feature_share));
    add_feature(fs, "impostorsPerIteration").add(count(r.impostors_per_iteration));
    add_feature(fs, "impostorPool").add(count(r.impostor_pool));
    add_feature(fs, "impostorSegments").add(count(r.impostor_segments));
    add_feature(fs, "problemSeed").add(numeric(std::to_string(r.seed)));  // from --seed, segment, candidate
    if (!r.edition_conjecture.empty()) add_feature(fs, "editionConjecture").add_text_element("string", r.edition_conjecture);
    add_strings(fs, "warnings", r.warnings);
    add_feature(fs, "caution").add_text_element("string", kAttributionCaution);
    parts.values.add(std::move(fs));

    // A decision of a calibrated band commits to a label (classifying); an undecided score,
    // or one only read against 0.5 for want of known problems to calibrate on, assesses.
    const bool calibrated = analysis_.verification_band && analysis_.verification_band->calibrated;
    const char* motivation = r.decision != "undecided" && calibrated ? "classifying" : "assessing";
    XmlNode a = annotation(ids_.claim(prefix + "ann-verif-" + key), target_.reference(r.segment), motivation,
                           verification_note(analysis_, r, label_from_here(r.segment), candidate_names_));
    a.add_text_element("note", kAttributionCaution, {{"type", "caution"}, {"xml:lang", "en"}});
    a.add(XmlNode::element("ptr", {{"type", "result"}, {"target", "#" + value_id}}));
    parts.annotations.add(std::move(a));
  }
}

}  // namespace manicule
