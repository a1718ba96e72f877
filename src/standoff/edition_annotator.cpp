#include "standoff/edition_annotator.h"

#include <cstdio>
#include <filesystem>
#include <map>

#include "core/corpus.h"
#include "core/error.h"
#include "core/facade.h"
#include "core/provenance.h"
#include "core/sha256.h"
#include "standoff/edition_encoding.h"
#include "standoff/edition_splice.h"
#include "standoff/results_document.h"
#include "standoff/segment_ids_added.h"
#include "standoff/splice_check.h"
#include "standoff/uri_reference.h"
#include "standoff/xml_scan.h"

namespace manicule {

namespace fs = std::filesystem;

namespace {

// One edition on its way to being written (or, for a results file, only described).
struct Edition {
  const FileSnapshot* snapshot = nullptr;
  EditionText text;
  std::string clean;  // the decoded text without our earlier results
  ScannedDocument scan;
  bool ascii_only = false;
  std::vector<Insertion> id_insertions;
  std::vector<std::string> added_ids;
  IdRegistry ids;
  std::string document_path;  // where the document holding its results will be
  std::string source_sha256;  // of the edition as the results point into it
};

Edition open_edition(const FileSnapshot& snapshot, bool for_writing) {
  Edition e;
  e.snapshot = &snapshot;
  e.text = decode_edition(snapshot.bytes, snapshot.path);
  ScannedDocument first = scan_xml(e.text.text, snapshot.path);
  const std::vector<ByteRange> earlier = previous_results(first, e.text.text);
  if (earlier.empty()) {  // a first run: nothing to take out, the scan stands
    e.clean = e.text.text;
    e.scan = std::move(first);
  } else {
    e.clean = without_ranges(e.text.text, earlier);
    e.scan = scan_xml(e.clean, snapshot.path);
  }
  if (for_writing) e.ascii_only = needs_ascii_insertions(e.scan.declared_encoding, e.text.form, snapshot.path);
  e.ids = IdRegistry(e.scan.xml_ids);
  return e;
}

// --who's pointers that name an xml:id of this document ("#ed"): each must be there, else the
// change written would point at nothing (a schema does not check that). A results file of
// its own holds no person entry: there a pointer into an edition is "edition.xml#ed".
void check_who_pointers(const std::string& who, const Edition& e, bool separate, const std::string& results_file) {
  std::size_t start = 0;
  while (start < who.size()) {
    const std::size_t space = who.find_first_of(" \t\r\n", start);
    const std::string pointer = who.substr(start, space == std::string::npos ? std::string::npos : space - start);
    start = space == std::string::npos ? who.size() : space + 1;
    if (pointer.empty() || pointer.front() != '#') continue;
    // Ours (#mcl-app, the default, written again by this run) and TEI's XPointer form
    // (#xpath(...)) are not ids of the edition as read.
    if (pointer.rfind("#" + std::string(kOurIdPrefix), 0) == 0 || pointer.rfind("#xpath(", 0) == 0) continue;
    if (separate)
      throw Error(ErrorKind::usage, "--who " + pointer + " points into the results file, which holds no person entry: "
                                    "write the edition's file before it, as the results file reaches it (" +
                                    relative_uri(results_file, e.snapshot->path) + pointer + ")");
    if (!e.scan.xml_ids.count(pointer.substr(1)))
      throw Error(ErrorKind::usage, "--who " + pointer + " names no xml:id in this edition: point at the entry of the "
                                    "person responsible (a person or persName with that xml:id), or give a URI",
                  e.snapshot->path);
  }
}

// "#id" -> "id"; "xpath(...)" stays: a TEI pointer is an XPointer, so it is written as a
// fragment ("#xpath(...)", "edition.xml#xpath(...)"), as SATS (17.2.4) does.
std::string strip_hash(const std::string& pointer) {
  return !pointer.empty() && pointer[0] == '#' ? pointer.substr(1) : pointer;
}

void check_analysed_bytes(const Analysis& analysis, const FileSnapshot& snapshot) {
  for (const auto& in : analysis.provenance.inputs) {
    if (in.path == snapshot.path && !in.sha256.empty() && in.sha256 != snapshot.sha256)
      throw Error(ErrorKind::changed_on_disk, "the file changed while it was being analysed; nothing was written. "
                                              "Run again.", snapshot.path);
  }
}

// No segment reaches the minimum size: the profiles still say how long each one is.
Analysis counts_only(const Request& request, const Corpus& corpus, const std::string& why) {
  Analysis analysis;
  analysis.provenance = make_provenance(request, corpus);
  analysis.segments = summarise_segments(corpus);
  const std::string minimum = std::to_string(request.feature_space.min_segment_tokens);
  for (SegmentSummary& s : analysis.segments)
    s.excluded_reason = std::to_string(s.tokens) + " words, fewer than the minimum of " + minimum;
  record_feature_parameters(request, 0, 0, analysis.provenance);
  analysis.notes.push_back("only counts written, no comparison: " + why + " (lower it with --min-tokens)");
  return analysis;
}

}  // namespace

Analysis analyse_for_standoff(const Request& request, const std::vector<std::string>& files) {
  Corpus corpus = read_corpus(request, files);
  throw_first_failure(corpus);
  try {
    return analyse_corpus(request, corpus);
  } catch (const Error& e) {
    if (e.kind() != ErrorKind::nothing_selected || !request.compute_distances || corpus.segments.empty()) throw;
    Request profiles_only = request;
    profiles_only.compute_distances = false;
    profiles_only.compute_pca = false;
    try {
      Analysis analysis = analyse_corpus(profiles_only, corpus);
      analysis.notes.push_back(std::string("no distances written: ") + e.what());
      return analysis;
    } catch (const Error& none_long_enough) {
      if (none_long_enough.kind() != ErrorKind::nothing_selected) throw;
      return counts_only(request, corpus, none_long_enough.what());
    }
  }
}

std::vector<PreparedOutput> prepare_annotation(Analysis& analysis, const std::vector<FileSnapshot>& editions,
                                               const AnnotateSettings& settings) {
  const bool separate = settings.mode == AnnotateMode::standoff_file;
  if (settings.mode == AnnotateMode::output && editions.size() != 1)
    throw Error(ErrorKind::usage, "--output writes one annotated edition; give one input file, or use --in-place");
  if (separate && settings.add_ids)
    throw Error(ErrorKind::usage, "--add-ids changes the edition, which --standoff-file promises not to touch");
  if (settings.mode != AnnotateMode::in_place && settings.output.empty())
    throw Error(ErrorKind::usage, "no output file given");
  if (separate) refuse_foreign_results_file(settings.output);
  if (settings.mode == AnnotateMode::output) {
    std::error_code ec;
    if (fs::exists(settings.output, ec) && fs::equivalent(settings.output, editions.front().path, ec))
      throw Error(ErrorKind::usage, "--output names the input itself; use --in-place to change it");
  }

  std::vector<Edition> open;
  std::map<std::string, std::size_t> edition_of_file;
  for (const FileSnapshot& snapshot : editions) {
    check_analysed_bytes(analysis, snapshot);
    open.push_back(open_edition(snapshot, !separate));
    Edition& e = open.back();
    check_who_pointers(settings.standoff.who, e, separate, settings.output);
    e.document_path = separate ? settings.output
                      : settings.mode == AnnotateMode::output ? settings.output
                                                             : snapshot.path;
    edition_of_file[snapshot.path] = open.size() - 1;
  }
  // Segments of files that are read but not written into (impostor texts of a
  // verification) have no edition: nothing is written about them, and a pointer to one
  // names its file.
  constexpr std::size_t kNoEdition = static_cast<std::size_t>(-1);
  std::vector<std::size_t> edition_of(analysis.segments.size(), kNoEdition);
  for (std::size_t s = 0; s < analysis.segments.size(); ++s) {
    auto it = edition_of_file.find(analysis.segments[s].file);
    if (it != edition_of_file.end()) edition_of[s] = it->second;
  }
  // Each edition's segments, in the analysis' order (listed once: over an archive of
  // editions, a scan of every segment for each edition grew with the square of their number).
  std::vector<std::vector<std::size_t>> members_of(open.size());
  for (std::size_t s = 0; s < edition_of.size(); ++s)
    if (edition_of[s] != kNoEdition) members_of[edition_of[s]].push_back(s);

  if (settings.add_ids) {
    for (std::size_t k = 0; k < open.size(); ++k) {
      AddedIds given = give_segments_ids(analysis, members_of[k], open[k].scan, open[k].ids, open[k].snapshot->path);
      open[k].id_insertions = std::move(given.insertions);
      open[k].added_ids = std::move(given.ids);
    }
  }
  for (Edition& e : open)
    e.source_sha256 = sha256_hex(encode_edition(e.text, with_insertions(e.clean, e.id_insertions)));

  // Segment ids: claimed in the registry of the document that will hold the segment.
  IdRegistry results_ids;
  std::vector<SegmentIds> segment_ids(analysis.segments.size());
  for (std::size_t s = 0; s < analysis.segments.size(); ++s)
    if (edition_of[s] != kNoEdition)
      segment_ids[s] = claim_segment_ids(separate ? results_ids : open[edition_of[s]].ids, analysis.segments[s].local_id);

  auto pointers_from = [&](const std::string& document) {
    return [&, document](std::size_t s) {
      // A file read but not written into is always named; an edition is not, from itself.
      const bool edition = edition_of[s] != kNoEdition;
      const std::string& file = edition ? open[edition_of[s]].snapshot->path : analysis.segments[s].file;
      const bool same = edition && !separate && open[edition_of[s]].document_path == document;
      std::vector<std::string> out;
      for (const auto& p : analysis.segments[s].pointers)
        out.push_back((same ? "" : relative_uri(document, file)) + "#" + strip_hash(p));
      return out;
    };
  };
  auto reference_from = [&](const std::string& document) {
    return [&, document](std::size_t s) {
      std::vector<std::string> p = pointers_from(document)(s);
      if (p.size() == 1) return p.front();
      if (edition_of[s] == kNoEdition) {
        std::string all;
        for (const auto& one : p) {
          if (!all.empty()) all += ' ';
          all += one;
        }
        return all;
      }
      const Edition& e = open[edition_of[s]];
      if (separate || e.document_path == document) return "#" + segment_ids[s].join;
      return relative_uri(document, e.document_path) + "#" + segment_ids[s].join;
    };
  };
  // A person entry ("#p-pellow") as `document` (the edition `self`, or kNone for a results
  // file) points at it: in itself if it has the entry, else in the edition of the
  // candidate's nearest segment, else in the first edition that has it; "" when none has
  // (an @ref may name an entry its edition lacks; files read but not written into are not
  // scanned). Editions are pointed at where their elements are, as segments are.
  constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  // A label "brink#p1" (a sender id that names different people in different files, told
  // apart by file: segment_roles.cpp; a speaker "play#anna") points into the edition of
  // that file alone, found by its segments' id prefix. (The id is all after the last '#':
  // an xml:id holds none, a file's name may.)
  std::map<std::string, std::size_t> edition_of_prefix;
  for (std::size_t s = 0; s < analysis.segments.size(); ++s)
    if (edition_of[s] != kNoEdition) edition_of_prefix.emplace(analysis.segments[s].id_prefix(), edition_of[s]);
  auto person_pointer_from = [&](const std::string& document, std::size_t self) {
    return [&, document, self](const std::string& label, std::size_t nearest) -> std::string {
      const std::size_t hash = label.rfind('#');
      const std::string id = label.substr(hash + 1);
      const auto has = [&](std::size_t k) { return k != kNone && k < open.size() && open[k].scan.xml_ids.count(id); };
      if (hash > 0) {
        const auto prefixed = edition_of_prefix.find(label.substr(0, hash));
        const std::size_t holder = prefixed != edition_of_prefix.end() ? prefixed->second : kNone;
        if (!has(holder)) return "";
        return holder == self ? "#" + id : relative_uri(document, open[holder].snapshot->path) + "#" + id;
      }
      if (has(self)) return "#" + id;
      std::size_t holder = has(edition_of[nearest]) ? edition_of[nearest] : kNone;
      for (std::size_t k = 0; holder == kNone && k < open.size(); ++k)
        if (has(k)) holder = k;
      if (holder == kNone) return "";
      return relative_uri(document, open[holder].snapshot->path) + "#" + id;
    };
  };
  // Each edition the results point into, as seen from `document`; the edition written
  // (`self`, an index into `open`) is "this document": its results point at its own ids,
  // and a path to its source (another file when --output copies it) would name the wrong one.
  auto inputs_from = [&](const std::string& document, std::size_t self) {
    std::vector<std::string> out;
    for (std::size_t k = 0; k < open.size(); ++k) {
      const Edition& e = open[k];
      if (members_of[k].empty()) continue;  // nothing of it selected
      out.push_back((k == self ? std::string("this document") : relative_uri(document, e.snapshot->path)) +
                    " (SHA-256 " + e.source_sha256 + (separate ? "" : ", without manicule's additions") + ")");
    }
    return out;
  };

  std::vector<PreparedOutput> outputs;
  if (separate) {
    StandoffTarget target;
    for (std::size_t s = 0; s < analysis.segments.size(); ++s)
      if (edition_of[s] != kNoEdition) target.members.push_back(s);
    target.pointers = pointers_from(settings.output);
    target.reference = reference_from(settings.output);
    target.segment_ids = segment_ids;
    target.person_pointer = person_pointer_from(settings.output, kNone);
    target.inputs = inputs_from(settings.output, kNone);
    StandoffBuilder builder(analysis, target, results_ids, settings.standoff);
    PreparedOutput out;
    out.path = settings.output;
    out.bytes = results_document(builder, analysis, target.inputs);
    outputs.push_back(std::move(out));
    return outputs;
  }

  for (std::size_t k = 0; k < open.size(); ++k) {
    Edition& e = open[k];
    StandoffTarget target;
    target.members = members_of[k];
    if (target.members.empty()) {
      // Nothing of it was selected (a play among letters): an empty listAnnotation would
      // not even be valid TEI, and there is nothing to say about this edition.
      PreparedOutput out;
      out.path = e.document_path;
      out.left_as_it_was = true;
      out.notes.push_back("no segment of this unit in it: left as it was");
      outputs.push_back(std::move(out));
      continue;
    }
    target.pointers = pointers_from(e.document_path);
    target.reference = reference_from(e.document_path);
    target.segment_ids = segment_ids;
    target.person_pointer = person_pointer_from(e.document_path, k);
    target.inputs = inputs_from(e.document_path, k);
    StandoffBuilder builder(analysis, target, e.ids, settings.standoff);
    SpliceFragments fragments{builder.standoff(), builder.application(), builder.change(),
                              e.ids.claim(std::string(kOurIdPrefix) + "encodingDesc"),
                              e.ids.claim(std::string(kOurIdPrefix) + "appInfo"),
                              e.ids.claim(std::string(kOurIdPrefix) + "revisionDesc")};
    SplicePlan plan;
    try {
      plan = plan_splice(e.scan, e.clean, fragments, e.ascii_only);
    } catch (const Error& error) {
      if (!error.file().empty()) throw;
      throw Error(error.kind(), std::string(error.what()) + "; nothing was written", e.snapshot->path);
    }
    std::vector<Insertion> all = e.id_insertions;
    all.insert(all.end(), plan.insertions.begin(), plan.insertions.end());
    PreparedOutput out;
    out.path = e.document_path;
    out.bytes = encode_edition(e.text, with_insertions(e.clean, all));
    out.replacing = settings.mode == AnnotateMode::in_place ? e.snapshot : nullptr;
    out.notes = plan.notes;
    out.ids_added = e.id_insertions.size();
    SpliceExpectations expected;
    expected.standoff_id = builder.standoff_id();
    for (const auto& i : plan.insertions) {
      if (i.kind == "application") expected.application_id = builder.application_id();
      if (i.kind == "change") expected.change = true;
    }
    expected.added_ids = e.added_ids;
    check_spliced(out.bytes, e.snapshot->path, expected);
    outputs.push_back(std::move(out));
  }
  return outputs;
}

void write_prepared(const PreparedOutput& output, const AnnotateSettings& settings) {
  if (settings.mode == AnnotateMode::standoff_file) refuse_foreign_results_file(output.path);
  WriteOptions options;
  options.replacing = output.replacing;
  options.backup = settings.backup && output.replacing;
  write_file_safely(output.path, output.bytes, options);
}

}  // namespace manicule
