#include "standoff/standoff_ids.h"

#include <cctype>

#include "standoff/edition_splice.h"

namespace manicule {

std::string IdRegistry::claim(const std::string& wanted) {
  std::string id = wanted;
  for (int n = 2; taken_.count(id); ++n) id = wanted + "-" + std::to_string(n);
  taken_.insert(id);
  return id;
}

std::string id_key(const std::string& text) {
  std::string out;
  for (unsigned char c : text) {
    bool keep = std::isalnum(c) || c == '.' || c == '-' || c == '_';
    char ch = keep ? static_cast<char>(c) : '_';
    if (ch == '_' && !out.empty() && out.back() == '_') continue;
    out += ch;
  }
  while (!out.empty() && out.back() == '_') out.pop_back();
  if (out.empty()) out = "segment";
  return out;
}

bool is_ascii_ncname(const std::string& id) {
  if (id.empty()) return false;
  auto first = static_cast<unsigned char>(id[0]);
  if (!(std::isalpha(first) || first == '_')) return false;
  for (unsigned char c : id)
    if (!(std::isalnum(c) || c == '.' || c == '-' || c == '_')) return false;
  return true;
}

SegmentIds claim_segment_ids(IdRegistry& ids, const std::string& local_id) {
  const std::string prefix(kOurIdPrefix);
  SegmentIds s;
  s.key = id_key(local_id);
  s.annotation = ids.claim(prefix + "ann-" + s.key);
  s.profile = ids.claim(prefix + "prof-" + s.key);
  s.join = ids.claim(prefix + "seg-" + s.key);
  s.pca = ids.claim(prefix + "pca-" + s.key);
  return s;
}

}  // namespace manicule
