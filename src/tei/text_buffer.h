// TextBuffer: selected text collected while walking, as pieces (text, token boundary,
// join across a line break), turned into language runs once a unit is complete. Keeping
// pieces rather than a string lets alternations (choice, app) buffer each member and
// replay only the chosen one, and lets <lb break="no"/> join words across skipped matter.
// The text of all pieces lives in one string, so adding text seldom allocates.
#pragma once
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/segment.h"

namespace manicule {

class TextBuffer {
 public:
  void add_text(std::string_view text, int language);
  void add_boundary();
  void add_join();  // a <lb|pb|cb break="no"/>: the next word continues this one
  void append(const TextBuffer& other);
  bool empty() const { return pieces_.empty(); }
  void clear() {
    pieces_.clear();
    text_.clear();
  }

  // Appends this buffer's text to `runs` (language index -> tag through `languages`),
  // removing the whitespace around joins and, where `hyphens` is not empty, a hyphen-like
  // character right before a join.
  void render(std::vector<TextRun>& runs, const std::vector<std::string>& languages,
              const std::vector<std::string>& hyphens) const;

 private:
  enum class Kind : unsigned char { text, boundary, join };
  struct Piece {
    Kind kind;
    int language;
    std::uint32_t begin, end;  // text pieces: text_[begin, end)
  };
  std::string_view text_of(const Piece& p) const { return std::string_view(text_).substr(p.begin, p.end - p.begin); }
  std::vector<Piece> pieces_;
  std::string text_;
};

}  // namespace manicule
