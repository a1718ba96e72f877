#include "cli/attribution_output.h"

#include "attribution/attribution_result.h"
#include "cli/measure_output.h"
#include "cli/table_output.h"

namespace manicule::cli {

namespace {

std::string joined(const std::vector<std::string>& parts) {
  std::string out;
  for (const auto& p : parts) out += (out.empty() ? "" : "; ") + p;
  return out;
}

std::string fixed(double x, int digits = 4) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", digits, x);
  return buffer;
}

void write_head(std::ostream& out, const Analysis& analysis) {
  write_tsv_parameters(out, {{"caution", kAttributionCaution}});
  write_analysis_parameters(out, analysis);
}

// A figure that cannot be computed (AUC over problems of one answer only) is null, never a
// number that could be read as a result.
nlohmann::json figure(double value, bool defined) { return defined ? nlohmann::json(value) : nlohmann::json(); }
std::string figure_text(double value, bool defined) { return defined ? fixed(value) : "n/a"; }

// Without a calibrated band a "calibrated score" would be the score itself under another
// name: none is given.
bool band_calibrated(const Analysis& analysis) {
  return analysis.verification_band && analysis.verification_band->calibrated;
}

nlohmann::json band_json(const VerificationBand& b) {
  return {{"low", b.low},           {"high", b.high},
          {"calibrated", b.calibrated}, {"method", b.method},
          {"same_problems", b.same_problems}, {"different_problems", b.different_problems},
          {"auc", figure(b.auc, b.auc_defined())}, {"c_at_1", figure(b.c_at_1, b.rates_defined())},
          {"f05u", figure(b.f05u, b.rates_defined())}};
}

}  // namespace

nlohmann::json attributions_json(const Analysis& analysis, std::size_t top) {
  nlohmann::json doc = analysis_json_head(analysis);
  doc["caution"] = kAttributionCaution;
  nlohmann::json list = nlohmann::json::array();
  for (const auto& r : analysis.attributions) {
    nlohmann::json candidates = nlohmann::json::array();
    for (const auto& c : r.candidates) {
      if (top > 0 && c.rank > top) break;
      candidates.push_back({{"rank", c.rank},
                            {"candidate", c.candidate},
                            {"distance", c.distance},
                            {"nearest_segment", analysis.segments[c.nearest_segment].id},
                            {"nearest_segment_distance", c.nearest_distance},
                            {"rank_by_nearest_segment", c.nearest_rank},
                            {"candidate_segments", c.segments},
                            {"candidate_words", c.words}});
    }
    const SegmentSummary& s = analysis.segments[r.segment];
    list.push_back({{"segment", s.id},
                    {"label", s.label},
                    {"words", s.tokens},
                    {"edition_conjecture", r.edition_conjecture},
                    {"rule", r.rule},
                    {"first", r.candidates.empty() ? "" : r.candidates.front().candidate},
                    {"margin", r.margin},
                    // With no resampled subsets (--resamples 0) stability was not measured.
                    {"stability", r.resamples > 0 ? nlohmann::json(r.stability) : nlohmann::json()},
                    {"resamples", r.resamples},
                    {"resample_share", r.resample_share},
                    {"seed", r.seed},
                    {"candidates", candidates},
                    {"warnings", r.warnings},
                    {"caution", kAttributionCaution}});
  }
  doc["attributions"] = list;
  return doc;
}

void write_attributions_tsv(std::ostream& out, const Analysis& analysis, std::size_t top) {
  write_head(out, analysis);
  write_tsv_row(out, {"segment", "words", "rank", "candidate", "distance", "margin", "stability", "nearest_segment",
                      "nearest_segment_distance", "rank_by_nearest_segment", "candidate_segments", "candidate_words",
                      "edition_conjecture", "warnings"});
  for (const auto& r : analysis.attributions) {
    const SegmentSummary& s = analysis.segments[r.segment];
    for (const auto& c : r.candidates) {
      if (top > 0 && c.rank > top) break;
      const bool first = c.rank == 1;
      write_tsv_row(out, {s.id, std::to_string(s.tokens), std::to_string(c.rank), c.candidate, fixed(c.distance, 6),
                          first ? fixed(r.margin, 6) : "", first && r.resamples > 0 ? fixed(r.stability, 2) : "",
                          analysis.segments[c.nearest_segment].id, fixed(c.nearest_distance, 6),
                          std::to_string(c.nearest_rank), std::to_string(c.segments), std::to_string(c.words),
                          r.edition_conjecture, first ? joined(r.warnings) : ""});
    }
  }
}

nlohmann::json verifications_json(const Analysis& analysis) {
  nlohmann::json doc = analysis_json_head(analysis);
  doc["caution"] = kAttributionCaution;
  if (analysis.verification_band) doc["band"] = band_json(*analysis.verification_band);
  const bool calibrated = band_calibrated(analysis);
  nlohmann::json list = nlohmann::json::array();
  for (const auto& v : analysis.verifications) {
    const SegmentSummary& s = analysis.segments[v.segment];
    list.push_back({{"segment", s.id},
                    {"words", s.tokens},
                    {"candidate", v.candidate},
                    {"score", v.score},
                    {"calibrated_score", figure(v.calibrated_score, calibrated)},
                    {"decision", v.decision},
                    {"iterations", v.iterations},
                    {"feature_share", v.feature_share},
                    {"impostors_per_iteration", v.impostors_per_iteration},
                    {"impostor_pool", v.impostor_pool},
                    {"impostor_segments", v.impostor_segments},
                    // Not --seed (which the provenance records): the problem's own, drawn from it
                    // with the segment and candidate, so that adding a candidate changes no score.
                    {"problem_seed", v.seed},
                    {"edition_conjecture", v.edition_conjecture},
                    {"warnings", v.warnings},
                    {"caution", kAttributionCaution}});
  }
  doc["verifications"] = list;
  return doc;
}

void write_verifications_tsv(std::ostream& out, const Analysis& analysis) {
  write_head(out, analysis);
  if (analysis.verification_band) {
    const VerificationBand& b = *analysis.verification_band;
    write_tsv_parameters(out, {{"undecided band", "[" + fixed(b.low, 2) + ", " + fixed(b.high, 2) + "]"},
                               {"band calibration", b.method}});
    // As the JSON gives them (docs/attribution.md), said to be measured on the problems
    // the band was fitted to.
    if (b.calibrated)
      write_tsv_parameters(out, {{"band fit on its own known problems (in-sample, so optimistic)",
                                  "AUC " + figure_text(b.auc, b.auc_defined()) + ", c@1 " +
                                      figure_text(b.c_at_1, b.rates_defined()) + ", F0.5u " +
                                      figure_text(b.f05u, b.rates_defined())}});
  }
  write_tsv_row(out, {"segment", "words", "candidate", "score", "calibrated_score", "decision", "impostor_pool",
                      "impostor_segments", "edition_conjecture", "warnings"});
  const bool calibrated = band_calibrated(analysis);
  for (const auto& v : analysis.verifications) {
    const SegmentSummary& s = analysis.segments[v.segment];
    write_tsv_row(out, {s.id, std::to_string(s.tokens), v.candidate, fixed(v.score, 2),
                        calibrated ? fixed(v.calibrated_score, 4) : "n/a",
                        v.decision, std::to_string(v.impostor_pool), std::to_string(v.impostor_segments),
                        v.edition_conjecture, joined(v.warnings)});
  }
}

nlohmann::json evaluation_json(const Analysis& analysis) {
  nlohmann::json doc = analysis_json_head(analysis);
  doc["caution"] = kAttributionCaution;
  const EvaluationResult& e = *analysis.evaluation;
  nlohmann::json segments = nlohmann::json::array();
  for (const auto& s : e.segments)
    segments.push_back({{"segment", analysis.segments[s.segment].id},
                        {"truth", s.truth},
                        {"predicted", s.predicted},
                        {"correct", s.truth == s.predicted},
                        {"margin", s.margin},
                        {"truth_had_other_text", s.truth_had_other_text}});
  nlohmann::json candidates = nlohmann::json::array();
  for (const auto& c : e.per_candidate)
    candidates.push_back({{"candidate", c.candidate}, {"segments", c.segments}, {"predicted", c.predicted},
                          {"correct", c.correct}, {"precision", c.precision}, {"recall", c.recall}});
  nlohmann::json rules = nlohmann::json::array();
  for (const auto& r : e.rules)
    rules.push_back({{"rule", r.rule}, {"correct", r.correct}, {"evaluated", r.evaluated},
                     {"accuracy", r.evaluated ? static_cast<double>(r.correct) / static_cast<double>(r.evaluated) : 0.0}});
  nlohmann::json verification = nlohmann::json::array();
  for (const auto& v : e.verification) {
    nlohmann::json scores = nlohmann::json::array();
    for (const auto& p : v.scores)
      scores.push_back({{"segment", analysis.segments[p.segment].id},
                        {"candidate", p.candidate},
                        {"known_segment", analysis.segments[p.known_segment].id},
                        {"same", p.same},
                        {"score", p.score},
                        // the score itself where its band was not calibrated: none then
                        {"calibrated_score", figure(p.calibrated_score, p.band_calibrated)}});
    verification.push_back({{"problems", v.problems}, {"same", v.same}, {"different", v.different},
                            {"undecided", v.undecided}, {"auc", figure(v.auc, v.auc_defined())},
                            {"raw_auc", figure(v.raw_auc, v.auc_defined())}, {"c_at_1", figure(v.c_at_1, v.rates_defined())},
                            {"f05u", figure(v.f05u, v.rates_defined())}, {"calibration", v.calibration},
                            {"scores", scores}});
  }
  doc["evaluation"] = {{"held_out", e.held_out},   {"evaluated", e.evaluated},   {"correct", e.correct},
                       {"accuracy", e.accuracy},   {"candidates", e.candidates}, {"confusion", e.confusion},
                       {"per_candidate", candidates}, {"rules", rules},          {"verification", verification},
                       {"segments", segments},     {"warnings", e.warnings}};
  return doc;
}

void write_evaluation_tsv(std::ostream& out, const Analysis& analysis, const std::string& table) {
  const EvaluationResult& e = *analysis.evaluation;
  write_head(out, analysis);
  std::vector<std::pair<std::string, std::string>> summary{
      {"accuracy", std::to_string(e.correct) + "/" + std::to_string(e.evaluated) + " = " + fixed(e.accuracy, 4)}};
  for (const auto& r : e.rules)
    summary.emplace_back("rule " + r.rule, std::to_string(r.correct) + "/" + std::to_string(r.evaluated));
  for (const auto& v : e.verification)
    summary.emplace_back("verification, " + v.problems,
                         "AUC " + figure_text(v.auc, v.auc_defined()) + " (scores before the band: " +
                             figure_text(v.raw_auc, v.auc_defined()) + "), c@1 " +
                             figure_text(v.c_at_1, v.rates_defined()) + ", F0.5u " +
                             figure_text(v.f05u, v.rates_defined()) +
                             // How the bands came about, so that figures read against 0.5
                             // for want of a calibrated band are not taken for cross-fitted.
                             "; bands: " + v.calibration);
  for (const auto& w : e.warnings) summary.emplace_back("warning", w);
  write_tsv_parameters(out, summary);
  if (table == "candidates") {
    write_tsv_row(out, {"candidate", "segments", "predicted", "correct", "precision", "recall"});
    for (const auto& c : e.per_candidate)
      write_tsv_row(out, {c.candidate, std::to_string(c.segments), std::to_string(c.predicted),
                          std::to_string(c.correct), fixed(c.precision), fixed(c.recall)});
  } else if (table == "confusion") {
    std::vector<std::string> header{"truth \\ predicted"};
    header.insert(header.end(), e.candidates.begin(), e.candidates.end());
    write_tsv_row(out, header);
    for (std::size_t i = 0; i < e.candidates.size(); ++i) {
      std::vector<std::string> row{e.candidates[i]};
      for (std::size_t n : e.confusion[i]) row.push_back(std::to_string(n));
      write_tsv_row(out, row);
    }
  } else if (table == "rules") {
    write_tsv_row(out, {"rule", "correct", "evaluated", "accuracy"});
    for (const auto& r : e.rules)
      write_tsv_row(out, {r.rule, std::to_string(r.correct), std::to_string(r.evaluated),
                          fixed(r.evaluated ? static_cast<double>(r.correct) / static_cast<double>(r.evaluated) : 0.0)});
  } else if (table == "verification") {
    write_tsv_row(out, {"problems", "same", "different", "undecided", "auc", "raw_auc", "c_at_1", "f05u", "calibration"});
    for (const auto& v : e.verification)
      write_tsv_row(out, {v.problems, std::to_string(v.same), std::to_string(v.different),
                          std::to_string(v.undecided), figure_text(v.auc, v.auc_defined()),
                          figure_text(v.raw_auc, v.auc_defined()), figure_text(v.c_at_1, v.rates_defined()),
                          figure_text(v.f05u, v.rates_defined()), v.calibration});
  } else {
    write_tsv_row(out, {"segment", "truth", "predicted", "correct", "margin"});
    for (const auto& s : e.segments)
      write_tsv_row(out, {analysis.segments[s.segment].id, s.truth, s.predicted, s.truth == s.predicted ? "yes" : "no",
                          fixed(s.margin, 6)});
  }
}

}  // namespace manicule::cli
