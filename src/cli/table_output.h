// Writing tables for people and programs: TSV with cells made safe (tabs and line breaks
// become spaces) and a comment header recording the parameters of the run.
#pragma once
#include <ostream>
#include <string>
#include <vector>

namespace manicule::cli {

std::string tsv_cell(const std::string& value);
void write_tsv_row(std::ostream& out, const std::vector<std::string>& cells);
// "# key: value" lines that tools reading TSV with comment="#" skip.
void write_tsv_parameters(std::ostream& out, const std::vector<std::pair<std::string, std::string>>& parameters);

}  // namespace manicule::cli
