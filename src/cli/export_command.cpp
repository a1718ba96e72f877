// `manicule export`: the results stored in an annotated edition (or a results file) in
// another format, without recomputing. Formats: webanno (W3C Web Annotation JSON-LD,
// src/export/web_annotation.h).
#include <iostream>

#include "cli/commands.h"
#include "cli/measure_output.h"
#include "cli/text_checks.h"
#include "core/error.h"
#include "core/provenance.h"
#include "core/utf8_text.h"
#include "export/web_annotation.h"
#include "standoff/stored_results.h"
#include "standoff/uri_reference.h"

namespace manicule::cli {


CommandRunner add_export_command(CLI::App& app) {
  auto* command = app.add_subcommand("export", "Write the results stored in an annotated edition in another format");
  auto file = std::make_shared<std::string>();
  auto format = std::make_shared<std::string>("webanno");
  auto base = std::make_shared<std::string>();
  auto output = std::make_shared<std::string>();
  command->add_option("file", *file, "an edition annotated by manicule, or a results file (--standoff-file)")
      ->required();
  command->add_option("--format", *format, "webanno: W3C Web Annotation JSON-LD")
      ->check(CLI::IsMember({"webanno"}))
      ->capture_default_str();
  command->add_option("--base-uri", *base,
                      "the URI the file is published at, e.g. https://example.org/edition.xml "
                      "(default: its file: URI)")
      ->check(not_blank());
  command->add_option("--output,-o", *output, "write to this file (default: standard output)");
  return [=]() -> int {
    if (*format != "webanno") throw Error(ErrorKind::usage, "unknown export format " + *format);
    // The annotations' ids are made from it, and the Web Annotation model wants IRIs.
    if (!base->empty() && !is_absolute_uri_without_fragment(*base))
      throw Error(ErrorKind::usage, "--base-uri '" + *base + "' is not an absolute URI without a fragment, such as "
                                    "https://example.org/edition.xml (spaces written %20)");
    refuse_output_over_input(*output, {*file});
    StoredResults results = read_stored_results(*file);
    std::string uri = base->empty() ? file_uri(*file) : *base;
    auto doc = web_annotations(results, uri, current_time_iso8601());
    write_output(*output, [&](std::ostream& out) { out << json_text(doc, 2) << '\n'; });
    return 0;
  };
}

}  // namespace manicule::cli
