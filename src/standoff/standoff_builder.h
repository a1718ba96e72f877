// StandoffBuilder: turns an Analysis into our TEI markup for one document (an edition, or
// a separate results file), following ../shared/docs/tei-conventions.md sections 5, 7, 8:
//
//   <standOff type="stylometry" xml:id="mcl-standoff">
//     <listAnnotation>   one annotation per segment profile (motivation "describing"),
//                        one for the distances ("assessing", target: the linkGrp), one for
//                        the PCA summary; each with respStmt, revisionDesc/change
//                        status="created", a note for people and ptr to its fs
//     <joinGrp>          a join for each segment made of several elements (a speaker
//                        without a person entry: all of their speeches)
//     <linkGrp type="styleDistance">  link target="#a #b" ana="#fs" per pair written
//     <fvLib>            the fs: styleProfile (tokens, types, language, nearest segments
//                        with distances), styleDistance (measure, value, nFeatures,
//                        featureType, scaling, segments), pcaCoordinates, pcaSummary
//   plus the header entries: encodingDesc/appInfo/application and revisionDesc/change.
//
// Pairs: by default each segment of this document with its k nearest segments (k as the
// run asked, --neighbours), one link per unordered pair; with all_pairs, every pair of
// measured segments that involves a segment of this document.
// Numbers are written in the shortest form that reads back as the same double.
// Attribution and verification (standoff_attribution.cpp), for questioned segments of this
// document: an annotation ("assessing"; a verification that reached a decision
// "classifying", tei-conventions.md section 6) with a note for people, the caution as a
// second note (type "caution"), and a ptr to its fs (attributionResult: the ranked
// candidates with distances, margin and stability; verificationResult: score, band,
// decision), which carries the caution too.
// Each result kind has its own add_* function and one line in standoff().
#pragma once
#include <cstddef>
#include <functional>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "core/analysis.h"
#include "standoff/standoff_ids.h"
#include "standoff/xml_fragment.h"

namespace manicule {

struct StandoffOptions {
  bool all_pairs = false;
  bool ids_added = false;  // --add-ids: the change entry says so
  std::string who;         // change/@who; empty: our application
};

// The document being written: which segments' profiles it holds and how it points at
// any segment of the run.
struct StandoffTarget {
  std::vector<std::size_t> members;  // indices into Analysis::segments, in order
  // The segment's elements as this document points at them (e.g. "#L07",
  // "xpath(/TEI[1]/text[1]/body[1]/sp[4])", "letters.xml#L07").
  std::function<std::vector<std::string>(std::size_t)> pointers;
  // One pointer to the segment: its element, or the join of its elements.
  std::function<std::string(std::size_t)> reference;
  std::vector<SegmentIds> segment_ids;  // by segment index; members' entries are set
  // A candidate label that names a person entry ("#p-pellow") as this document points at
  // it, given the candidate's nearest segment: into an edition of the run that has the
  // entry; "" when none has it (an @ref to an entry the edition lacks) or when unset.
  std::function<std::string(const std::string&, std::size_t)> person_pointer;
  std::vector<std::string> inputs;      // "name (sha256 …)" for each edition the results point into
};

class StandoffBuilder {
 public:
  // Claims the document-level ids (standOff, application, groups) in `ids`.
  StandoffBuilder(const Analysis& analysis, const StandoffTarget& target, IdRegistry& ids, StandoffOptions options);

  XmlNode standoff() const;
  XmlNode application() const;
  XmlNode change() const;

  const std::string& standoff_id() const { return standoff_id_; }
  const std::string& application_id() const { return application_id_; }

 private:
  struct Parts {
    XmlNode annotations, joins, links, values;
  };
  void add_profiles(Parts& parts) const;
  void add_distances(Parts& parts) const;
  void add_pca(Parts& parts) const;
  void add_attributions(Parts& parts) const;
  void add_verifications(Parts& parts) const;
  bool is_member(std::size_t segment) const { return member_set_.count(segment) != 0; }

  XmlNode annotation(const std::string& id, const std::string& target, const std::string& motivation,
                     const std::string& note) const;
  XmlNode profile_values(std::size_t segment) const;
  std::string label_from_here(std::size_t segment) const;
  std::string software() const;
  std::vector<std::pair<std::size_t, std::size_t>> pairs() const;

  const Analysis& analysis_;
  const StandoffTarget& target_;
  IdRegistry& ids_;
  StandoffOptions options_;
  std::vector<long> row_of_;  // segment -> row in the distance matrix, -1 if not measured
  std::vector<long> pca_row_of_;
  std::map<std::string, int> label_count_;  // how many segments bear each label
  std::map<std::string, std::string> candidate_names_;  // candidate_names(): "#p-pellow" -> its name
  std::set<std::string> member_files_;
  std::set<std::size_t> member_set_;
  std::string standoff_id_, application_id_, annotations_id_, joins_id_, links_id_, values_id_;
  std::string distances_annotation_id_, pca_annotation_id_, pca_summary_id_;
};

// Shortest decimal form that reads back as the same double ("0.1", "1e-07", "42").
std::string format_number(double value);

}  // namespace manicule
