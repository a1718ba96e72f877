#include "tei/selection_rules.h"

#include <cctype>

#include "core/error.h"
#include "tei/xpath_units.h"

namespace manicule {

const std::set<std::string>& always_skipped_elements() {
  // teiHeader (2.1.1), fw (12.6), interp/span/fs analysis (18.3, 19), standOff (17.10),
  // wit: the sigla of the witnesses of a reading (13.1.4), never words of the text.
  static const std::set<std::string> names{"teiHeader", "fw", "interp", "interpGrp", "span",
                                           "spanGrp", "fs", "fLib", "fvLib", "standOff", "wit"};
  return names;
}

namespace {

// Left out by default; each can be kept with --keep (tei-conventions.md section 1).
const std::set<std::string>& default_skips() {
  static const std::set<std::string> names{
      "note", "noteGrp", "speaker", "stage", "castList", "head", "trailer", "figDesc",
      "label", "gap", "supplied",
      // alternations: the editor's reading wins (3.5.1, 3.5.2, 3.6.5, 13.1)
      "sic", "orig", "abbr", "rdg", "rdgGrp", "witDetail",
      // letter formulae (4.2.2, 4.2.3)
      "opener", "closer", "salute", "signed", "dateline", "address", "postscript",
      // paratext and non-running text (4.2, 4.3, 14.2, 15.4)
      "argument", "epigraph", "byline", "docAuthor", "index", "figure", "formula", "desc",
      "front", "back", "floatingText"};
  return names;
}

}  // namespace

std::string unit_name(UnitKind kind) {
  switch (kind) {
    case UnitKind::speaker: return "speaker";
    case UnitKind::letter: return "letter";
    case UnitKind::chapter: return "chapter";
    case UnitKind::whole: return "whole";
    case UnitKind::xpath: return "xpath";
  }
  return "whole";
}

std::optional<std::string> element_local_name(const std::string& given) {
  std::string name = given.rfind("tei:", 0) == 0 ? given.substr(4) : given;
  const bool plain = !name.empty() &&
                     name.find_first_not_of("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789._-") ==
                         std::string::npos &&
                     !std::isdigit(static_cast<unsigned char>(name[0])) && name[0] != '-' && name[0] != '.';
  if (!plain) return std::nullopt;
  return name;
}

SelectionRules SelectionRules::make(const std::string& unit_spec, Preset preset) {
  SelectionRules rules;
  if (unit_spec == "speaker") rules.unit = UnitKind::speaker;
  else if (unit_spec == "letter") rules.unit = UnitKind::letter;
  else if (unit_spec == "chapter") rules.unit = UnitKind::chapter;
  else if (unit_spec == "whole") rules.unit = UnitKind::whole;
  else if (unit_spec.rfind("xpath:", 0) == 0 && unit_spec.size() > 6) {
    rules.unit = UnitKind::xpath;
    rules.xpath = unit_spec.substr(6);
    check_xpath_unit(rules.xpath);
  } else {
    throw Error(ErrorKind::usage, "unknown unit '" + unit_spec +
                                      "': use speaker, letter, chapter, whole or xpath:EXPR");
  }
  rules.preset = preset;
  rules.skipped = default_skips();
  rules.skipped.insert(always_skipped_elements().begin(), always_skipped_elements().end());
  if (preset == Preset::reading) {
    rules.skipped.insert({"del", "surplus"});  // struck-out and redundant source text
  } else {
    // Diplomatic: the source's text as first written (3.5.1-3.5.3, 12.3.1.4-5): its errors,
    // spellings, abbreviations and deletions, not what an editor or a later hand added.
    for (const char* name : {"sic", "orig", "abbr"}) rules.skipped.erase(name);
    rules.skipped.insert({"corr", "reg", "expan", "add", "supplied"});
  }
  return rules;
}

void SelectionRules::keep(const std::string& element) {
  if (always_skipped_elements().count(element)) {
    throw Error(ErrorKind::usage, "<" + element + "> is never selected: it holds no running text");
  }
  // Only an element left out until now: keeping one that is read already (lem, corr in the
  // reading preset) changes no choice, and would otherwise show as preferred.
  if (skipped.erase(element)) kept_by_user.insert(element);
}

void SelectionRules::drop(const std::string& element) {
  skipped.insert(element);
  kept_by_user.erase(element);
}

const std::vector<AlternationSides>& alternation_sides() {
  static const std::vector<AlternationSides> sides = {
      {{"lem"}, {"rdg", "rdgGrp"}}, {{"corr"}, {"sic"}}, {{"reg"}, {"orig"}}, {{"expan"}, {"abbr"}}};
  return sides;
}

std::string SelectionRules::describe() const {
  std::string out = "unit=" + unit_name(unit);
  if (unit == UnitKind::xpath) out += ":" + xpath;
  out += std::string(" preset=") + (preset == Preset::reading ? "reading" : "diplomatic");
  out += " skip=";
  bool first = true;
  for (const auto& name : skipped) {
    if (always_skipped_elements().count(name)) continue;
    out += (first ? "" : ",") + name;
    first = false;
  }
  // Members of an alternation the user asked for, read in place of the preset's choice.
  std::string preferred;
  for (const auto& [one, other] : alternation_sides())
    for (const auto* side : {&one, &other})
      for (const auto& name : *side)
        if (kept_by_user.count(name)) preferred += (preferred.empty() ? "" : ",") + name;
  if (!preferred.empty()) out += " prefer=" + preferred;
  if (joint == JointSpeech::drop) out += " joint=drop";
  return out;
}

}  // namespace manicule
