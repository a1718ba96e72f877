// `manicule segments`: what the selection picked, one row a segment, so that an editor can
// check the text before trusting any measure built on it.
#include <iostream>

#include <nlohmann/json.hpp>

#include "cli/commands.h"
#include "cli/selection_options.h"
#include "cli/table_output.h"
#include "core/corpus.h"
#include "core/error.h"
#include "core/provenance.h"
#include "core/utf8_text.h"
#include "tei/xpath_name_hint.h"

namespace manicule::cli {

namespace {

// A segment's text on one TSV line: each run of XML white space (the edition's line breaks
// and indentation) as one space, none at either end, as XPath's normalize-space() does.
// The words are those counted; the JSON output keeps the text as the edition has it.
std::string joined_text(const Segment& segment) {
  std::string text;
  for (const auto& run : segment.runs) {
    bool space = true;  // runs are separate pieces of text
    for (const char c : run.text) {
      if (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
        space = true;
        continue;
      }
      if (space && !text.empty()) text += ' ';
      space = false;
      text += c;
    }
  }
  return text;
}

std::string authorship_name(Authorship a) {
  return a == Authorship::known ? "known" : a == Authorship::conjectured ? "conjectured" : "unknown";
}

std::string join(const std::vector<std::string>& parts, const std::string& sep) {
  std::string out;
  for (const auto& p : parts) out += (out.empty() ? "" : sep) + p;
  return out;
}

}  // namespace

CommandRunner add_segments_command(CLI::App& app) {
  auto* command = app.add_subcommand("segments", "List the segments a selection finds, with token and type counts");
  auto options = std::make_shared<SelectionOptions>();
  auto format = std::make_shared<std::string>("tsv");
  auto show_text = std::make_shared<bool>(false);
  options->add_to(*command);
  command->add_option("--format", *format, "tsv or json")->check(CLI::IsMember({"tsv", "json"}))->capture_default_str();
  command->add_flag("--show-text", *show_text,
                    "also print the selected text of each segment (TSV: on one line, white space runs as one space; "
                    "JSON: as the edition has it)");
  return [=]() -> int {
    Request request = options->to_request();
    request.keep_text = *show_text;
    request.keep_counts = false;  // the table shows each segment's tokens and types only
    std::vector<std::string> files = expand_inputs(request.inputs);
    Corpus corpus = read_corpus(request, files);
    for (const auto& f : corpus.failures) std::cerr << "manicule: " << f.message << '\n';
    if (!corpus.failures.empty()) return corpus.failures.front().kind;
    if (corpus.segments.empty()) {
      throw Error(ErrorKind::nothing_selected,
                  "no " + request.unit + " segment found in " + std::to_string(files.size()) +
                      " file(s); try another --unit, or check that the edition marks them up" +
                      unprefixed_name_hint(request.unit));
    }
    if (*format == "json") {
      nlohmann::json rows = nlohmann::json::array();
      for (const auto& r : corpus.segments) {
        nlohmann::json row{{"segment", r.segment.id},          {"label", r.segment.label},
                           {"tokens", r.tokens},               {"types", r.types},
                           {"file", r.segment.file},           {"unit", r.segment.unit},
                           {"language", r.segment.language},   {"pointers", r.segment.pointers},
                           {"author", r.segment.author},       {"authorship", authorship_name(r.segment.authorship)},
                           {"date", r.segment.date},           {"warnings", r.segment.warnings}};
        if (*show_text) {
          nlohmann::json runs = nlohmann::json::array();
          for (const auto& run : r.segment.runs) runs.push_back({{"language", run.language}, {"text", run.text}});
          row["text"] = runs;
        }
        rows.push_back(row);
      }
      nlohmann::json doc{{"provenance", provenance_json(make_provenance(request, corpus))}, {"segments", rows}};
      std::cout << json_text(doc, 2) << '\n';
    } else {
      write_tsv_parameters(std::cout, provenance_pairs(make_provenance(request, corpus)));
      std::vector<std::string> header{"segment", "label", "tokens", "types", "file", "unit",
                                      "language", "pointer", "author", "authorship", "warnings", "date"};
      if (*show_text) header.push_back("text");
      write_tsv_row(std::cout, header);
      for (const auto& r : corpus.segments) {
        std::vector<std::string> row{r.segment.id, r.segment.label, std::to_string(r.tokens), std::to_string(r.types),
                                     r.segment.file, r.segment.unit, r.segment.language, join(r.segment.pointers, " "),
                                     r.segment.author, authorship_name(r.segment.authorship),
                                     join(r.segment.warnings, "; "), r.segment.date};
        if (*show_text) row.push_back(joined_text(r.segment));
        write_tsv_row(std::cout, row);
      }
    }
    return 0;
  };
}

}  // namespace manicule::cli
