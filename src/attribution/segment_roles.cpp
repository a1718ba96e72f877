#include "attribution/segment_roles.h"

#include <algorithm>
#include <map>
#include <set>

#include "core/error.h"
#include "text/caseless_match.h"

namespace manicule {

namespace {

// A name as compared between files, so that one person written alike but for letter case,
// spacing or a closing full stop is one name: "Änne Brink", "ÄNNE BRINK" and "Änne  Brink."
// (and "Änne" composed or decomposed) are one. Its code points in NFC, case-folded in any
// script (text/caseless_match.h); white space runs (XML's, and the no-break spaces) made one
// space; the brackets and question marks an editor queries a name with left out ("[Anna
// Brink?]" is Anna Brink conjectured, as the reader keys it); and the full stops, commas,
// colons and semicolons that end it dropped.
std::u32string name_key(const std::string& name) {
  std::u32string out;
  for (char32_t c : caseless_code_points(name)) {
    if (c == U'[' || c == U']' || c == U'?') continue;
    const bool space = c == U' ' || c == U'\t' || c == U'\n' || c == U'\r' || c == 0xA0 || c == 0x202F;
    if (space) {
      if (!out.empty() && out.back() != U' ') out += U' ';
    } else {
      out += c;
    }
  }
  const auto ends_name = [](char32_t c) { return c == U' ' || c == U'.' || c == U',' || c == U';' || c == U':'; };
  while (!out.empty() && ends_name(out.back())) out.pop_back();
  return out;
}

// A letter's sender given as a pointer into its own file ("#p1") names a person of that
// file's header, and an xml:id is unique in its document alone (W3C xml:id 1.0): two
// files may give one id to two people. For such a sender whose names differ between
// files, each name is a candidate of its own, labelled by the first file (by stem, in
// byte order) that gives it: "brink#p1" (as speakers are). A name the same in every file
// is one person. The names are those of the letters the edition is sure of; a conjectured
// one takes the label of its name among them, else its own file's.
// Returns segment index -> label for the segments concerned, and a warning for each sender.
std::map<std::size_t, std::string> senders_named_apart(const std::vector<SegmentSummary>& segments,
                                                       std::vector<std::string>& warnings) {
  struct Name {
    std::string shown;             // as the first file writes it
    std::set<std::string> files;   // stems, in order
  };
  std::map<std::string, std::map<std::u32string, Name>> names;  // sender -> name key -> name
  const auto local_sender = [](const SegmentSummary& s) {
    return s.unit == "letter" && s.author.size() > 1 && s.author[0] == '#';
  };
  for (const SegmentSummary& s : segments) {
    if (!local_sender(s) || s.authorship != Authorship::known) continue;
    Name& name = names[s.author][name_key(s.label)];
    if (name.files.empty()) name.shown = s.label;
    name.files.insert(s.id_prefix());
  }
  std::map<std::size_t, std::string> labels;
  for (const auto& [sender, by_name] : names) {
    std::set<std::string> files;
    for (const auto& [key, name] : by_name) files.insert(name.files.begin(), name.files.end());
    if (by_name.size() < 2 || files.size() < 2) continue;
    std::string said;
    for (const auto& [key, name] : by_name)
      said += (said.empty() ? "" : "; ") + (name.shown.empty() ? std::string("no name") : "'" + name.shown + "'") +
              " in " + *name.files.begin() +
              (name.files.size() > 1 ? " and " + std::to_string(name.files.size() - 1) + " more file(s)" : "") +
              ": " + *name.files.begin() + sender;
    warnings.push_back("sender " + sender + " names different people in different files, each a candidate of its own (" +
                       said + ")");
    for (std::size_t i = 0; i < segments.size(); ++i) {
      if (!local_sender(segments[i]) || segments[i].author != sender) continue;
      const auto named = by_name.find(name_key(segments[i].label));
      labels[i] = (named != by_name.end() ? *named->second.files.begin() : segments[i].id_prefix()) + sender;
    }
  }
  return labels;
}

std::string edition_label(const SegmentSummary& s) {
  if (s.author.empty()) return {};
  return s.unit == "speaker" ? s.id_prefix() + "#" + s.author : s.author;
}

}  // namespace

std::vector<std::size_t> SegmentRoles::with_role(SegmentRole r) const {
  std::vector<std::size_t> out;
  for (std::size_t i = 0; i < role.size(); ++i)
    if (role[i] == r) out.push_back(i);
  return out;
}

SegmentRoles assign_roles(const Analysis& analysis, const AttributionOptions& options) {
  const std::size_t n = analysis.segments.size();
  SegmentRoles roles;
  roles.labels_option = options.labels_option;
  roles.role.assign(n, SegmentRole::unmeasured);
  roles.label.assign(n, "");
  roles.conjecture.assign(n, "");
  roles.table_row.assign(n, std::string::npos);
  for (std::size_t r = 0; r < analysis.table_rows.size(); ++r) roles.table_row[analysis.table_rows[r]] = r;

  // Edition labels first, then the labels file over them.
  const std::map<std::size_t, std::string> senders_apart = senders_named_apart(analysis.segments, roles.warnings);
  const auto edition_label_of = [&](std::size_t i) {
    const auto apart = senders_apart.find(i);
    return apart != senders_apart.end() ? apart->second : edition_label(analysis.segments[i]);
  };
  std::vector<std::string> label(n);
  std::vector<bool> questioned(n, true);
  for (std::size_t i = 0; i < n; ++i) {
    const SegmentSummary& s = analysis.segments[i];
    if (s.authorship == Authorship::known && !s.author.empty()) {
      label[i] = edition_label_of(i);
      questioned[i] = false;
    } else if (s.authorship == Authorship::conjectured) {
      roles.conjecture[i] = edition_label_of(i);
    }
  }
  std::map<std::string, std::size_t> index;
  for (std::size_t i = 0; i < n; ++i) index.emplace(analysis.segments[i].id, i);
  std::vector<const LabelOverride*> unknown;
  for (const auto& o : options.labels) {
    auto it = index.find(o.segment);
    if (it == index.end()) {
      unknown.push_back(&o);
      continue;
    }
    label[it->second] = o.label;
    questioned[it->second] = o.label.empty();
  }
  if (!unknown.empty()) {
    std::string names;
    for (std::size_t k = 0; k < unknown.size() && k < 5; ++k)
      names += (k ? ", '" : "'") + unknown[k]->segment + "'";
    if (unknown.size() > 5) names += " and " + std::to_string(unknown.size() - 5) + " more";
    throw Error(ErrorKind::bad_input,
                std::to_string(unknown.size()) + " labelled segment(s) not found in this run: " + names +
                    " (`manicule segments` lists the ids of the run, with the same --unit)",
                unknown.front()->source, static_cast<long>(unknown.front()->line));
  }

  const std::set<std::string> impostor_files(options.impostor_files.begin(), options.impostor_files.end());
  std::map<std::string, std::pair<std::size_t, std::size_t>> unmeasured_sizes;  // label -> (segments, largest)
  std::set<std::string> measured_candidates;
  std::string short_questioned;  // the first few, named
  for (std::size_t i = 0; i < n; ++i) {
    const SegmentSummary& s = analysis.segments[i];
    const bool measured = roles.table_row[i] != std::string::npos;
    if (impostor_files.count(s.file)) {
      if (measured) roles.role[i] = SegmentRole::impostor;
      continue;
    }
    if (!measured) {
      if (!questioned[i]) {
        auto& [count, largest] = unmeasured_sizes[label[i]];
        ++count;
        largest = std::max(largest, s.tokens);
      } else {
        ++roles.questioned_too_short;
        roles.largest_too_short = std::max(roles.largest_too_short, s.tokens);
        if (roles.questioned_too_short <= 5)
          short_questioned += (short_questioned.empty() ? "" : ", ") + s.id + " (" + std::to_string(s.tokens) + " words)";
      }
      continue;
    }
    if (questioned[i]) {
      roles.role[i] = SegmentRole::questioned;
    } else {
      roles.role[i] = SegmentRole::known;
      roles.label[i] = label[i];
      measured_candidates.insert(label[i]);
    }
  }
  roles.candidates.assign(measured_candidates.begin(), measured_candidates.end());
  // Named, as a question left unanswered should be: the count of segments left out does not
  // say which of them were asked about. (With none measured, require_questioned says so.)
  if (roles.questioned_too_short > 0 && !roles.with_role(SegmentRole::questioned).empty())
    roles.warnings.push_back(std::to_string(roles.questioned_too_short) +
                             " questioned segment(s) left out, shorter than the minimum size: " + short_questioned +
                             (roles.questioned_too_short > 5 ? " and more" : "") + "; lower --min-tokens to ask of them");
  for (const auto& [name, sizes] : unmeasured_sizes) {
    if (measured_candidates.count(name)) continue;
    roles.warnings.push_back("candidate '" + name + "' left out: none of its " + std::to_string(sizes.first) +
                             " segment(s) reaches the minimum size (the largest has " +
                             std::to_string(sizes.second) + " words)");
  }
  return roles;
}

void require_questioned(const SegmentRoles& roles) {
  if (!roles.with_role(SegmentRole::questioned).empty()) return;
  if (roles.questioned_too_short > 0)
    throw Error(ErrorKind::nothing_selected,
                std::to_string(roles.questioned_too_short) +
                    " questioned segment(s), all shorter than the minimum size (the largest has " +
                    std::to_string(roles.largest_too_short) + " words; lower it with --min-tokens)");
  throw Error(ErrorKind::nothing_selected,
              std::string("no questioned segment: every measured segment has a known author ") +
                  (roles.labels_option ? "(give a segment an empty label in --labels, e.g. 'file#id,', to question it)"
                                       : "(a segment is questioned where the edition names no author for it, or "
                                         "only a conjectured one)"));
}

std::string SegmentRoles::how_to_label_known() const {
  return labels_option ? "label known segments in the edition or with --labels, or lower --min-tokens"
                       : "candidates are the authors the edition names for its segments; lower --min-tokens to "
                         "measure shorter ones";
}

std::size_t CandidateSet::index_of(const std::string& name) const {
  auto it = std::lower_bound(names.begin(), names.end(), name);
  return it != names.end() && *it == name ? static_cast<std::size_t>(it - names.begin()) : std::string::npos;
}

CandidateSet collect_candidates(const Analysis& analysis, const SegmentRoles& roles) {
  CandidateSet set;
  set.names = roles.candidates;
  set.rows.resize(set.names.size());
  set.segments.resize(set.names.size());
  set.words.assign(set.names.size(), 0);
  for (std::size_t i = 0; i < roles.role.size(); ++i) {
    if (roles.role[i] != SegmentRole::known) continue;
    const std::size_t c = set.index_of(roles.label[i]);
    set.rows[c].push_back(roles.table_row[i]);
    set.segments[c].push_back(i);
    set.words[c] += analysis.segments[i].tokens;
  }
  return set;
}

}  // namespace manicule
