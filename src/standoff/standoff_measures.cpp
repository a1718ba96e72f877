// StandoffBuilder, continued: the results that compare segments (distances, PCA).
#include <algorithm>
#include <set>

#include "profile/feature_spec.h"
#include "standoff/edition_splice.h"
#include "standoff/feature_values.h"
#include "standoff/standoff_builder.h"
#include "standoff/standoff_wording.h"

namespace manicule {

using namespace tei_fs;

std::vector<std::pair<std::size_t, std::size_t>> StandoffBuilder::pairs() const {
  std::set<std::pair<std::size_t, std::size_t>> out;
  if (!analysis_.distances) return {};
  if (options_.all_pairs) {
    const auto& rows = analysis_.distances->rows;
    for (std::size_t a = 0; a < rows.size(); ++a)
      for (std::size_t b = a + 1; b < rows.size(); ++b)
        if (is_member(rows[a]) || is_member(rows[b]))
          out.emplace(std::min(rows[a], rows[b]), std::max(rows[a], rows[b]));
  } else {
    for (std::size_t segment : target_.members) {
      long row = row_of_[segment];
      if (row < 0) continue;
      for (const Neighbour& n : analysis_.distances->nearest[static_cast<std::size_t>(row)])
        out.emplace(std::min(segment, n.segment), std::max(segment, n.segment));
    }
  }
  return {out.begin(), out.end()};
}

void StandoffBuilder::add_distances(Parts& parts) const {
  std::vector<std::pair<std::size_t, std::size_t>> written = pairs();
  if (written.empty()) return;
  const DistanceResult& d = *analysis_.distances;
  const FeatureSpec& spec = analysis_.table.spec;
  const std::string prefix(kOurIdPrefix);
  for (const auto& [a, b] : written) {
    // The segments' keys (claim_segment_ids), also for a segment of a file not written into.
    const std::string key = id_key(analysis_.segments[a].local_id) + "-" + id_key(analysis_.segments[b].local_id);
    std::string link_id = ids_.claim(prefix + "link-" + key);
    std::string value_id = ids_.claim(prefix + "dist-" + key);
    parts.links.add(XmlNode::element(
        "link", {{"xml:id", link_id}, {"target", target_.reference(a) + " " + target_.reference(b)}, {"ana", "#" + value_id}}));
    XmlNode fs = XmlNode::element("fs", {{"xml:id", value_id}, {"type", "styleDistance"}});
    add_feature(fs, "measure").add(symbol(measure_word(analysis_)));
    double value = d.values(row_of_[a], row_of_[b]);
    add_feature(fs, "value").add(numeric(format_number(value)));
    add_feature(fs, "nFeatures").add(numeric(std::to_string(analysis_.table.feature_count())));
    add_feature(fs, "featureType").add(symbol(std::string(feature_kind_name(spec.kind))));
    if (spec.kind != FeatureKind::word) add_feature(fs, "n").add(numeric(std::to_string(spec.n)));
    add_feature(fs, "scaling").add(symbol(scaling_word(analysis_)));
    XmlNode& segments = add_feature(fs, "segments").add(XmlNode::element("vColl", {{"org", "list"}}));
    segments.add_text_element("string", analysis_.segments[a].id);
    segments.add_text_element("string", analysis_.segments[b].id);
    parts.values.add(std::move(fs));
  }
  parts.annotations.add(annotation(distances_annotation_id_, "#" + links_id_, "assessing",
                                   distances_note(analysis_, options_.all_pairs, written.size())));
}

void StandoffBuilder::add_pca(Parts& parts) const {
  if (!analysis_.pca) return;
  const PcaResult& pca = *analysis_.pca;
  bool any = false;
  for (std::size_t segment : target_.members) {
    long row = pca_row_of_[segment];
    if (row < 0) continue;
    any = true;
    XmlNode fs = XmlNode::element(
        "fs", {{"xml:id", target_.segment_ids[segment].pca}, {"type", "pcaCoordinates"}, {"ana", "#" + pca_summary_id_}});
    add_feature(fs, "segment").add_text_element("string", analysis_.segments[segment].id);
    for (Eigen::Index c = 0; c < pca.coordinates.cols(); ++c)
      add_feature(fs, "pc" + std::to_string(c + 1)).add(numeric(format_number(pca.coordinates(row, c))));
    parts.values.add(std::move(fs));
  }
  if (!any) return;
  XmlNode summary = XmlNode::element("fs", {{"xml:id", pca_summary_id_}, {"type", "pcaSummary"}});
  add_feature(summary, "nFeatures").add(numeric(std::to_string(pca.features.size())));
  add_feature(summary, "nSegments").add(numeric(std::to_string(pca.segment_ids.size())));
  for (Eigen::Index c = 0; c < pca.explained_variance_ratio.size(); ++c) {
    XmlNode& component = add_feature(summary, "pc" + std::to_string(c + 1)).add(
        XmlNode::element("fs", {{"type", "pcaComponent"}}));
    add_feature(component, "explainedVarianceRatio").add(numeric(format_number(pca.explained_variance_ratio(c))));
    if (static_cast<std::size_t>(c) < pca.poles.size()) {
      for (const auto& [name, weights] : {std::pair{"positivePole", &pca.poles[static_cast<std::size_t>(c)].positive},
                                          std::pair{"negativePole", &pca.poles[static_cast<std::size_t>(c)].negative}}) {
        if (weights->empty()) continue;
        XmlNode& list = add_feature(component, name).add(XmlNode::element("vColl", {{"org", "list"}}));
        for (const FeatureWeight& w : *weights) list.add_text_element("string", pca.features[w.feature]);
      }
    }
  }
  parts.values.add(std::move(summary));
  parts.annotations.add(annotation(pca_annotation_id_, "#" + pca_summary_id_, "describing", pca_note(analysis_)));
}

}  // namespace manicule
