#include "cli/archive_options.h"

#include <cctype>
#include <string_view>
#include <utility>

#include "cli/number_checks.h"
#include "cli/text_checks.h"
#include "core/error.h"
#include "text/language_tags.h"

namespace manicule::cli {

namespace {

constexpr const char* kYearsForm =
    "--years takes FROM-TO, FROM- or -TO, or one year, in years of up to four digits, those before the common "
    "era with BCE (450BCE-400BCE, 44BCE-14, 1800-1850); got '";

// `text` without the spaces around it.
std::string_view trimmed(std::string_view text) {
  const std::size_t first = text.find_first_not_of(' ');
  if (first == std::string_view::npos) return {};
  return text.substr(first, text.find_last_not_of(' ') - first + 1);
}

// One bound of --years: "1850", "14", "44BCE" (also "44 BC"; "14CE" and "14 AD" are 14);
// 0 for an empty bound. A year before the common era is negative, as a header writes it
// (XML Schema's "-0044" is 44BCE). There is no year 0, which the filter takes for "none".
int parse_year(std::string_view bound, const std::string& whole) {
  std::string_view text = trimmed(bound);
  if (text.empty()) return 0;
  int sign = 1;
  for (const auto& [era, era_sign] : {std::pair<std::string_view, int>{"BCE", -1}, {"BC", -1}, {"CE", 1}, {"AD", 1}}) {
    if (text.size() <= era.size()) continue;
    std::string tail(text.substr(text.size() - era.size()));
    for (char& c : tail) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    if (tail != era) continue;
    text = trimmed(text.substr(0, text.size() - era.size()));
    sign = era_sign;
    break;
  }
  if (text.empty() || text.size() > 4 || text.find_first_not_of("0123456789") != std::string_view::npos)
    throw Error(ErrorKind::usage, kYearsForm + whole + "'");
  const int year = std::stoi(std::string(text));
  if (year == 0)
    throw Error(ErrorKind::usage, "--years " + whole + ": there is no year 0; 1BCE is followed by 1");
  return sign * year;
}

}  // namespace

void ArchiveFilterOptions::add_to(CLI::App& command) {
  command.add_option("--folder", folder, "only files inside this folder (below an input folder, or a path)")
      ->check(not_blank())
      ->group("Sub-corpus");
  command.add_option("--author", author, "only texts one of whose header authors holds each word of this text, as a whole word (any order, letter case ignored; each text of a teiCorpus by its own header, else its corpus's)")
      ->check(not_blank())
      ->group("Sub-corpus");
  command.add_option("--years", years, "only segments dated in FROM-TO (1800-1850, 1800-, -1850, one year: 1850; before the common era: 450BCE-400BCE): a letter by its own date, else by its file's (the work's; docs/store.md)")
      ->check(not_blank())
      ->group("Sub-corpus");
  command.add_option("--language", language, "only segments in this language, their own or else their file's (de, en, eng, en-GB)")
      ->check(not_blank())
      ->group("Sub-corpus");
  command.add_option("--title", title, "only texts whose header title matches this pattern (* and ?, case ignored; each text of a teiCorpus by its own title or its corpus's)")
      ->check(not_blank())
      ->group("Sub-corpus");
}

store::ArchiveFilter ArchiveFilterOptions::to_filter() const {
  store::ArchiveFilter f;
  f.folder = folder;
  f.author = author;
  if (!author.empty() && author.find_first_not_of(store::kAuthorWordSeparators) == std::string::npos)
    throw Error(ErrorKind::usage, "--author '" + author + "': give a name, or a word of one (e.g. --author Tide)");
  f.language = language;
  if (!language.empty() && !is_language_code(language))
    throw Error(ErrorKind::usage, "--language " + language +
                                      ": not a language code; give an ISO 639 code, alone or in a BCP 47 tag, "
                                      "e.g. de, eng, en-GB");
  f.title = title;
  // Spaces around the whole are no part of it (" -0044" is -0044).
  const std::string range(trimmed(years));
  if (!years.empty() && range.empty())
    throw Error(ErrorKind::usage, kYearsForm + years + "'");
  if (!range.empty()) {
    auto dash = range.find('-');
    if (range.find_first_not_of("- ") == std::string::npos)
      throw Error(ErrorKind::usage, kYearsForm + range + "'");
    if (dash == std::string::npos) {
      f.year_from = f.year_to = parse_year(range, range);
    } else {
      f.year_from = parse_year(std::string_view(range).substr(0, dash), range);
      f.year_to = parse_year(std::string_view(range).substr(dash + 1), range);
      // "-0044" is how a header writes 44 BCE (XML Schema); as "up to 44" it would quietly
      // take the whole of antiquity. Early years as an upper bound alone need their era.
      const bool upper_without_era = range.find_first_not_of("0123456789 ", dash + 1) == std::string::npos;
      if (dash == 0 && f.year_to > 0 && f.year_to < 1000 && upper_without_era) {
        const std::string year = std::to_string(f.year_to);
        throw Error(ErrorKind::usage, "--years " + range + ": say which: -" + year + "CE for the years up to " + year +
                                          ", " + year + "BCE for the year a header writes -" +
                                          std::string(4 - year.size(), '0') + year + ", or -" + year +
                                          "BCE for the years up to that one");
      }
    }
    if (f.year_from && f.year_to && f.year_from > f.year_to)
      throw Error(ErrorKind::usage, "--years " + range + ": the first year is after the second" +
                                        (f.year_to < 0 && f.year_from > 0
                                             ? " (each year takes its own era: " + std::to_string(f.year_from) + "BCE-" +
                                                   std::to_string(-f.year_to) + "BCE)"
                                             : ""));
  }
  return f;
}

store::Shard parse_shard(const std::string& text) {
  const std::optional<store::Shard> parsed = store::shard_from_text(text);
  if (!parsed)
    throw Error(ErrorKind::usage, "--shard takes K/N, e.g. 2/8 (share K of N, counted from 1); got '" + text + "'");
  const store::Shard& s = *parsed;
  if (s.count < 1) throw Error(ErrorKind::usage, "--shard " + text + ": N, the number of shares, must be 1 or more");
  if (s.index < 1 || s.index > s.count)
    throw Error(ErrorKind::usage, "--shard " + text + ": K must lie between 1 and N");
  return s;
}

}  // namespace manicule::cli
