// Writing attribution results: JSON (everything, with provenance and segments) and TSV
// (one table under the "# key: value" header). Every attribute and verify output, in
// either format, carries the caution of attribution_result.h; evaluate's does too.
#pragma once
#include <ostream>
#include <string>

#include <nlohmann/json.hpp>

#include "core/analysis.h"

namespace manicule::cli {

nlohmann::json attributions_json(const Analysis& analysis, std::size_t top);
void write_attributions_tsv(std::ostream& out, const Analysis& analysis, std::size_t top);

nlohmann::json verifications_json(const Analysis& analysis);
void write_verifications_tsv(std::ostream& out, const Analysis& analysis);

nlohmann::json evaluation_json(const Analysis& analysis);
// table: predictions, candidates, confusion, rules or verification.
void write_evaluation_tsv(std::ostream& out, const Analysis& analysis, const std::string& table);

}  // namespace manicule::cli
