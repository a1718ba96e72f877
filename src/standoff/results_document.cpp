#include "standoff/results_document.h"

#include <filesystem>

#include "core/error.h"
#include "standoff/edition_splice.h"
#include "standoff/safe_file.h"
#include "standoff/xml_scan.h"
#include "tei/xml_events.h"

namespace manicule {

std::string results_document(const StandoffBuilder& builder, const Analysis& analysis,
                             const std::vector<std::string>& inputs) {
  std::string names;
  for (const auto& in : inputs) names += (names.empty() ? "" : "; ") + in.substr(0, in.find(' '));
  XmlNode tei = XmlNode::element("TEI", {{"xmlns", std::string(kTeiNamespace)}, {"xml:lang", "en"}});
  XmlNode& header = tei.add(XmlNode::element("teiHeader"));
  XmlNode& file_desc = header.add(XmlNode::element("fileDesc"));
  file_desc.add(XmlNode::element("titleStmt")).add_text_element("title", "Stylometric results for " + names);
  file_desc.add(XmlNode::element("publicationStmt"))
      .add_text_element("p", "Written by " + analysis.provenance.tool + " " + analysis.provenance.version +
                                 ". These results point into the editions named below and are not part of them.");
  XmlNode& source = file_desc.add(XmlNode::element("sourceDesc"));
  for (const auto& in : inputs) {
    XmlNode& p = source.add(XmlNode::element("p"));
    p.add(XmlNode::text_node("Computed from "));
    std::string uri = in.substr(0, in.find(' '));
    p.add_text_element("ref", uri, {{"target", uri}});
    p.add(XmlNode::text_node(in.substr(uri.size())));
    p.add(XmlNode::text_node("."));
  }
  header.add(XmlNode::element("encodingDesc")).add(XmlNode::element("appInfo")).add(builder.application());
  header.add(XmlNode::element("revisionDesc")).add(builder.change());
  tei.add(builder.standoff());
  return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + serialise(tei, XmlStyle{}, "") + "\n";
}

void refuse_foreign_results_file(const std::string& path) {
  std::error_code ec;
  if (!std::filesystem::exists(path, ec)) return;
  // A pipe or a device (/dev/stdout) holds no file to overwrite, and reading one could wait
  // for ever: the results are written through it (safe_file.h).
  if (!std::filesystem::is_regular_file(path, ec) && !std::filesystem::is_directory(path, ec)) return;
  bool ours = false;
  try {
    FileSnapshot existing = take_snapshot(path);
    ScannedDocument doc = scan_xml(existing.bytes, path);
    bool has_text = doc.first_child_named(0, "text") >= 0;
    bool has_our_standoff = false;
    for (int c : doc.root().children)
      if (is_our_standoff(doc.elements[static_cast<std::size_t>(c)])) has_our_standoff = true;
    ours = has_our_standoff && !has_text;
  } catch (const Error&) {
    ours = false;
  }
  if (!ours)
    throw Error(ErrorKind::usage, "this file exists and is not a results file written by manicule; it is left alone "
                                  "(choose another name for --standoff-file)", path);
}

}  // namespace manicule
