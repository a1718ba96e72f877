#include "store/store_vocabulary.h"

#include <algorithm>

#include "core/error.h"

namespace manicule::store {

namespace {

// Forms a block at the most: a file brings a few hundred new forms, a merge or a first
// file many thousands; a bound keeps any one row to a few hundred kilobytes.
constexpr std::size_t kFormsPerBlock = 16384;

int hex_value(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

}  // namespace

std::string encode_form_block(const Vocabulary& forms, std::size_t first, std::size_t end) {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out = "[";
  for (std::size_t id = first; id < end; ++id) {
    if (id > first) out += ',';
    out += '"';
    for (const char c : forms.form(static_cast<FeatureId>(id))) {
      const auto byte = static_cast<unsigned char>(c);
      if (c == '"' || c == '\\') {
        out += '\\';
        out += c;
      } else if (byte < 0x20) {
        out += "\\u00";
        out += kHex[byte >> 4];
        out += kHex[byte & 0xF];
      } else {
        out += c;
      }
    }
    out += '"';
  }
  out += ']';
  return out;
}

bool decode_form_block(std::string_view json, const std::function<void(std::string_view)>& each) {
  std::size_t i = 0;
  auto at = [&](char c) { return i < json.size() && json[i] == c; };
  if (!at('[')) return false;
  ++i;
  if (at(']')) return i + 1 == json.size();
  std::string form;
  while (true) {
    if (!at('"')) return false;
    ++i;
    form.clear();
    while (i < json.size() && json[i] != '"') {
      if (json[i] != '\\') {
        form += json[i++];
        continue;
      }
      if (++i >= json.size()) return false;
      const char escaped = json[i++];
      if (escaped == '"' || escaped == '\\') {
        form += escaped;
      } else if (escaped == 'u' && i + 4 <= json.size() && json.substr(i, 2) == "00" && hex_value(json[i + 2]) >= 0 &&
                 hex_value(json[i + 3]) >= 0) {
        form += static_cast<char>(hex_value(json[i + 2]) * 16 + hex_value(json[i + 3]));
        i += 4;
      } else {
        return false;  // not what encode_form_block writes
      }
    }
    if (!at('"')) return false;
    ++i;
    each(form);
    if (at(']')) return i + 1 == json.size();
    if (!at(',')) return false;
    ++i;
  }
}

void for_each_stored_form(Database& db, std::int64_t settings_id,
                          const std::function<void(FeatureId, std::string_view)>& each) {
  Statement blocks = db.prepare(
      "SELECT first_feature_id, forms FROM vocabulary_blocks WHERE settings_id = ?1 ORDER BY first_feature_id");
  blocks.bind(1, settings_id);
  std::int64_t next = 0;
  while (blocks.step()) {
    if (blocks.int64_at(0) != next)
      throw Error(ErrorKind::bad_input, "the store " + db.path() + " has a damaged vocabulary (feature " +
                                            std::to_string(next) + " is missing)");
    const bool ok = decode_form_block(blocks.blob_at(1), [&](std::string_view form) {
      each(static_cast<FeatureId>(next), form);
      ++next;
    });
    if (!ok)
      throw Error(ErrorKind::bad_input, "the store " + db.path() + " has a damaged vocabulary (the block from feature " +
                                            std::to_string(blocks.int64_at(0)) + ")");
  }
}

StoreVocabulary::StoreVocabulary(Database& db, std::int64_t settings_id)
    : settings_id_(settings_id),
      insert_(db.prepare("INSERT INTO vocabulary_blocks (settings_id, first_feature_id, forms) VALUES (?1, ?2, ?3)")) {
  for_each_stored_form(db, settings_id, [&](FeatureId, std::string_view form) { forms_.intern(form); });
  stored_ = forms_.size();
}

void StoreVocabulary::write_new() {
  if (stored_ == forms_.size()) return;
  for (std::size_t first = stored_; first < forms_.size(); first += kFormsPerBlock) {
    const std::size_t end = std::min(forms_.size(), first + kFormsPerBlock);
    insert_.bind(1, settings_id_).bind(2, static_cast<std::int64_t>(first)).bind(3, encode_form_block(forms_, first, end));
    insert_.step_to_end();
  }
  stored_ = forms_.size();
}

}  // namespace manicule::store
