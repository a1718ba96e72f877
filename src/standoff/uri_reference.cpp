#include "standoff/uri_reference.h"

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <filesystem>
#include <string_view>
#include <vector>

namespace manicule {

namespace fs = std::filesystem;

namespace {

// Keeps unreserved characters, '/' and the sub-delimiters; encodes every other byte.
std::string percent_encoded(const std::string& path) {
  std::string out;
  for (unsigned char c : path) {
    if (std::isalnum(c) || std::string_view("-._~/!$&'()*+,;=@").find(static_cast<char>(c)) != std::string_view::npos) {
      out += static_cast<char>(c);
    } else {
      char buf[4];
      std::snprintf(buf, sizeof buf, "%%%02X", c);
      out += buf;
    }
  }
  return out;
}

std::string remove_dot_segments(const std::string& path) {
  std::vector<std::string> out;
  std::size_t i = 0;
  bool absolute = !path.empty() && path[0] == '/';
  while (i <= path.size()) {
    std::size_t slash = path.find('/', i);
    if (slash == std::string::npos) slash = path.size();
    std::string segment = path.substr(i, slash - i);
    if (segment == "..") {
      if (!out.empty()) out.pop_back();
    } else if (segment != "." && !(segment.empty() && slash < path.size())) {
      out.push_back(segment);
    }
    i = slash + 1;
  }
  std::string joined = absolute ? "/" : "";
  for (std::size_t k = 0; k < out.size(); ++k) joined += (k ? "/" : "") + out[k];
  return joined;
}

}  // namespace

std::string without_fragment(const std::string& uri) { return uri.substr(0, uri.find('#')); }

std::string relative_uri(const std::string& from, const std::string& to) {
  fs::path from_dir = fs::absolute(from).lexically_normal().parent_path();
  fs::path target = fs::absolute(to).lexically_normal();
  fs::path rel = target.lexically_relative(from_dir);
  std::string raw = rel.empty() ? target.string() : rel.generic_string();
  return percent_encoded(raw);
}

std::string file_uri(const std::string& path) {
  return "file://" + percent_encoded(fs::absolute(path).lexically_normal().generic_string());
}

std::string resolve_uri(const std::string& base, const std::string& reference) {
  std::size_t colon = reference.find(':');
  std::size_t first_delim = reference.find_first_of("/?#");
  if (colon != std::string::npos && (first_delim == std::string::npos || colon < first_delim)) return reference;
  std::string base_doc = without_fragment(base);
  if (reference.empty()) return base_doc;
  if (reference[0] == '#') return base_doc + reference;
  std::size_t scheme_end = base_doc.find(':');
  std::string scheme = scheme_end == std::string::npos ? "" : base_doc.substr(0, scheme_end + 1);
  std::string rest = base_doc.substr(scheme.size());
  std::string authority;
  if (rest.rfind("//", 0) == 0) {
    std::size_t slash = rest.find('/', 2);
    authority = rest.substr(0, slash);
    rest = slash == std::string::npos ? "" : rest.substr(slash);
  }
  if (reference.rfind("//", 0) == 0) return scheme + reference;
  std::size_t hash = reference.find('#');
  std::string ref_path = reference.substr(0, hash);
  std::string fragment = hash == std::string::npos ? "" : reference.substr(hash);
  std::string path;
  if (!ref_path.empty() && ref_path[0] == '/') {
    path = ref_path;
  } else {
    std::string base_path = rest.substr(0, rest.find('?'));
    std::size_t last = base_path.rfind('/');
    path = (last == std::string::npos ? (authority.empty() ? "" : "/") : base_path.substr(0, last + 1)) + ref_path;
  }
  return scheme + authority + remove_dot_segments(path) + fragment;
}

bool is_absolute_uri_without_fragment(const std::string& uri) {
  const std::size_t colon = uri.find(':');
  const bool scheme = colon != std::string::npos && colon > 0 && std::isalpha(static_cast<unsigned char>(uri[0])) &&
                      std::all_of(uri.begin(), uri.begin() + static_cast<std::ptrdiff_t>(colon), [](char c) {
                        return std::isalnum(static_cast<unsigned char>(c)) || c == '+' || c == '-' || c == '.';
                      });
  return scheme && std::none_of(uri.begin(), uri.end(), [](char c) {
           return static_cast<unsigned char>(c) <= 0x20 || c == '<' || c == '>' || c == '"' || c == '#';
         });
}

}  // namespace manicule
