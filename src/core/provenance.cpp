#include "core/provenance.h"

#include <cstdlib>
#include <ctime>

#include "manicule_version.h"

namespace manicule {

std::string Provenance::parameter(const std::string& key) const {
  for (const auto& [k, v] : parameters)
    if (k == key) return v;
  return "";
}

std::string current_time_iso8601() {
  std::time_t now = std::time(nullptr);
  if (const char* epoch = std::getenv("SOURCE_DATE_EPOCH")) {
    char* end = nullptr;
    long long v = std::strtoll(epoch, &end, 10);
    if (end && *end == '\0' && end != epoch) now = static_cast<std::time_t>(v);
  }
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

std::string describe_tokenizer(const TokenizerOptions& o) {
  std::string out = "UAX #29 word breaks (ICU), NFC, invisible characters dropped";
  out += o.case_fold ? ", full case folding" : ", case kept";
  out += o.keep_numbers ? ", numbers kept" : ", numbers dropped";
  out += o.keep_punctuation ? ", punctuation kept" : ", punctuation dropped";
  if (o.apostrophes) out += ", apostrophe variants folded";
  if (o.long_s) out += ", long s as s";
  if (o.ligatures) out += ", ligatures split";
  return out;
}

Provenance make_provenance(const Request& request, const Corpus& corpus) {
  Provenance p;
  p.version = MANICULE_VERSION_STRING;
  p.created = current_time_iso8601();
  p.selection = request.selection_rules().describe();
  p.tokenizer = describe_tokenizer(request.tokenizer);
  p.features = describe(request.features);
  for (std::size_t i = 0; i < corpus.files.size(); ++i)
    p.inputs.push_back(InputFile{corpus.files[i], i < corpus.file_sha256.size() ? corpus.file_sha256[i] : ""});
  return p;
}

nlohmann::json provenance_json(const Provenance& p) {
  nlohmann::json inputs = nlohmann::json::array();
  for (const auto& in : p.inputs) inputs.push_back({{"path", in.path}, {"sha256", in.sha256}});
  nlohmann::json params = nlohmann::json::object();
  for (const auto& [k, v] : p.parameters) params[k] = v;
  return {{"tool", p.tool}, {"version", p.version}, {"created", p.created}, {"selection", p.selection},
          {"tokenizer", p.tokenizer}, {"features", p.features}, {"inputs", inputs}, {"parameters", params}};
}

std::vector<std::pair<std::string, std::string>> provenance_pairs(const Provenance& p) {
  std::vector<std::pair<std::string, std::string>> out{
      {"tool", p.tool + " " + p.version}, {"created", p.created}, {"selection", p.selection},
      {"tokenizer", p.tokenizer}, {"features", p.features}};
  for (const auto& [k, v] : p.parameters) out.emplace_back(k, v);
  for (const auto& in : p.inputs) out.emplace_back("input", in.path + " sha256:" + in.sha256);
  return out;
}

}  // namespace manicule
