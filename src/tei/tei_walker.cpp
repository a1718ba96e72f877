#include "tei/tei_walker.h"

#include <unicode/unistr.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <map>
#include <set>
#include <unordered_map>
#include <unordered_set>

#include "core/error.h"
#include "tei/header_info.h"
#include "text/word_characters.h"
#include "tei/tei_root.h"
#include "tei/text_buffer.h"

namespace manicule {

namespace {

// An attribute value without the XML white space around it (xml:id 1.0, section 4: an
// xml:id processor normalises the value as an ID, so " L01 " is L01).
std::string_view trim_xml_space(std::string_view value) {
  const auto first = value.find_first_not_of(" \t\r\n");
  if (first == std::string_view::npos) return {};
  return value.substr(first, value.find_last_not_of(" \t\r\n") - first + 1);
}

// Elements whose start and end separate words (tei-conventions.md section 1, "Token
// boundaries": block ends and milestones; tags in general are not whitespace, 3.2.2).
const std::unordered_set<std::string_view>& block_elements() {
  static const std::unordered_set<std::string_view> names{
      "p", "ab", "l", "lg", "item", "list", "sp", "spGrp", "div", "div1", "div2", "div3",
      "div4", "div5", "div6", "div7", "head", "table", "row", "cell", "text", "body",
      "front", "back", "group", "floatingText", "castItem", "stage", "speaker", "note",
      "opener", "closer", "salute", "signed", "dateline", "address", "postscript",
      "trailer", "byline", "epigraph", "argument", "quote", "lem", "rdg", "u", "figure"};
  return names;
}

// "Kapitän Tau ( Jonas Reling )", as the names' own spaces leave it, without the
// spaces inside the brackets.
std::string tidy_brackets(std::string text) {
  for (std::size_t at; (at = text.find("( ")) != std::string::npos;) text.erase(at + 1, 1);
  for (std::size_t at; (at = text.find(" )")) != std::string::npos;) text.erase(at, 1);
  return text;
}

const std::unordered_set<std::string_view>& milestone_elements() {
  static const std::unordered_set<std::string_view> names{"lb", "pb", "cb", "gb", "milestone"};
  return names;
}

bool is_div(std::string_view name) {
  return name == "div" || (name.size() == 4 && name.substr(0, 3) == "div" && name[3] >= '1' && name[3] <= '7');
}

// An ISO 8601 date (att.datable.iso, 13.4) in XML Schema 1.0's form, which @when has and the
// store's year reads: ISO counts the years before the common era from a year 0 (0000 is
// 1 BCE, -0044 is 45 BCE), XML Schema 1.0 has no year 0 (-0001 is 1 BCE). Other dates as
// they are.
std::string schema_form_of_iso_date(std::string_view iso) {
  // An interval ("-0044/-0040") is two dates.
  if (const std::size_t slash = iso.find('/'); slash != std::string_view::npos)
    return schema_form_of_iso_date(iso.substr(0, slash)) + "/" + schema_form_of_iso_date(iso.substr(slash + 1));
  const bool minus = !iso.empty() && iso[0] == '-';
  const bool plus = !iso.empty() && iso[0] == '+';  // ISO's expanded form: "+0000" is year 0 too
  const std::size_t digits_begin = minus || plus ? 1 : 0;
  std::size_t digits_end = digits_begin;
  while (digits_end < iso.size() && iso[digits_end] >= '0' && iso[digits_end] <= '9') ++digits_end;
  const std::size_t digits = digits_end - digits_begin;
  if (digits < 4 || digits > 9) return std::string(iso);
  const long year = std::stol(std::string(iso.substr(digits_begin, digits)));
  if (!minus && year != 0) return std::string(iso);
  std::string before = std::to_string(year + 1);  // astronomical -N (or 0) is N+1 BCE
  if (before.size() < 4) before.insert(0, 4 - before.size(), '0');
  return "-" + before + std::string(iso.substr(digits_end));
}

// A date element's or event's date as written in its attributes: the date itself, else the
// start of a range (att.datable.w3c: @notBefore/@from), else its end; then the same in ISO
// 8601 (att.datable.iso: @when-iso and the rest); "" when it has none.
std::string date_attribute(const StartTag& tag) {
  for (std::string_view name : {"when", "notBefore", "from", "notAfter", "to"}) {
    std::string_view value = tag.attribute(name);
    if (!value.empty()) return std::string(value);
  }
  for (std::string_view name : {"when-iso", "notBefore-iso", "from-iso", "notAfter-iso", "to-iso"}) {
    std::string_view value = tag.attribute(name);
    if (!value.empty()) return schema_form_of_iso_date(value);
  }
  return {};
}

// Whether an element's @cert (att.global.responsibility) or @evidence="conjecture" doubts
// it: a certainty below high, in words or as a number below 1 (tei-conventions 3).
bool doubted(const StartTag& tag) {
  const std::string_view cert = tag.attribute("cert");
  return tag.attribute("evidence") == "conjecture" ||
         (!cert.empty() && cert != "high" && cert != "1" && cert != "1.0");
}

// Whether a <name> names a place by its @type (TEI P5 3.6.1 gives type="place" as its
// example): in a correspAction, where the place a letter was sent from may be written so
// beside its sender, such a name is no sender. The values are common practice, no source.
bool names_a_place(const StartTag& tag) {
  const std::string_view type = tag.attribute("type");
  for (std::string_view place : {"place", "placeName", "settlement", "country", "region", "district", "location"})
    if (type == place) return true;
  return false;
}

// A name without the brackets and question marks an editor queries it with:
// "[Barnaby Quell?]" -> "Barnaby Quell".
std::string without_query_marks(const std::string& name) {
  std::string out;
  for (char c : name)
    if (c != '[' && c != ']' && c != '?') out += c;
  return normalise_space(out);
}

std::string case_fold(const std::string& text) {
  std::string out;
  icu::UnicodeString::fromUTF8(text).foldCase().toUTF8String(out);
  return out;
}

// Speaker text as a key: trimmed, final punctuation removed, case-folded (section 2).
std::string speaker_key_text(const std::string& raw) {
  std::string t = normalise_space(raw);
  while (!t.empty() && std::string_view(".,:;!?").find(t.back()) != std::string_view::npos) {
    t.pop_back();
    while (!t.empty() && t.back() == ' ') t.pop_back();
  }
  return case_fold(t);
}

// The pointers of a space-separated attribute value, without their '#', into `out`
// (cleared first; its strings keep their memory).
void split_pointers_into(std::string_view value, std::vector<std::string>& out) {
  std::size_t n = 0;
  std::size_t i = 0;
  while (i < value.size()) {
    while (i < value.size() && (value[i] == ' ' || value[i] == '\t' || value[i] == '\n' || value[i] == '\r')) ++i;
    std::size_t j = i;
    while (j < value.size() && !(value[j] == ' ' || value[j] == '\t' || value[j] == '\n' || value[j] == '\r')) ++j;
    if (j > i) {
      std::string_view token = value.substr(i, j - i);
      if (token[0] == '#') token.remove_prefix(1);
      if (n == out.size()) out.emplace_back();
      out[n++].assign(token);
    }
    i = j;
  }
  out.resize(n);
}

std::vector<std::string> split_pointers(std::string_view value) {
  std::vector<std::string> out;
  split_pointers_into(value, out);
  return out;
}

double cert_rank(const std::string& cert) {
  if (cert == "high") return 3;
  if (cert == "medium") return 2;
  if (cert == "low") return 1;
  if (cert == "unknown" || cert.empty()) return 0;
  try {
    return 3 * std::stod(cert);
  } catch (...) {
    return 0;
  }
}

// What a capture of an element's text is for.
enum class Capture { none, title, author, person_name, role_name, speaker, head, sender, date, letter_date };

}  // namespace

struct TeiWalker::State {
  const SelectionRules& rules;
  std::string file;
  std::string stem;
  const std::set<std::vector<int>>* xpath_targets;
  std::unordered_set<std::string_view> skip;  // views into rules.skipped

  struct Frame {
    // The local name, a view into the parser's dictionary of names, which outlives the
    // parse's events (libxml2 hands the same interned name to every start tag).
    std::string_view name;
    bool tei = false;
    bool skipped_here = false;   // this element began a skipped subtree
    bool pushed_language = false;
    bool block = false;
    int unit = -1;               // index into open_units opened here
    bool alternation = false;    // this element is a choice/app being resolved
    bool member = false;         // a buffered member of the enclosing alternation
                                 // (its @cert and @wit on member_attributes)
    Capture capture = Capture::none;
    bool header = false, title_stmt = false, corresp_desc = false, corresp_sent = false, source_desc = false;
    bool file_dating = false;  // publicationStmt, editionStmt, revisionDesc: they date the file
    bool creation = false, standoff = false, source_bibl = false;
    bool person = false, cast_list = false, sp_grp = false, tei_element = false, corpus_element = false;
    bool dateline = false;
    bool hides_letter_dates = false;  // text the reader leaves out, inside a letter
    bool muted = false;        // an idno or a note inside a capture: no part of the name or title
    bool main_title = false;   // a titleStmt title of type main, preferred to any other
    bool author_name = false;  // a persName directly inside a titleStmt author
    bool bracketed_name = false;  // ... a later one, put in brackets after the first
    // The element's xml:id, a view into the start tag: set while the start tag is handled
    // and cleared before the frame is kept (frames hold no strings, so they copy cheaply).
    std::string_view xml_id;
    int ordinal = 0;                                   // position among element siblings
    int same_name_index = 0;                           // position among same-name siblings
    int child_elements = 0;
  };
  std::vector<Frame> frames;
  // For the open element at each depth, how many children of each name it has had so far
  // (for same_name_index). Kept outside the frames so that the vectors keep their memory
  // from one element to the next instead of allocating for each element with children.
  std::vector<std::vector<std::pair<std::string_view, int>>> child_name_counts;

  // What an element name means to the walker, worked out once per name and file.
  struct NameClass {
    bool milestone = false, block = false, skipped = false;
  };
  std::unordered_map<std::string_view, NameClass> name_classes;
  // In front of name_classes, a direct-mapped cache keyed by where the name's bytes are:
  // libxml2 interns names, so one name comes at one address for the whole parse, and the
  // cache spares hashing and comparing the name for each element.
  struct CachedNameClass {
    std::string_view name;  // compared by address and length: no bytes are read
    const NameClass* name_class = nullptr;
  };
  std::array<CachedNameClass, 256> name_class_cache{};
  const NameClass& name_class(std::string_view name) {
    CachedNameClass& cached =
        name_class_cache[(reinterpret_cast<std::uintptr_t>(name.data()) >> 3) % name_class_cache.size()];
    if (cached.name.data() == name.data() && cached.name.size() == name.size() && cached.name_class)
      return *cached.name_class;
    auto [it, added] = name_classes.try_emplace(name);
    if (added) {
      it->second.milestone = milestone_elements().count(name) > 0;
      it->second.block = block_elements().count(name) > 0;
      it->second.skipped = skip.count(name) > 0;
    }
    cached = {name, &it->second};  // unordered_map entries stay where they are
    return it->second;
  }

  // @cert and @wit of the open alternation members, innermost last.
  struct MemberAttributes {
    std::string cert, wit;
    std::string reads_as;  // an rdgGrp that chose its lem stands for the lem ("lem"), else ""
  };
  std::vector<MemberAttributes> member_attributes;

  struct Member {
    std::string name, cert, wit;
    bool skipped_by_name;
    TextBuffer buffer;
  };
  struct Alternation {
    bool is_app;
    std::vector<Member> members;
  };
  std::vector<Alternation> alternations;

  struct OpenUnit {
    std::vector<TextBuffer> buffers{TextBuffer{}};
    std::string local_id;                 // xml:id or generated
    std::string pointer;                  // "#id" or xpath(...)
    std::vector<std::string> who;         // speaker keys from @who
    std::string speaker_text, head_text;
    std::string decls;                    // letter @decls
    std::string dateline_date;            // a letter's date in its own dateline
    int hidden_depth = 0;                 // open elements whose dates are not the letter's
    bool body_letter = false;             // provisional one-letter-per-file unit
    int tei_index = 0;

    // Empty again, keeping the memory of its strings and buffers.
    void reset() {
      buffers.resize(1);
      buffers.front().clear();
      local_id.clear();
      pointer.clear();
      who.clear();
      speaker_text.clear();
      head_text.clear();
      decls.clear();
      dateline_date.clear();
      hidden_depth = 0;
      body_letter = false;
      tei_index = 0;
    }
  };
  // The open units, innermost last. A closed unit's entry is kept for the next unit at
  // that depth: a play opens hundreds of speeches (the play corpus some 475,000), and
  // reusing the entries spares allocating their buffers and strings each time.
  class UnitStack {
   public:
    bool empty() const { return open_ == 0; }
    std::size_t size() const { return open_; }
    OpenUnit& back() { return entries_[open_ - 1]; }
    OpenUnit& push() {
      if (open_ == entries_.size()) entries_.emplace_back();
      OpenUnit& u = entries_[open_++];
      u.reset();
      return u;
    }
    void pop() { --open_; }

   private:
    std::vector<OpenUnit> entries_;
    std::size_t open_ = 0;
  };
  UnitStack open_units;

  std::vector<std::string> languages{""};  // interned language tags; 0 = unknown
  std::vector<int> language_stack;

  std::vector<HeaderInfo> headers;       // one per TEI element, in document order
  // Each teiCorpus's own header (TEI P5 15.1), in document order: what it says of the
  // collection (its title, authors its texts' headers may leave to it, correspDescs).
  std::vector<HeaderInfo> corpus_headers;
  // The headers open around the element being read, outermost first: {true, i} for
  // corpus_headers[i], {false, i} for headers[i] (a TEI holding TEIs).
  std::vector<std::pair<bool, int>> open_headers;
  // For each TEI element (by index into headers): the headers of the collections around
  // it, outermost first.
  std::vector<std::vector<std::pair<bool, int>>> collections_of_tei;
  bool root_is_corpus = false;
  HeaderInfo no_open_header;  // never read: a header outside TEI and teiCorpus is not TEI
  std::vector<int> tei_stack;            // indices into headers of open TEI elements
  std::vector<std::string> capture_text;  // one per open capture
  std::vector<std::string> sp_grp_who;
  std::vector<std::string> person_stack;
  int header_depth = 0, text_depth = 0, skip_depth = 0, cast_depth = 0, source_desc_depth = 0;
  int file_dating_depth = 0;  // open header parts that date the file, not the work
  int author_depth = 0;  // open author captures
  int muted_depth = 0;   // open elements whose text no capture takes: an author's idno, a note
  int author_name_depth = 0;  // open persNames directly inside an author
  int author_names = 0;       // persNames begun in the open author so far
  int creation_depth = 0, standoff_depth = 0, dateline_depth = 0;
  std::vector<std::string> source_bibl_types;  // @type of each open bibl in sourceDesc ("" if none)
  int corresp_index = -1;                // corresp record being read
  bool in_title_stmt = false;
  bool in_sent_action = false;
  bool sent_action_doubted = false;  // the open sent action's @cert is below high
  bool root_seen = false;

  // Results
  struct Built {
    Segment segment;
    int tei_index = 0;
    std::string decls;
    std::string dateline_date;
    bool body_letter = false;
    int speeches_by_label = 0;  // speeches without @who credited by their <speaker> label
    std::string speaker_key;    // a speaker's key within its text (local_id: within the file)
  };
  std::vector<Built> built;
  std::unordered_map<std::string, std::size_t> speaker_index;  // speaker key -> built index
  std::map<std::string, int> unit_counter;          // for generated ids
  std::map<std::string, long, std::less<>> unit_id_lines;  // a unit's xml:id -> its line
  std::vector<int> letters_per_tei;

  State(const SelectionRules& r, std::string f, std::string st, const std::set<std::vector<int>>* x)
      : rules(r), file(std::move(f)), stem(std::move(st)), xpath_targets(x) {
    for (const auto& name : rules.skipped) skip.insert(name);
  }

  int intern_language(std::string_view tag) {
    for (std::size_t i = 0; i < languages.size(); ++i)
      if (languages[i] == tag) return static_cast<int>(i);
    languages.emplace_back(tag);
    return static_cast<int>(languages.size() - 1);
  }

  // The header being read: the innermost open TEI's or teiCorpus's.
  HeaderInfo& header() {
    if (open_headers.empty()) return no_open_header;
    const auto [corpus, index] = open_headers.back();
    return corpus ? corpus_headers[static_cast<std::size_t>(index)] : headers[static_cast<std::size_t>(index)];
  }
  const HeaderInfo& header_at(std::pair<bool, int> at) const {
    return at.first ? corpus_headers[static_cast<std::size_t>(at.second)] : headers[static_cast<std::size_t>(at.second)];
  }

  // The headers of the collections around a TEI element, outermost first (none in a file
  // of one text).
  const std::vector<std::pair<bool, int>>& collections_around(int tei_index) const {
    static const std::vector<std::pair<bool, int>> none;
    const auto at = static_cast<std::size_t>(tei_index);
    return at < collections_of_tei.size() ? collections_of_tei[at] : none;
  }

  // The header nearest a text for which `has` holds: the text's own, else that of the
  // innermost collection around it (TEI P5 15.1: what the corpus header says holds for
  // its texts where theirs are silent); null when none.
  template <class Has>
  const HeaderInfo* nearest_header(int tei_index, const Has& has) const {
    if (static_cast<std::size_t>(tei_index) >= headers.size()) return nullptr;
    const HeaderInfo& own = headers[static_cast<std::size_t>(tei_index)];
    if (has(own)) return &own;
    const auto& around = collections_around(tei_index);
    for (auto at = around.rbegin(); at != around.rend(); ++at)
      if (has(header_at(*at))) return &header_at(*at);
    return nullptr;
  }

  // A person's or role's name by xml:id, from the nearest header that lists the id (a
  // teiCorpus of plays sharing one listPerson).
  const std::string* person_name(int tei_index, const std::string& key) const {
    const std::string* name = nullptr;  // found once: this runs twice for every speech of a play
    nearest_header(tei_index, [&](const HeaderInfo& h) {
      const auto it = h.person_names.find(key);
      if (it != h.person_names.end()) name = &it->second;
      return name != nullptr;
    });
    return name;
  }

  // Whether the file holds several texts with headers of their own, each then named by
  // its own (a teiCorpus, or TEI elements in a TEI).
  bool texts_apart() const { return root_is_corpus || headers.size() > 1; }

  // A speaker's key within the file: in a file of several texts each text's speakers are
  // its own (a CHORUS in two plays is two voices), so a text inside a collection leads
  // its keys with its xml:id, else with its place among the TEI elements ("TEI[2]"), and
  // a colon: neither can be a part of an xml:id (an NCName), so no two texts share one.
  std::string speaker_key_in_file(const std::string& key, int tei_index) const {
    if (collections_around(tei_index).empty()) return key;
    const std::string& id = headers[static_cast<std::size_t>(tei_index)].tei_id;
    return (id.empty() ? "TEI[" + std::to_string(tei_index + 1) + "]" : id) + ":" + key;
  }

  bool collecting() const { return !open_units.empty() && skip_depth == 0; }
  TextBuffer& sink() { return open_units.back().buffers.back(); }

  // The element being opened is not on `frames` yet: its own step comes last.
  static void append_step(std::string& path, const Frame& f) {
    char digits[16];
    path += '/';
    path.append(f.name);
    path += '[';
    path.append(digits, std::to_chars(digits, digits + sizeof digits, f.same_name_index).ptr);
    path += ']';
  }
  void write_xpath_pointer(const Frame& current, std::string& path) const {
    path.assign("xpath(");
    for (const Frame& f : frames) append_step(path, f);
    append_step(path, current);
    path += ')';
  }

  // The element `frame`'s path, called while its start tag is read: `frames` then holds
  // its ancestors only, and the frame itself is put at the end (without it, the children of
  // a matched element were taken for it).
  std::vector<int> ordinal_path_of(const Frame& frame) const {
    std::vector<int> path;
    path.reserve(frames.size() + 1);
    for (const Frame& f : frames) path.push_back(f.ordinal);
    path.push_back(frame.ordinal);
    return path;
  }

  void open_unit(Frame& frame, const StartTag& tag) {
    frame.unit = static_cast<int>(open_units.size());
    OpenUnit& u = open_units.push();
    u.tei_index = tei_stack.empty() ? 0 : tei_stack.back();
    if (rules.unit == UnitKind::speaker) {
      split_pointers_into(tag.attribute("who"), u.who);
      if (u.who.empty() && !sp_grp_who.empty()) split_pointers_into(sp_grp_who.back(), u.who);
    }
    if (!frame.xml_id.empty()) {
      // Two units of one xml:id would be one segment id for two texts (and a pointer to
      // either is ambiguous): the document breaks the rule that an xml:id is unique.
      if (rules.unit != UnitKind::speaker) {
        auto [seen, fresh] = unit_id_lines.emplace(frame.xml_id, tag.line);
        if (!fresh)
          throw Error(ErrorKind::bad_input,
                      "xml:id \"" + seen->first + "\" is given to two " + unit_name(rules.unit) + " units (lines " +
                          std::to_string(seen->second) + " and " + std::to_string(tag.line) +
                          "); an xml:id must be unique in its document (W3C xml:id 1.0)",
                      file, tag.line);
      }
      u.local_id.assign(frame.xml_id);
      u.pointer.assign("#").append(frame.xml_id);
    } else if (!speech_of_listed_persons(u)) {
      write_xpath_pointer(frame, u.pointer);
    }
    u.decls.assign(tag.attribute("decls"));
    sink().add_boundary();
  }

  // Whether a speech's own pointer will go unused: close_speech points a speaker listed in
  // the header at the person ("#id"), not at each speech. Most speeches of a play are
  // such, and building an xpath() pointer for each was a good part of opening them.
  bool speech_of_listed_persons(const OpenUnit& u) const {
    if (rules.unit != UnitKind::speaker || u.who.empty() || headers.empty()) return false;
    for (const std::string& key : u.who)
      if (!person_name(u.tei_index, key)) return false;
    return true;
  }

  bool is_unit_element(const Frame& frame, const StartTag& tag) const {
    if (!frame.tei) return false;
    switch (rules.unit) {
      case UnitKind::speaker: return frame.name == "sp";
      case UnitKind::letter:
        return is_div(frame.name) && rules.letter_types.count(std::string(tag.attribute("type")));
      case UnitKind::chapter:
        return is_div(frame.name) && rules.chapter_types.count(std::string(tag.attribute("type")));
      case UnitKind::whole:
        return frame.name == "text" && !frames.empty() && frames.back().tei_element;
      case UnitKind::xpath: return xpath_targets && xpath_targets->count(ordinal_path_of(frame));
    }
    return false;
  }

  void start_header_context(Frame& f, const StartTag& tag) {
    if (f.name == "teiHeader") {
      f.header = true;
      ++header_depth;
      return;
    }
    if (f.name == "castList") {
      f.cast_list = true;
      ++cast_depth;
    }
    if (f.name == "role" && cast_depth > 0 && !f.xml_id.empty()) {
      person_stack.emplace_back(f.xml_id);
      f.person = true;
      f.capture = Capture::role_name;
      return;
    }
    if (f.name == "standOff") {
      f.standoff = true;
      ++standoff_depth;
      return;
    }
    if (standoff_depth > 0 && f.name == "event") {
      note_work_event(tag);
      return;
    }
    if (header_depth == 0) return;
    HeaderInfo& h = header();
    if (f.name == "titleStmt" && frames.size() >= 2 && frames.back().name == "fileDesc" &&
        frames[frames.size() - 2].name == "teiHeader") {
      // The edition's own, teiHeader/fileDesc/titleStmt (TEI P5 2.2.1), not a source's
      // inside sourceDesc/biblFull (itself a fileDesc, or a titleStmt of its own).
      f.title_stmt = true;
      in_title_stmt = true;
    } else if (f.name == "sourceDesc") {
      f.source_desc = true;
      ++source_desc_depth;
    } else if (f.name == "publicationStmt" || f.name == "editionStmt" || f.name == "revisionDesc") {
      f.file_dating = true;
      ++file_dating_depth;
    } else if (f.name == "creation") {
      f.creation = true;
      ++creation_depth;
    } else if (source_desc_depth > 0 && (f.name == "bibl" || f.name == "biblStruct" || f.name == "biblFull")) {
      f.source_bibl = true;
      source_bibl_types.emplace_back(tag.attribute("type"));
    } else if (f.name == "title" && in_title_stmt && tag.attribute("type") != "sub" &&
               (h.title.empty() || (!h.title_is_main && tag.attribute("type") == "main"))) {
      // The first title that is not a subtitle, unless a later one is marked as the main one.
      f.capture = Capture::title;
      f.main_title = tag.attribute("type") == "main";
    } else if (f.name == "author" && in_title_stmt) {
      f.capture = Capture::author;
      ++author_depth;
      author_names = 0;
    } else if (f.name == "idno" && author_depth > 0) {
      // <author><persName>..</persName><idno type="wikidata">Q..</idno></author>: the name
      // is the author's label; the identifier would make "(Anonym) Q4233718" of an
      // anonymous author (then not recognised as anonymous).
      f.muted = true;
      ++muted_depth;
    } else if (f.name == "persName" && author_depth > 0 && author_name_depth == 0 && muted_depth == 0 &&
               !capture_text.empty()) {
      // Several names of one author (a pseudonym and the civil name): the first, then the
      // others in brackets, "Kapitän Tau (Jonas Reling)", not run together; unless the
      // header puts a bracket, round or square, before it itself.
      f.author_name = true;
      ++author_name_depth;
      std::string& text = capture_text.back();
      const auto last = text.find_last_not_of(" \t\r\n");
      if (author_names++ > 0 && (last == std::string::npos || (text[last] != '(' && text[last] != '['))) {
        text += " (";
        f.bracketed_name = true;
      }
    } else if ((f.name == "person" || f.name == "personGrp") && !f.xml_id.empty()) {
      person_stack.emplace_back(f.xml_id);
      f.person = true;
    } else if ((f.name == "persName" || (f.name == "name" && !names_a_place(tag)) || f.name == "orgName") &&
               in_sent_action && corresp_index >= 0) {
      CorrespRecord& c = h.corresp[static_cast<std::size_t>(corresp_index)];
      if (!frames.empty() && frames.back().name == "correspAction") ++c.senders_named;
      if (c.sender_label.empty() && c.sender_key.empty()) {
        f.capture = Capture::sender;
        c.sender_key = std::string(tag.attribute("ref"));
        c.sender_status = doubted(tag) || sent_action_doubted ? Authorship::conjectured : Authorship::known;
      }
    } else if ((f.name == "persName" || f.name == "name") && !person_stack.empty() &&
               !h.person_names.count(person_stack.back())) {
      f.capture = Capture::person_name;
    } else if (f.name == "correspDesc") {
      CorrespRecord c;
      c.id = std::string(f.xml_id);
      c.is_default = tag.attribute("default") == "true";
      h.corresp.push_back(c);
      corresp_index = static_cast<int>(h.corresp.size() - 1);
      f.corresp_desc = true;
    } else if (f.name == "correspAction" && tag.attribute("type") == "sent") {
      in_sent_action = true;
      f.corresp_sent = true;
      // The whole action doubted (its sender with it): att.global.responsibility's @cert.
      sent_action_doubted = doubted(tag);
    } else if (f.name == "language" && !tag.attribute("ident").empty()) {
      // The sole or most used language of langUsage (2.4.2).
      std::string_view usage = tag.attribute("usage");
      int u = usage.empty() ? 0 : std::atoi(std::string(usage).c_str());
      if (h.language.empty() || u > best_language_usage) {
        h.language = std::string(tag.attribute("ident"));
        best_language_usage = u;
      }
    } else if (f.name == "date" && date_slots(h).any()) {
      std::string value = date_attribute(tag);
      if (value.empty()) f.capture = Capture::date;
      else set_date(h, value);
    }
  }
  int best_language_usage = -1;

  // A letter's date in its own text: a date in a dateline (4.2.2), most often in the
  // opener. It dates a letter whose correspDesc gives no date, or that has none. Dates in
  // text the reader leaves out (a sic, a deletion, a note, a letter quoted in a
  // floatingText, a postscript) are not the letter's; only the formulae around its
  // dateline, left out as text, still date it.
  void note_letter_dateline(Frame& f, const StartTag& tag, bool skipped) {
    // Never a unit's own element (a letter div dropped with --drop div): end() closes the
    // unit before it would close what the element hides.
    const bool hides = f.name == "floatingText" ||
                       (skipped && f.name != "opener" && f.name != "closer" && f.name != "dateline");
    if (hides && f.unit < 0) {
      f.hides_letter_dates = true;
      ++open_units.back().hidden_depth;
      return;
    }
    if (f.name == "dateline") {
      f.dateline = true;
      ++dateline_depth;
      return;
    }
    if (f.name != "date" || dateline_depth == 0 || open_units.back().hidden_depth > 0 || f.capture != Capture::none)
      return;
    std::string value = date_attribute(tag);
    std::string& own = open_units.back().dateline_date;
    if (value.empty()) f.capture = Capture::letter_date;
    else if (better_date(own, value)) own = value;
  }

  // A dated event of the work itself (DraCor's plays: when it was written, printed, first
  // performed), in a standOff listEvent; other events may be anything the text mentions.
  void note_work_event(const StartTag& tag) {
    std::string_view type = tag.attribute("type");
    if (tei_stack.empty() || (type != "written" && type != "print" && type != "premiere")) return;
    std::string value = date_attribute(tag);
    if (!value.empty()) header().event_dates.push_back(std::move(value));
  }

  // The innermost @type among the open bibl elements of sourceDesc ("" if none has one).
  std::string_view source_bibl_type() const {
    for (auto it = source_bibl_types.rbegin(); it != source_bibl_types.rend(); ++it)
      if (!it->empty()) return *it;
    return {};
  }

  // Which of the header's date fields a <date> here fills: those still empty that it
  // belongs to (header_info.h).
  struct DateSlots {
    bool header = false, creation = false, sent = false, first_edition = false, source = false;
    bool any() const { return header || creation || sent || first_edition || source; }
  };
  DateSlots date_slots(const HeaderInfo& h) const {
    DateSlots slots;
    // The file's publication, edition and revisions date the file, never the work: a
    // letter left undated by its editor is not of the year its edition went online.
    // Nor does a letter's correspDesc date the others' work: its sending is rule 2's.
    slots.header = h.date.empty() && file_dating_depth == 0 && corresp_index < 0;
    slots.creation = creation_depth > 0 && h.creation_date.empty();
    slots.sent = in_sent_action;  // every letter's: the earliest is the file's
    if (source_desc_depth > 0) {
      std::string_view type = source_bibl_type();
      // Editions often type the electronic edition's bibl "digitalSource"; its date is
      // the file's making, not the work's (common practice, no source).
      bool digital = type.substr(0, 7) == "digital";
      slots.first_edition = type == "firstEdition" && h.first_edition_date.empty();
      slots.source = !digital && h.source_date.empty();
    }
    return slots;
  }

  void set_date(HeaderInfo& h, const std::string& value) {
    if (value.empty()) return;
    const DateSlots slots = date_slots(h);
    if (slots.header) h.date = value;
    if (slots.creation) h.creation_date = value;
    if (slots.sent) {
      h.sent_dates.push_back(value);
      if (corresp_index >= 0) {  // the letter(s) this correspDesc describes
        std::string& own = h.corresp[static_cast<std::size_t>(corresp_index)].sent_date;
        if (better_date(own, value)) own = value;
      }
    }
    if (slots.first_edition) h.first_edition_date = value;
    if (slots.source) h.source_date = value;
  }

  // What an element inside a captured name, title or heading does to the captured text,
  // before its own capture opens: a note (an editor's, most often) is no part of it; a line
  // break (not marked break="no") parts words, "Die<lb/>Fähre" being "Die Fähre"
  // (tei-conventions: lb, pb and cb are boundaries); and a name part begun right after a
  // word is parted from it, "<forename>Jonas</forename><surname>Reling</surname>" being
  // "Jonas Reling", while "<surname>Reling</surname>, <forename>Jonas</forename>" stays
  // "Reling, Jonas".
  void shape_capture_around(Frame& f, bool line_break) {
    if (f.name == "note") {
      f.muted = true;
      ++muted_depth;
      return;
    }
    const bool name_part = f.name == "forename" || f.name == "surname" || f.name == "roleName" ||
                           f.name == "addName" || f.name == "genName" || f.name == "nameLink" || f.name == "persName";
    if (!line_break && !name_part) return;
    for (std::string& c : capture_text) {
      if (c.empty()) continue;
      // Not after Han or kana either: "<surname>潮見</surname><forename>海風</forename>".
      if (line_break || ends_in_spaced_word_character(c)) c += ' ';
    }
  }

  void finish_capture(Frame& f, std::string text) {
    if (f.capture == Capture::speaker) {  // kept raw: close_speech makes the key of it
      if (!open_units.empty()) open_units.back().speaker_text += text;
      return;
    }
    std::string value = normalise_space(text);
    HeaderInfo& h = header();
    switch (f.capture) {
      case Capture::title:
        if (h.title.empty() || (f.main_title && !h.title_is_main)) {
          h.title = value;
          h.title_is_main = f.main_title;
        }
        break;
      case Capture::author:
        if (!value.empty()) h.authors.push_back(tidy_brackets(value));
        break;
      case Capture::person_name:
      case Capture::role_name:
        if (!person_stack.empty() && !value.empty()) h.person_names.emplace(person_stack.back(), value);
        break;
      case Capture::sender:
        if (corresp_index >= 0) {
          CorrespRecord& c = h.corresp[static_cast<std::size_t>(corresp_index)];
          c.sender_label = value;
          // A placeholder names nobody, @ref or not ("#unknown" is no candidate); a name
          // the editor queries in brackets ("[Ann Lee?]") is a conjecture.
          if (is_placeholder_name(value)) c.sender_status = Authorship::unknown;
          else if (is_queried_name(value) && c.sender_status == Authorship::known)
            c.sender_status = Authorship::conjectured;
          // Keyed without the editor's query marks, so that "[Barnaby Quell?]" is the same
          // candidate as the Barnaby Quell of other letters.
          if (c.sender_key.empty() && c.sender_status != Authorship::unknown)
            c.sender_key = case_fold(without_query_marks(value));
        }
        break;
      case Capture::date: set_date(h, value); break;
      case Capture::letter_date:
        if (!open_units.empty() && better_date(open_units.back().dateline_date, value))
          open_units.back().dateline_date = value;
        break;
      case Capture::speaker: break;  // above
      case Capture::head:
        if (!open_units.empty() && open_units.back().head_text.empty()) open_units.back().head_text = value;
        break;
      case Capture::none: break;
    }
  }

  std::string next_local_id(const std::string& kind) {
    int n = ++unit_counter[kind];
    return kind + std::to_string(n);
  }

  Built& new_built(const std::string& local_id, int tei_index) {
    Built b;
    b.segment.file = file;
    b.segment.local_id = local_id;
    b.segment.id = stem + "#" + local_id;
    b.segment.unit = unit_name(rules.unit);
    b.tei_index = tei_index;
    built.push_back(std::move(b));
    return built.back();
  }

  void render_into(Segment& segment, const TextBuffer& buffer) {
    if (!segment.runs.empty() && !segment.runs.back().text.empty()) segment.runs.back().text.push_back(' ');
    // Both branches name a list, so neither is copied (a temporary in one branch made the
    // other a copy too: one allocation and seven strings for every speech).
    static const std::vector<std::string> kNoHyphens;
    buffer.render(segment.runs, languages, rules.preset == Preset::reading ? rules.join_hyphens : kNoHyphens);
  }

  void close_unit(OpenUnit& u) {
    const TextBuffer& text = u.buffers.front();
    if (rules.unit == UnitKind::speaker) {
      close_speech(u, text);
      return;
    }
    // A letter that is its text's whole body is known by its TEI's xml:id first: the body
    // is a part of the letter, and --add-ids, which gives the body an id of its own (the
    // TEI's, taken, with "-2"), must leave the letter's id as it was.
    std::string local_id = u.body_letter ? headers[static_cast<std::size_t>(u.tei_index)].tei_id : std::string();
    if (local_id.empty()) local_id = u.local_id;
    if (local_id.empty()) local_id = next_local_id(unit_name(rules.unit));
    Built& b = new_built(local_id, u.tei_index);
    b.segment.pointers.push_back(u.pointer);
    b.decls = u.decls;
    b.dateline_date = u.dateline_date;
    b.body_letter = u.body_letter;
    if (!u.head_text.empty()) b.segment.label = u.head_text;
    render_into(b.segment, text);
  }

  void close_speech(OpenUnit& u, const TextBuffer& text) {
    std::vector<std::string>& keys = u.who;  // the unit is closing: its list can take the key below
    const bool by_label = keys.empty();
    if (by_label) {
      // No @who: match the speaker label against person and role names (section 2).
      std::string spoken = speaker_key_text(u.speaker_text);
      std::string key = spoken.empty() ? "unknown" : "speaker:" + spoken;
      // The text's own persons first, then those of the collections around it.
      if (!spoken.empty())
        nearest_header(u.tei_index, [&](const HeaderInfo& listing) {
          for (const auto& [id, name] : listing.person_names)
            if (speaker_key_text(name) == spoken) return key = id, true;
          return false;
        });
      keys.push_back(key);
    }
    if (keys.size() > 1 && rules.joint == JointSpeech::drop) return;
    for (const std::string& key : keys) {
      const std::string segment_key = speaker_key_in_file(key, u.tei_index);
      auto it = speaker_index.find(segment_key);
      if (it == speaker_index.end()) {
        new_built(segment_key, u.tei_index).speaker_key = key;
        it = speaker_index.emplace(segment_key, built.size() - 1).first;
      }
      if (by_label && key != "unknown") ++built[it->second].speeches_by_label;
      Segment& seg = built[it->second].segment;
      if (person_name(u.tei_index, key)) {
        if (seg.pointers.empty()) seg.pointers.push_back("#" + key);
      } else {
        seg.pointers.push_back(u.pointer);
      }
      if (seg.label.empty() && key.rfind("speaker:", 0) == 0) seg.label = normalise_space(u.speaker_text);
      render_into(seg, text);
    }
  }
};

TeiWalker::TeiWalker(const SelectionRules& rules, std::string file, std::string stem,
                     const std::set<std::vector<int>>* xpath_targets)
    : s_(std::make_unique<State>(rules, std::move(file), std::move(stem), xpath_targets)) {}

TeiWalker::~TeiWalker() = default;

void TeiWalker::start(const StartTag& tag) {
  State& s = *s_;
  if (!s.root_seen) {
    s.root_seen = true;
    require_tei_root(tag, s.file, "; expected <TEI> or <teiCorpus> in http://www.tei-c.org/ns/1.0");
    s.root_is_corpus = tag.in_tei_namespace && tag.local == "teiCorpus";
  }
  State::Frame f;
  f.name = tag.local;
  f.tei = tag.in_tei_namespace;
  f.xml_id = trim_xml_space(tag.attribute("id", kXmlNamespace));  // xml:id 1.0 normalises the value
  const std::size_t depth = s.frames.size();
  if (s.child_name_counts.size() <= depth) s.child_name_counts.resize(depth + 1);
  s.child_name_counts[depth].clear();  // this element's own children: none yet
  if (!s.frames.empty()) {
    State::Frame& parent = s.frames.back();
    f.ordinal = ++parent.child_elements;
    auto& siblings = s.child_name_counts[depth - 1];
    // Names are interned by libxml2, so the pointers match for the same name; the
    // comparison of the bytes is kept for any name that is not.
    auto it = std::find_if(siblings.begin(), siblings.end(),
                           [&](const auto& p) { return p.first.data() == f.name.data() || p.first == f.name; });
    if (it == siblings.end()) {
      siblings.emplace_back(f.name, 1);
      f.same_name_index = 1;
    } else {
      f.same_name_index = ++it->second;
    }
  } else {
    f.ordinal = 1;
    f.same_name_index = 1;
  }

  // Language: nearest xml:lang; an empty value means unknown (1.3.1.1.2).
  if (tag.has_attribute("lang", kXmlNamespace)) {
    s.language_stack.push_back(s.intern_language(tag.attribute("lang", kXmlNamespace)));
    f.pushed_language = true;
  }

  if (f.tei && (f.name == "TEI")) {
    f.tei_element = true;
    HeaderInfo h;
    h.tei_id = std::string(f.xml_id);
    h.tei_language = std::string(tag.attribute("lang", kXmlNamespace));
    s.headers.push_back(h);
    s.tei_stack.push_back(static_cast<int>(s.headers.size() - 1));
    s.letters_per_tei.push_back(0);
    s.collections_of_tei.push_back(s.open_headers);
    s.open_headers.emplace_back(false, s.tei_stack.back());
  }
  if (f.tei && f.name == "teiCorpus") {
    f.corpus_element = true;
    s.corpus_headers.emplace_back();
    s.open_headers.emplace_back(true, static_cast<int>(s.corpus_headers.size() - 1));
  }
  if (f.tei) s.start_header_context(f, tag);
  if (f.tei && f.name == "text") ++s.text_depth;

  // A member of an enclosing alternation is buffered even when its name is skipped: the
  // choice is made when the alternation ends.
  bool parent_alternation = !s.frames.empty() && s.frames.back().alternation && s.skip_depth == 0;
  if (parent_alternation && f.tei) {
    bool is_app = s.alternations.back().is_app;
    if (!is_app || f.name == "lem" || f.name == "rdg" || f.name == "rdgGrp") {
      f.member = true;
      s.member_attributes.push_back({std::string(tag.attribute("cert")), std::string(tag.attribute("wit")), {}});
      s.open_units.back().buffers.emplace_back();
    }
  }

  bool unit_here = s.skip_depth == 0 && s.text_depth > 0 && s.is_unit_element(f, tag);
  // One letter per file: the body is the letter unless letter divs turn up (section 3).
  bool body_letter = s.rules.unit == UnitKind::letter && f.tei && f.name == "body" && s.skip_depth == 0 &&
                     s.open_units.empty() && !s.tei_stack.empty() && !s.header().corresp.empty();
  const State::NameClass& name_class = s.name_class(f.name);
  if (!f.member && f.tei && s.skip_depth == 0 && !unit_here && name_class.skipped) {
    f.skipped_here = true;
    ++s.skip_depth;
  }
  if (s.skip_depth == 0 && !f.tei && s.text_depth == 0) {
    // foreign-namespace elements outside <text> hold no running text
  }
  if (unit_here || body_letter) {
    s.open_unit(f, tag);
    if (body_letter) s.open_units.back().body_letter = true;
    if (unit_here && s.rules.unit == UnitKind::letter && !s.tei_stack.empty())
      ++s.letters_per_tei[static_cast<std::size_t>(s.tei_stack.back())];
  }
  if (f.tei && !s.open_units.empty()) {
    if (f.name == "speaker" && s.rules.unit == UnitKind::speaker) f.capture = Capture::speaker;
    else if (f.name == "head" && f.capture == Capture::none) f.capture = Capture::head;
  }
  if (f.tei && s.rules.unit == UnitKind::letter && !s.open_units.empty())
    s.note_letter_dateline(f, tag, name_class.skipped);
  if (f.tei && f.name == "spGrp") {
    s.sp_grp_who.emplace_back(tag.attribute("who"));
    f.sp_grp = true;
  }
  if (!s.capture_text.empty() && f.tei)
    s.shape_capture_around(f, name_class.milestone && tag.attribute("break") != "no");
  if (f.capture != Capture::none) s.capture_text.emplace_back();

  if (s.collecting()) {
    if (f.tei && name_class.milestone) {
      if (tag.attribute("break") == "no") s.sink().add_join();
      else s.sink().add_boundary();
    } else if (f.tei && name_class.block) {
      f.block = true;
      s.sink().add_boundary();
    }
    // An rdgGrp groups readings of one app (13.1.4): it reads one of them too, so that an
    // app whose readings are grouped still gives one reading, never several.
    if (f.tei && (f.name == "choice" || f.name == "app" || f.name == "rdgGrp")) {
      f.alternation = true;
      s.alternations.push_back(State::Alternation{f.name != "choice", {}});
    }
  }
  f.xml_id = {};  // the view ends with the start tag
  s.frames.push_back(f);
}

void TeiWalker::end() {
  State& s = *s_;
  // Used in place and popped at the end (nothing below looks at the frames).
  State::Frame& f = s.frames.back();

  if (f.capture != Capture::none) {
    std::string text = std::move(s.capture_text.back());
    s.capture_text.pop_back();
    s.finish_capture(f, std::move(text));
  }
  if (f.author_name) --s.author_name_depth;
  if (f.bracketed_name && !s.capture_text.empty()) s.capture_text.back() += ')';
  if (f.block && s.collecting()) s.sink().add_boundary();

  if (f.alternation) {
    // Choose one member (tei-conventions.md section 1): a member kept by the user first,
    // then the first member whose name is not skipped (highest @cert among same names);
    // for app (or rdgGrp) without lem, the reading of the base witness, else the first.
    // An rdgGrp counts as a reading: --keep rdg takes the grouped readings too.
    State::Alternation alt = std::move(s.alternations.back());
    s.alternations.pop_back();
    const auto is_reading = [](const State::Member& m) { return m.name == "rdg" || m.name == "rdgGrp"; };
    const auto kept_by_user = [&](const State::Member& m) {
      return s.rules.kept_by_user.count(m.name) || (m.name == "rdgGrp" && s.rules.kept_by_user.count("rdg"));
    };
    const State::Member* chosen = nullptr;
    for (const auto& m : alt.members)
      if (kept_by_user(m)) { chosen = &m; break; }
    if (!chosen) {
      for (const auto& m : alt.members) {
        if (m.skipped_by_name) continue;
        if (!chosen) chosen = &m;
        else if (m.name == chosen->name && cert_rank(m.cert) > cert_rank(chosen->cert)) chosen = &m;
      }
    }
    if (!chosen && alt.is_app) {
      for (const auto& m : alt.members) {
        if (!is_reading(m)) continue;
        if (!s.rules.base_witness.empty()) {
          for (const auto& w : split_pointers(m.wit))
            if (w == s.rules.base_witness) chosen = &m;
          if (chosen) break;
        } else {
          chosen = &m;
          break;
        }
      }
    }
    if (chosen && !s.open_units.empty()) s.sink().append(chosen->buffer);
    // An rdgGrp that is itself a member of an app witnesses what its chosen reading does,
    // and one that chose a lem (13.1.4 allows it there) is the app's lemma.
    if (f.member && chosen && !s.member_attributes.empty()) {
      s.member_attributes.back().wit = chosen->wit;
      if (chosen->name == "lem") s.member_attributes.back().reads_as = "lem";
    }
  }
  if (f.member) {
    TextBuffer buffer = std::move(s.open_units.back().buffers.back());
    s.open_units.back().buffers.pop_back();
    State::MemberAttributes attributes = std::move(s.member_attributes.back());
    s.member_attributes.pop_back();
    // (name_class takes the parser's interned names only: its cache keys on their address.)
    const bool as_lem = !attributes.reads_as.empty();
    const bool skipped = as_lem ? s.rules.skips(attributes.reads_as) : s.name_class(f.name).skipped;
    if (!s.alternations.empty())
      s.alternations.back().members.push_back(State::Member{as_lem ? attributes.reads_as : std::string(f.name),
                                                            std::move(attributes.cert), std::move(attributes.wit),
                                                            skipped, std::move(buffer)});
  }
  if (f.unit >= 0) {
    s.close_unit(s.open_units.back());
    s.open_units.pop();
    if (!s.open_units.empty()) s.sink().add_boundary();
  }
  if (f.skipped_here) --s.skip_depth;
  if (f.pushed_language) s.language_stack.pop_back();
  if (f.header) --s.header_depth;
  if (f.source_desc) --s.source_desc_depth;
  if (f.file_dating) --s.file_dating_depth;
  if (f.creation) --s.creation_depth;
  if (f.standoff) --s.standoff_depth;
  if (f.source_bibl) s.source_bibl_types.pop_back();
  if (f.title_stmt) s.in_title_stmt = false;
  if (f.capture == Capture::author) --s.author_depth;
  if (f.muted) --s.muted_depth;
  if (f.corresp_sent) s.in_sent_action = false;
  if (f.corresp_desc) s.corresp_index = -1;
  if (f.dateline) --s.dateline_depth;
  if (f.hides_letter_dates) --s.open_units.back().hidden_depth;  // never a unit's own element
  if (f.person) s.person_stack.pop_back();
  if (f.cast_list) --s.cast_depth;
  if (f.sp_grp) s.sp_grp_who.pop_back();
  if (f.tei && f.name == "text") --s.text_depth;
  if (f.tei_element) s.tei_stack.pop_back();
  if (f.tei_element || f.corpus_element) s.open_headers.pop_back();
  s.frames.pop_back();
}

void TeiWalker::text(std::string_view chars) {
  State& s = *s_;
  if (s.muted_depth == 0)
    for (std::string& c : s.capture_text) c.append(chars);
  if (!s.collecting() || s.frames.empty()) return;
  if (s.frames.back().alternation) return;  // whitespace between members
  int language = s.language_stack.empty() ? 0 : s.language_stack.back();
  s.sink().add_text(chars, language);
}

}  // namespace manicule

namespace manicule {

namespace {

// The language of most of the segment's words. Counted in words, not bytes: the layout
// between elements (newlines, indentation) takes the enclosing language, and by bytes a
// speaker of 103 French words and 15 German ones was German. A tie goes to the tag first in
// byte order ("de" before "fr"); a segment without words takes its first run's language.
std::string main_language(const Segment& segment) {
  if (segment.runs.empty()) return "";
  const std::string& first = segment.runs.front().language;
  const bool one_language = std::all_of(segment.runs.begin(), segment.runs.end(),
                                        [&](const TextRun& run) { return run.language == first; });
  if (one_language) return first;  // most segments: nothing to count
  std::map<std::string, std::size_t> words;
  for (const auto& run : segment.runs) words[run.language] += rough_word_count(run.text);
  std::string best = first;
  std::size_t best_words = 0;
  for (const auto& [tag, count] : words) {
    if (count > best_words) {
      best = tag;
      best_words = count;
    }
  }
  return best;
}

bool has_text(const Segment& segment) {
  for (const auto& run : segment.runs)
    for (char c : run.text)
      if (c != ' ' && c != '\n' && c != '\t' && c != '\r') return true;
  return false;
}

}  // namespace

HeaderInfo TeiWalker::file_header() const {
  const State& s = *s_;
  HeaderInfo out = s.headers.empty() ? HeaderInfo{} : s.headers.front();
  if (s.root_is_corpus && !s.corpus_headers.empty()) {
    // The root teiCorpus's title and authors where its own header gives them; its dates
    // alone: each text is dated by its own header, else by the collections around it, and
    // a text none of them dates must not take the first text's date through the file's
    // (a letter without a sending date dated by another letter's). The first text's
    // language where it gives one, else the corpus's.
    const HeaderInfo& corpus = s.corpus_headers.front();
    if (!corpus.title.empty()) out.title = corpus.title;
    if (!corpus.authors.empty()) out.authors = corpus.authors;
    out.creation_date = corpus.creation_date;
    out.sent_dates = corpus.sent_dates;
    out.event_dates = corpus.event_dates;
    out.first_edition_date = corpus.first_edition_date;
    out.source_date = corpus.source_date;
    out.date = corpus.date;
    if (out.language.empty()) out.language = corpus.language;
  }
  return out;
}

std::vector<Segment> TeiWalker::finish() {
  State& s = *s_;
  std::vector<Segment> out;
  // Letters: pair each letter with its correspDesc (2.4.6, 16.3.2): @decls, else the
  // default one, else the only one, else by document order with a warning.
  // Every correspDesc of the document by xml:id, the first in document order for an id
  // given twice (xml:ids are unique in a valid document).
  std::unordered_map<std::string_view, const CorrespRecord*> corresp_by_id;
  // (corpus headers before the texts': an outer header comes first in document order)
  for (const HeaderInfo& header : s.corpus_headers)
    for (const auto& r : header.corresp)
      if (!r.id.empty()) corresp_by_id.emplace(r.id, &r);
  for (const HeaderInfo& header : s.headers)
    for (const auto& r : header.corresp)
      if (!r.id.empty()) corresp_by_id.emplace(r.id, &r);
  // A text whose header names no author is the nearest collection's authors' that names
  // some (a teiCorpus of one writer's works, each text's titleStmt giving its title
  // alone): TEI P5 15.1 has the corpus header say what holds for all its texts.
  const auto authors_of = [&](const HeaderInfo& h, int tei_index) -> const std::vector<std::string>& {
    const HeaderInfo* naming = s.nearest_header(tei_index, [](const HeaderInfo& x) { return !x.authors.empty(); });
    return naming ? naming->authors : h.authors;
  };
  // A date or a language (`field` of a header): the nearest header's that gives one (each
  // header's worked out once: a date is a choice among the header's dates).
  const auto own_else_collections = [&](int tei_index, const auto& field) {
    std::string value;
    s.nearest_header(tei_index, [&](const HeaderInfo& x) {
      value = field(x);
      return !value.empty();
    });
    return value;
  };
  // The titles of the collections around a text, outermost first, those it has.
  const auto collection_titles_of = [&](int tei_index) {
    std::vector<std::string> titles;
    for (const auto& at : s.collections_around(tei_index))
      if (!s.header_at(at).title.empty()) titles.push_back(s.header_at(at).title);
    return titles;
  };
  const bool texts_apart = s.texts_apart();
  // The correspDescs that letters name by @decls: document order pairs the others with
  // the rest alone, so that a letter without @decls is not given another's sender.
  // (with the texts whose letters name each)
  std::unordered_map<const CorrespRecord*, std::set<int>> named_by_decls;
  if (s.rules.unit == UnitKind::letter)
    for (const auto& b : s.built)
      for (const std::string& pointer : split_pointers(b.decls)) {
        auto named = corresp_by_id.find(pointer);
        if (named != corresp_by_id.end()) {
          named_by_decls[named->second].insert(b.tei_index);
          break;
        }
      }
  std::map<int, std::size_t> next_unnamed;  // by TEI: how far document order has paired
  for (auto& b : s.built) {
    Segment& seg = b.segment;
    // Bound without a conditional expression: `cond ? HeaderInfo{} : headers[i]` is a
    // prvalue, and copied every header (person names and all) for every segment.
    static const HeaderInfo no_header;
    const HeaderInfo& h = s.headers.empty() ? no_header : s.headers[static_cast<std::size_t>(b.tei_index)];
    if (s.rules.unit == UnitKind::letter) {
      if (b.body_letter && s.letters_per_tei[static_cast<std::size_t>(b.tei_index)] > 0) continue;
      const CorrespRecord* c = nullptr;
      // @decls may point at several declarations (a source's bibl, a correspDesc, 16.3.2):
      // the first that names a correspDesc pairs the letter, in its own TEI's header or in
      // another TEI's of the document.
      for (const std::string& pointer : split_pointers(b.decls)) {
        auto named = corresp_by_id.find(pointer);
        if (named != corresp_by_id.end()) {
          c = named->second;
          break;
        }
      }
      const bool decls_unmatched = !c && !b.decls.empty();
      if (!c)
        for (const auto& r : h.corresp)
          if (r.is_default) c = &r;
      // The only one, unless another letter of the text names it by @decls: then it is
      // that letter's. (A letter of another text may point at it as well: a text without
      // a correspDesc of its own borrowing this one.)
      if (!c && h.corresp.size() == 1) {
        auto named = named_by_decls.find(&h.corresp.front());
        if (named == named_by_decls.end() || !named->second.count(b.tei_index)) c = &h.corresp.front();
      }
      if (c && decls_unmatched)
        seg.warnings.push_back(std::string("letter paired with the ") + (c->is_default ? "default" : "only") +
                               " correspDesc of its header: its @decls names no correspDesc");
      if (!c) {
        // The next of its header's correspDescs that no letter's @decls names.
        std::size_t& next = next_unnamed[b.tei_index];
        while (next < h.corresp.size() && named_by_decls.count(&h.corresp[next])) ++next;
        if (next < h.corresp.size()) {
          c = &h.corresp[next++];
          seg.warnings.push_back("letter paired with correspDesc number " + std::to_string(next) +
                                 " by document order, passing by those that other letters' @decls name: " +
                                 (decls_unmatched ? "its @decls names no correspDesc"
                                                  : "no @decls or default correspDesc links them"));
        } else if (!h.corresp.empty()) {
          seg.warnings.push_back("sender unknown: every correspDesc of its header is another letter's, and " +
                                 std::string(decls_unmatched ? "its @decls names none" : "it has no @decls"));
        } else if (!corresp_by_id.empty()) {
          seg.warnings.push_back("sender unknown: its text's header has no correspDesc, and " +
                                 std::string(decls_unmatched ? "its @decls names none of the file's"
                                                             : "it has no @decls naming one of the file's"));
        }
      }
      if (c && c->senders_named > 1)
        seg.warnings.push_back("its correspDesc names " + std::to_string(c->senders_named) +
                               " senders: the letter is credited to the first alone");
      if (c) {
        seg.label = c->sender_label.empty() ? seg.label : c->sender_label;
        seg.author = c->sender_status == Authorship::unknown ? "" : c->sender_key;
        seg.authorship = c->sender_status;
      }
      // When it was sent: its correspDesc says, else its dateline.
      seg.date = c ? c->sent_date : std::string();
      if (better_date(seg.date, b.dateline_date)) seg.date = b.dateline_date;
    } else if (s.rules.unit == UnitKind::speaker) {
      // The edition did not say who speaks these: the label was read as a name, which an
      // editor should check (a "VOICE" or a misprint becomes a speaker of its own).
      if (b.speeches_by_label)
        seg.warnings.push_back(std::to_string(b.speeches_by_label) +
                               " speech(es) without @who credited by their <speaker> label");
      const std::string& key = b.speaker_key;
      if (const std::string* name = s.person_name(b.tei_index, key)) seg.label = *name;
      // A person's id names one person in the whole file; a voice known by its label
      // alone is its text's own (local_id, led by the text in a collection).
      seg.author = key == "unknown" ? "" : key.rfind("speaker:", 0) == 0 ? seg.local_id : key;
      seg.authorship = seg.author.empty() ? Authorship::unknown : Authorship::known;
    } else {
      if (s.rules.unit == UnitKind::whole) seg.label = h.title;
      const std::vector<std::string>& authors = authors_of(h, b.tei_index);
      bool anonymous = authors.empty(), queried = false;
      for (const auto& a : authors) {
        if (is_placeholder_name(a)) anonymous = true;
        if (is_queried_name(a)) queried = true;
      }
      seg.author = anonymous ? "" : join_authors(authors);
      seg.authorship = anonymous ? Authorship::unknown : queried ? Authorship::conjectured : Authorship::known;
    }
    if (seg.label.empty()) seg.label = seg.local_id;  // no name, title or heading: the id
    // A teiCorpus (or TEI elements in a TEI) dates each text by its own header, else by the
    // nearest collection's that gives a date; the file's date is its root header's alone
    // (file_header), so a text none of them dates stays undated.
    if (texts_apart && seg.date.empty()) {
      // (a letter's own sending is in its correspDesc, read above: other letters' are not its date)
      const bool letter = s.rules.unit == UnitKind::letter;
      seg.date = own_else_collections(b.tei_index, [letter](const HeaderInfo& header) {
        return work_date(header, !letter);
      });
    }
    // ... and names it by its own title and authors, not the first text's.
    if (texts_apart)
      seg.own_text = TextHeading{h.title, join_authors(authors_of(h, b.tei_index)), collection_titles_of(b.tei_index),
                                 b.tei_index + 1};
    seg.year = first_year(seg.date);
    std::string fallback =
        own_else_collections(b.tei_index, [](const HeaderInfo& header) { return header.language; });
    if (fallback.empty()) fallback = s.rules.default_language;
    for (auto& run : seg.runs)
      if (run.language.empty()) run.language = fallback;
    seg.language = main_language(seg);
    if (!has_text(seg)) seg.warnings.push_back("no running text selected");
    out.push_back(std::move(seg));
  }
  return out;
}

}  // namespace manicule
