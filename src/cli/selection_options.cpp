#include "cli/selection_options.h"

#include <algorithm>
#include <iostream>

#include "cli/repeatable_option.h"
#include "core/error.h"
#include "tei/selection_rules.h"

namespace manicule::cli {

void SelectionOptions::add_to(CLI::App& command, const std::string& default_unit) {
  unit = default_unit;
  command.add_option("files", inputs, "TEI files, or folders searched for *.xml and *.tei")->required();
  command.add_option("--unit,-u", unit,
                     "what makes a segment: speaker, letter, chapter, whole, or xpath:EXPR "
                     "(prefix TEI elements with tei:)")
      ->capture_default_str();
  one_value_each_time(
      command.add_option("--keep", keep, "keep an element left out by default (repeatable), e.g. --keep note"));
  one_value_each_time(command.add_option("--drop", drop, "also leave out an element (repeatable), e.g. --drop quote"));
  command.add_option("--preset", preset,
                     "reading (the editor's corrected text) or diplomatic (the source's text as first written)")
      ->check(CLI::IsMember({"reading", "diplomatic"}))
      ->capture_default_str();
  command.add_option("--joint-speech", joint,
                     "a speech with several speakers in @who: 'each' credits it to every one, 'drop' leaves it out")
      ->check(CLI::IsMember({"each", "drop"}))
      ->capture_default_str();
  command.add_flag("--no-fold", no_fold, "keep letter case (default: full Unicode case folding)");
  command.add_flag("--keep-numbers", keep_numbers, "count numbers as words");
  command.add_flag("--keep-punctuation", keep_punctuation, "count punctuation marks as tokens");
  command.add_flag("--long-s", long_s, "read long s (ſ) as s");
  command.add_flag("--ligatures", ligatures, "read ligatures (ﬁ, ﬂ, ...) as their letters");
  command.add_flag("--no-apostrophe-fold", no_apostrophes, "keep apostrophe variants (’ ʼ) apart from '");
  // More readers than files or cores gain nothing; 256 keeps a typing slip ("--threads
  // 100000") from asking the system for a hundred thousand threads.
  command.add_option("--threads", threads,
                     "files read at once, and threads of the analysis, 1-256 (default: one per core)")
      ->check(CLI::Range(1u, 256u));
}

namespace {

// The element an option names (tei/selection_rules.h), or a usage error naming the option.
std::string element_name(const std::string& option, const std::string& given) {
  if (auto name = element_local_name(given)) return *name;
  throw Error(ErrorKind::usage, option + " " + given + ": give a TEI element's name, e.g. " + option + " note");
}

}  // namespace

Request SelectionOptions::to_request() const {
  Request r;
  r.inputs = inputs;
  r.unit = unit;
  r.preset = preset == "diplomatic" ? Preset::diplomatic : Preset::reading;
  for (const auto& name : keep) r.keep.push_back(element_name("--keep", name));
  for (const auto& name : drop) r.drop.push_back(element_name("--drop", name));
  // Both at once ask two things of one element; the later one won, without a word.
  for (const auto& name : r.keep)
    if (std::find(r.drop.begin(), r.drop.end(), name) != r.drop.end())
      throw Error(ErrorKind::usage, "--keep " + name + " and --drop " + name + " ask opposite things: give one");
  // Both sides of an alternation: the text reads one member, so one of them would be
  // passed by without a word (the first in the edition's order).
  for (const auto& [one, other] : alternation_sides()) {
    const auto kept_of = [&](const std::set<std::string>& side) {
      for (const auto& name : r.keep)
        if (side.count(name)) return name;
      return std::string();
    };
    if (!kept_of(one).empty() && !kept_of(other).empty())
      throw Error(ErrorKind::usage, "--keep " + kept_of(one) + " and --keep " + kept_of(other) +
                                        ": an alternation (app, choice) reads one of its members; keep one of them");
  }
  r.joint = joint == "drop" ? JointSpeech::drop : JointSpeech::each;
  r.tokenizer.case_fold = !no_fold;
  r.tokenizer.keep_numbers = keep_numbers;
  r.tokenizer.keep_punctuation = keep_punctuation;
  r.tokenizer.long_s = long_s;
  r.tokenizer.ligatures = ligatures;
  r.tokenizer.apostrophes = !no_apostrophes;
  r.threads = threads;  // the BLAS's threads too: main.cpp, limit_blas_threads
  r.selection_rules();  // validates unit and element names early
  // --keep of an element the preset reads anyway (a typing slip such as --keep notes, or
  // --keep corr) changes nothing: said, so that nobody takes it for kept text.
  const SelectionRules preset_rules = SelectionRules::make(r.unit, r.preset);
  for (const auto& name : r.keep)
    if (!preset_rules.skips(name))
      std::cerr << "manicule: note: --keep " << name << " changes nothing: <" << name << "> is not left out by the "
                << (r.preset == Preset::diplomatic ? "diplomatic" : "reading") << " preset\n";
  return r;
}

}  // namespace manicule::cli
