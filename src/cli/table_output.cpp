#include "cli/table_output.h"

namespace manicule::cli {

std::string tsv_cell(const std::string& value) {
  std::string out = value;
  for (char& c : out)
    if (c == '\t' || c == '\n' || c == '\r') c = ' ';
  return out;
}

void write_tsv_row(std::ostream& out, const std::vector<std::string>& cells) {
  for (std::size_t i = 0; i < cells.size(); ++i) out << (i ? "\t" : "") << tsv_cell(cells[i]);
  out << '\n';
}

void write_tsv_parameters(std::ostream& out, const std::vector<std::pair<std::string, std::string>>& parameters) {
  for (const auto& [key, value] : parameters) out << "# " << key << ": " << tsv_cell(value) << '\n';
}

}  // namespace manicule::cli
