// The xml:ids we write: all begin with "mcl-", are valid xml:ids (XML NCNames, ASCII
// only so that they survive any encoding) and are unique in the document they go into:
// an IdRegistry starts from the document's own ids and hands out each wanted id, or the
// same with "-2", "-3", ... when it is taken. Ids that come from a segment use a key made
// from the segment's local id, so that an editor can tell which speaker or letter they
// describe ("mcl-prof-dietrich").
#pragma once
#include <set>
#include <string>

namespace manicule {

class IdRegistry {
 public:
  IdRegistry() = default;
  explicit IdRegistry(std::set<std::string> taken) : taken_(std::move(taken)) {}
  // `wanted` if free, else the first free `wanted-N` (N = 2, 3, ...); marks it taken.
  std::string claim(const std::string& wanted);

 private:
  std::set<std::string> taken_;
};

// An NCName-safe key from any text: ASCII letters, digits, '.', '-' and '_' kept, other
// characters (also ':' and spaces) become '_', runs of '_' shortened to one; never empty.
std::string id_key(const std::string& text);

// True when `id` is a valid xml:id (an NCName) made of ASCII characters.
bool is_ascii_ncname(const std::string& id);

// The ids of one segment's results in the document that holds its profile.
struct SegmentIds {
  std::string key;         // from the local id
  std::string annotation;  // mcl-ann-KEY
  std::string profile;     // mcl-prof-KEY (fs styleProfile)
  std::string join;        // mcl-seg-KEY (join of its elements, if it has several)
  std::string pca;         // mcl-pca-KEY (fs pcaCoordinates)
};

SegmentIds claim_segment_ids(IdRegistry& ids, const std::string& local_id);

}  // namespace manicule
