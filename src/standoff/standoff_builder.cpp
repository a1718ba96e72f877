#include "standoff/standoff_builder.h"

#include <cmath>
#include <cstdio>

#include "core/letter_names.h"
#include "measure/newick.h"
#include "standoff/edition_splice.h"
#include "standoff/feature_values.h"
#include "standoff/standoff_wording.h"

namespace manicule {

std::string format_number(double value) {
  if (!std::isfinite(value)) return "NaN";
  return newick_number(value);
}

StandoffBuilder::StandoffBuilder(const Analysis& analysis, const StandoffTarget& target, IdRegistry& ids,
                                 StandoffOptions options)
    : analysis_(analysis), target_(target), ids_(ids), options_(std::move(options)) {
  const std::string p(kOurIdPrefix);
  standoff_id_ = ids_.claim(p + "standoff");
  application_id_ = ids_.claim(p + "app");
  annotations_id_ = ids_.claim(p + "annotations");
  joins_id_ = ids_.claim(p + "parts");
  links_id_ = ids_.claim(p + "distances");
  values_id_ = ids_.claim(p + "values");
  distances_annotation_id_ = ids_.claim(p + "ann-distances");
  pca_annotation_id_ = ids_.claim(p + "ann-pca");
  pca_summary_id_ = ids_.claim(p + "pca");
  for (const SegmentSummary& s : analysis.segments) ++label_count_[s.label.empty() ? s.local_id : s.label];
  for (std::size_t m : target.members) member_files_.insert(analysis.segments[m].file);
  candidate_names_ = candidate_names(analysis);
  member_set_.insert(target.members.begin(), target.members.end());
  row_of_.assign(analysis.segments.size(), -1);
  if (analysis.distances)
    for (std::size_t r = 0; r < analysis.distances->rows.size(); ++r)
      row_of_[analysis.distances->rows[r]] = static_cast<long>(r);
  pca_row_of_.assign(analysis.segments.size(), -1);
  if (analysis.pca) {
    std::map<std::string, std::size_t> index;
    for (std::size_t s = 0; s < analysis.segments.size(); ++s) index[analysis.segments[s].id] = s;
    for (std::size_t r = 0; r < analysis.pca->segment_ids.size(); ++r) {
      auto it = index.find(analysis.pca->segment_ids[r]);
      if (it != index.end()) pca_row_of_[it->second] = static_cast<long>(r);
    }
  }
}

std::string StandoffBuilder::software() const {
  return analysis_.provenance.tool + " " + analysis_.provenance.version;
}

XmlNode StandoffBuilder::annotation(const std::string& id, const std::string& target, const std::string& motivation,
                                    const std::string& note) const {
  XmlNode a = XmlNode::element("annotation", {{"xml:id", id}, {"target", target}, {"motivation", motivation}});
  XmlNode& resp = a.add(XmlNode::element("respStmt"));
  resp.add_text_element("resp", "created by");
  resp.add_text_element("name", software(), {{"type", "software"}, {"ref", "#" + application_id_}});
  a.add(XmlNode::element("revisionDesc"))
      .add(XmlNode::element("change", {{"status", "created"}, {"when", analysis_.provenance.created}}));
  a.add_text_element("note", note, {{"xml:lang", "en"}});
  return a;
}

// The segment's label; with its file where it lies in another edition. A letter always
// with its id and whether its sender is only conjectured (core/letter_names.h); another segment
// with its local id where several segments share the label.
std::string StandoffBuilder::label_from_here(std::size_t segment) const {
  const SegmentSummary& s = analysis_.segments[segment];
  std::string label = s.label.empty() ? s.local_id : s.label;
  if (s.unit == "letter") label = letter_name(s);
  else if (label_count_.at(label) > 1 && label != s.local_id) label = s.local_id + " (" + label + ")";
  return member_files_.count(s.file) ? label : label + " in " + s.id_prefix();
}

XmlNode StandoffBuilder::standoff() const {
  Parts parts{XmlNode::element("listAnnotation", {{"xml:id", annotations_id_}}),
              XmlNode::element("joinGrp", {{"xml:id", joins_id_}}),
              XmlNode::element("linkGrp", {{"xml:id", links_id_}, {"type", "styleDistance"}}),
              XmlNode::element("fvLib", {{"xml:id", values_id_}, {"n", "stylometry"}})};
  parts.annotations.add_text_element("head", "Stylometric results written by " + software());
  parts.joins.add_text_element("desc", "Segments made of several elements (a speaker's speeches), one join each, "
                                       "so that a link or an annotation can point at the whole",
                                {{"xml:lang", "en"}});
  add_profiles(parts);
  add_distances(parts);
  add_pca(parts);
  add_attributions(parts);
  add_verifications(parts);
  XmlNode standoff = XmlNode::element("standOff", {{"xml:id", standoff_id_}, {"type", std::string(kOurStandoffType)}});
  standoff.add(std::move(parts.annotations));
  if (parts.joins.children.size() > 1) standoff.add(std::move(parts.joins));
  if (!parts.links.children.empty()) standoff.add(std::move(parts.links));
  if (!parts.values.children.empty()) standoff.add(std::move(parts.values));
  return standoff;
}

XmlNode StandoffBuilder::profile_values(std::size_t segment) const {
  using namespace tei_fs;
  const SegmentSummary& s = analysis_.segments[segment];
  const SegmentIds& sid = target_.segment_ids[segment];
  XmlNode fs = XmlNode::element("fs", {{"xml:id", sid.profile}, {"type", "styleProfile"}});
  add_feature(fs, "segment").add_text_element("string", s.id);
  add_feature(fs, "label").add_text_element("string", s.label.empty() ? s.local_id : s.label);
  add_feature(fs, "unitType").add(symbol(s.unit));
  add_feature(fs, "tokens").add(count(s.tokens));
  add_feature(fs, "types").add(count(s.types));
  if (!s.language.empty()) add_feature(fs, "language").add(symbol(s.language));
  if (!s.author.empty()) add_feature(fs, "author").add_text_element("string", s.author);
  add_feature(fs, "authorship").add(symbol(authorship_word(s.authorship)));
  add_feature(fs, "measured").add(binary(s.measured));
  if (!s.excluded_reason.empty()) add_feature(fs, "excludedBecause").add_text_element("string", s.excluded_reason);
  long row = row_of_[segment];
  if (row >= 0 && !analysis_.distances->nearest[static_cast<std::size_t>(row)].empty()) {
    XmlNode& list = add_feature(fs, "nearest").add(XmlNode::element("vColl", {{"org", "list"}}));
    std::size_t rank = 0;
    for (const Neighbour& n : analysis_.distances->nearest[static_cast<std::size_t>(row)]) {
      XmlNode& entry = list.add(XmlNode::element("fs", {{"type", "neighbour"}, {"corresp", target_.reference(n.segment)}}));
      add_feature(entry, "rank").add(count(++rank));
      add_feature(entry, "segment").add_text_element("string", analysis_.segments[n.segment].id);
      add_feature(entry, "distance").add(numeric(n.distance));
    }
  }
  return fs;
}

void StandoffBuilder::add_profiles(Parts& parts) const {
  for (std::size_t segment : target_.members) {
    const SegmentSummary& s = analysis_.segments[segment];
    const SegmentIds& sid = target_.segment_ids[segment];
    std::vector<std::string> pointers = target_.pointers(segment);
    if (pointers.size() > 1) {
      std::string joined;
      for (const auto& p : pointers) joined += (joined.empty() ? "" : " ") + p;
      XmlNode& join = parts.joins.add(XmlNode::element("join", {{"xml:id", sid.join}, {"target", joined}}));
      join.add_text_element("desc", "All " + s.unit + " elements of " + label_from_here(segment), {{"xml:lang", "en"}});
    }
    std::vector<std::pair<std::string, double>> nearest;
    long row = row_of_[segment];
    if (row >= 0)
      for (const Neighbour& n : analysis_.distances->nearest[static_cast<std::size_t>(row)])
        nearest.emplace_back(label_from_here(n.segment), n.distance);
    XmlNode a = annotation(sid.annotation, target_.reference(segment), "describing",
                           profile_note(analysis_, s, label_from_here(segment), nearest));
    a.add(XmlNode::element("ptr", {{"type", "profile"}, {"target", "#" + sid.profile}}));
    if (pca_row_of_[segment] >= 0) a.add(XmlNode::element("ptr", {{"type", "pca"}, {"target", "#" + sid.pca}}));
    parts.annotations.add(std::move(a));
    parts.values.add(profile_values(segment));
  }
}

XmlNode StandoffBuilder::application() const {
  const Provenance& p = analysis_.provenance;
  XmlNode app = XmlNode::element("application", {{"xml:id", application_id_},
                                                 {"ident", std::string(kOurApplicationIdent)},
                                                 {"version", p.version},
                                                 {"when", p.created}});
  app.add_text_element("label", software());
  app.add_text_element("desc", settings_description(analysis_, options_.all_pairs, target_.inputs),
                       {{"xml:lang", "en"}});
  app.add(XmlNode::element("ptr", {{"target", "#" + standoff_id_}}));
  return app;
}

XmlNode StandoffBuilder::change() const {
  std::string who = options_.who.empty() ? "#" + application_id_ : options_.who;
  XmlNode change = XmlNode::element(
      "change", {{"when", analysis_.provenance.created}, {"who", who}, {"target", "#" + standoff_id_}});
  change.add(XmlNode::text_node("Added stylometric stand-off results from "));
  change.add_text_element("ref", software(), {{"target", "#" + application_id_}});
  change.add(XmlNode::text_node(options_.ids_added
                                    ? "; text unchanged except for xml:id attributes given to segment elements "
                                      "that had none."
                                    : "; text unchanged."));
  return change;
}

}  // namespace manicule
