// Selection rules: which elements make a unit, which elements' text is left out, and how
// alternations (choice, app) and joint speeches are resolved. Compiled once per run into
// plain sets; the reader consults them per element without evaluating XPath.
// Sources: ../shared/docs/tei-conventions.md section 1 (TEI P5 4.12.0 chapters cited there).
#pragma once
#include <optional>
#include <set>
#include <string>
#include <utility>
#include <vector>

namespace manicule {

enum class UnitKind { speaker, letter, chapter, whole, xpath };

enum class Preset { reading, diplomatic };

// What happens to a speech whose @who names several speakers.
enum class JointSpeech { each, drop };

// An element as --keep and --drop name it: its local name. "tei:hi", as an xpath unit spells
// TEI elements, is hi (the walker compares local names, so the prefixed form matched
// nothing); nullopt for anything else with a prefix or outside a name's characters.
std::optional<std::string> element_local_name(const std::string& given);

struct SelectionRules {
  UnitKind unit = UnitKind::whole;
  std::string xpath;                 // for UnitKind::xpath: the element set to select
  Preset preset = Preset::reading;
  std::set<std::string> skipped;     // TEI local names whose subtree is left out
  std::set<std::string> kept_by_user;  // left-out names the user asked to keep (win inside choice)
  std::set<std::string> letter_types{"letter"};  // div/@type values that make a letter
  std::set<std::string> chapter_types{"chapter"};
  JointSpeech joint = JointSpeech::each;
  std::string base_witness;          // for app without lem: the rdg whose @wit has it
  std::string default_language;      // when neither xml:lang nor langUsage says
  // Hyphen-like characters removed before <lb break="no"/> in the reading preset.
  std::vector<std::string> join_hyphens{"-", "\u00AD", "\u2010", "\u2011", "\u00AC", "\u2E17", "="};

  // Rules with the default exclusions for a unit kind and preset; then --keep and --drop
  // adjust them. Unknown unit names throw Error(usage).
  static SelectionRules make(const std::string& unit_spec, Preset preset = Preset::reading);
  void keep(const std::string& element);
  void drop(const std::string& element);
  bool skips(const std::string& local_name) const { return skipped.count(local_name) != 0; }
  // A one-line summary for provenance ("unit=speaker preset=reading skip=note,stage,...",
  // then "prefer=rdg" for alternation members the user keeps, read instead of the other).
  std::string describe() const;
};

// The two sides of each kind of alternation, of which the text reads one member (lem or
// the readings of an app; corr or sic, reg or orig, expan or abbr of a choice).
using AlternationSides = std::pair<std::set<std::string>, std::set<std::string>>;
const std::vector<AlternationSides>& alternation_sides();

// Elements always left out whatever the user keeps: metadata and analysis, not text.
const std::set<std::string>& always_skipped_elements();

std::string unit_name(UnitKind kind);

}  // namespace manicule
