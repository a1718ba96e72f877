#include "export/plot_captions.h"

#include <filesystem>

namespace manicule {

namespace {

std::string stem(const std::string& path) { return std::filesystem::path(path).stem().string(); }

}  // namespace

std::string describe_measured_segments(const Analysis& analysis) {
  std::size_t measured = 0;
  std::string unit;
  for (const auto& s : analysis.segments) {
    if (!s.measured) continue;
    ++measured;
    unit = s.unit;
  }
  const auto& inputs = analysis.provenance.inputs;
  std::string out = std::to_string(measured) + " " + (unit.empty() || unit == "whole" ? "text" : unit) + " segments of ";
  out += inputs.size() == 1 ? stem(inputs.front().path) : std::to_string(inputs.size()) + " editions";
  return out;
}

std::vector<std::string> plot_caption(const Analysis& analysis, const std::string& method) {
  const Provenance& p = analysis.provenance;
  std::size_t left_out = 0;
  for (const auto& s : analysis.segments) left_out += s.measured ? 0 : 1;
  std::vector<std::string> lines;
  std::string first = method + " \u00b7 " + p.features + ", frequency ranks " +
                      analysis.provenance.parameter("feature ranks") + " (" +
                      analysis.provenance.parameter("features used") + " used), culling " +
                      analysis.provenance.parameter("culling") + " \u00b7 minimum segment size " +
                      analysis.provenance.parameter("minimum segment size") + ": " +
                      analysis.provenance.parameter("segments measured") + " measured, " +
                      std::to_string(left_out) + " left out";
  lines.push_back(first);
  std::string inputs;
  for (std::size_t i = 0; i < p.inputs.size() && i < 6; ++i) inputs += (i ? ", " : "") + stem(p.inputs[i].path);
  if (p.inputs.size() > 6) inputs += " and " + std::to_string(p.inputs.size() - 6) + " more";
  lines.push_back("input: " + inputs + " \u00b7 tokens: " + p.tokenizer);
  lines.push_back(p.tool + " " + p.version + " \u00b7 " + p.created);
  return lines;
}

}  // namespace manicule
