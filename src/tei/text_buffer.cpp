#include "tei/text_buffer.h"

#include "core/error.h"

namespace manicule {

namespace {

bool is_xml_space(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

void strip_trailing_space(std::string& s) {
  while (!s.empty() && is_xml_space(s.back())) s.pop_back();
}

bool ends_with(const std::string& s, const std::string& suffix) {
  return s.size() >= suffix.size() && s.compare(s.size() - suffix.size(), suffix.size(), suffix) == 0;
}

}  // namespace

void TextBuffer::add_text(std::string_view text, int language) {
  if (text.empty()) return;
  if (text_.size() + text.size() > 0xFFFFFFFFULL) throw Error(ErrorKind::bad_input, "a unit holds more than 4 GB of text");
  const auto begin = static_cast<std::uint32_t>(text_.size());
  text_.append(text);
  const auto end = static_cast<std::uint32_t>(text_.size());
  if (!pieces_.empty() && pieces_.back().kind == Kind::text && pieces_.back().language == language) {
    pieces_.back().end = end;  // pieces of one buffer are back to back in text_
    return;
  }
  pieces_.push_back(Piece{Kind::text, language, begin, end});
}

void TextBuffer::add_boundary() {
  if (!pieces_.empty() && pieces_.back().kind == Kind::boundary) return;
  pieces_.push_back(Piece{Kind::boundary, 0, 0, 0});
}

void TextBuffer::add_join() { pieces_.push_back(Piece{Kind::join, 0, 0, 0}); }

void TextBuffer::append(const TextBuffer& other) {
  for (const Piece& p : other.pieces_) {
    if (p.kind == Kind::text) add_text(other.text_of(p), p.language);
    else if (p.kind == Kind::boundary) add_boundary();
    else add_join();
  }
}

void TextBuffer::render(std::vector<TextRun>& runs, const std::vector<std::string>& languages,
                        const std::vector<std::string>& hyphens) const {
  bool joining = false;  // after a join, leading whitespace of the next text is dropped
  int last_language = -1;  // the language of runs.back(), once looked at in this call
  auto current = [&](int language) -> std::string& {
    if (language == last_language) return runs.back().text;
    const std::string& tag = languages[static_cast<std::size_t>(language)];
    if (runs.empty() || runs.back().language != tag) {
      if (!runs.empty()) runs.back().text.push_back(' ');  // a language switch separates words
      runs.push_back(TextRun{{}, tag});
    }
    last_language = language;
    return runs.back().text;
  };
  for (const Piece& p : pieces_) {
    switch (p.kind) {
      case Kind::boundary:
        joining = false;
        if (!runs.empty() && !runs.back().text.empty() && runs.back().text.back() != ' ')
          runs.back().text.push_back(' ');
        break;
      case Kind::join:
        if (!runs.empty()) {
          std::string& last = runs.back().text;
          strip_trailing_space(last);
          for (const std::string& h : hyphens) {
            if (ends_with(last, h)) {
              last.resize(last.size() - h.size());
              break;
            }
          }
        }
        joining = true;
        break;
      case Kind::text: {
        std::string_view t = text_of(p);
        if (joining) {
          std::size_t i = 0;
          while (i < t.size() && is_xml_space(t[i])) ++i;
          t.remove_prefix(i);
          if (t.empty()) break;
          joining = false;
        }
        current(p.language).append(t);
        break;
      }
    }
  }
}

}  // namespace manicule
