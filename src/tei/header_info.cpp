#include "tei/header_info.h"

#include <algorithm>
#include <cctype>
#include <utility>

#include <unicode/unistr.h>

namespace manicule {

int first_year(const std::string& date) {
  for (std::size_t i = 0; i < date.size();) {
    if (!std::isdigit(static_cast<unsigned char>(date[i]))) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < date.size() && std::isdigit(static_cast<unsigned char>(date[j]))) ++j;
    // ISO 8601 and XML Schema write a year before the common era with a minus: "-0400".
    if (j - i == 4) return (i == 1 && date[0] == '-' ? -1 : 1) * std::stoi(date.substr(i, 4));
    i = j;
  }
  return 0;
}

bool better_date(const std::string& kept, const std::string& candidate) {
  if (candidate.empty()) return false;
  return kept.empty() || (first_year(kept) == 0 && first_year(candidate) != 0);
}

namespace {

bool is_digit(char c) { return c >= '0' && c <= '9'; }

// Whether `zone` is an XML Schema time zone, or nothing: "", "Z", "+01:00", "-05:00".
bool is_time_zone(const std::string& zone) {
  if (zone.empty() || zone == "Z") return true;
  return zone.size() == 6 && (zone[0] == '+' || zone[0] == '-') && is_digit(zone[1]) && is_digit(zone[2]) &&
         zone[3] == ':' && is_digit(zone[4]) && is_digit(zone[5]);
}

// What an XML Schema date (gYear, gYearMonth, date, dateTime: TEI's teidata.temporal.w3c)
// gives after its year, without a time zone ("-05-07" of "1876-05-07" and of
// "1876-05-07+01:00", "" of "1876"): it orders the dates of one year as written, the less
// precise first. "~", after every such part, for a date written otherwise ("15 May 1876"),
// so that a date of that year in that form comes first.
std::string within_year(const std::string& d) {
  std::size_t at = !d.empty() && d[0] == '-' ? 1 : 0;
  for (std::size_t end = at + 4; at < end; ++at)
    if (at >= d.size() || !is_digit(d[at])) return "~";
  const std::string rest = d.substr(at);
  // "-" and two digits at `i` of rest
  const auto dash_two_digits = [&](std::size_t i) {
    return i + 2 < rest.size() && rest[i] == '-' && is_digit(rest[i + 1]) && is_digit(rest[i + 2]);
  };
  if (is_time_zone(rest)) return "";                                                    // YYYY
  if (dash_two_digits(0) && is_time_zone(rest.substr(3))) return rest.substr(0, 3);     // YYYY-MM
  if (dash_two_digits(0) && dash_two_digits(3)) {
    if (is_time_zone(rest.substr(6))) return rest.substr(0, 6);                         // YYYY-MM-DD
    if (rest[6] == 'T') return rest;                                                    // YYYY-MM-DDThh:mm:ss
  }
  return "~";
}

// The earliest of `dates` by year, then within the year as within_year orders them (the
// first written among equals); nullptr when none has a year.
const std::string* earliest_dated(const std::vector<std::string>& dates) {
  const std::string* earliest = nullptr;
  std::pair<int, std::string> earliest_key;
  for (const std::string& d : dates) {
    const int year = first_year(d);
    if (year == 0) continue;
    std::pair<int, std::string> key{year, within_year(d)};
    if (!earliest || key < earliest_key) {
      earliest = &d;
      earliest_key = std::move(key);
    }
  }
  return earliest;
}

}  // namespace

// The date of the work rather than of the file: when the text was made (creation), else
// when its earliest letter was sent, else its earliest dated event (written, printed,
// first performed), else its first edition, else the source's date, else the header's
// first (docs/store.md, "Sub-corpora"). The first of these with a year wins, so that a
// creation "in the spring" does not hide a first edition of 1850; without any year, the
// first as written.
std::string work_date(const HeaderInfo& h, bool with_sending) {
  const std::string* sent = with_sending ? earliest_dated(h.sent_dates) : nullptr;
  const std::string* event = earliest_dated(h.event_dates);
  if (with_sending && !sent && !h.sent_dates.empty()) sent = &h.sent_dates.front();
  if (!event && !h.event_dates.empty()) event = &h.event_dates.front();
  const std::string* in_order[] = {&h.creation_date, sent, event, &h.first_edition_date, &h.source_date, &h.date};
  for (const std::string* d : in_order)
    if (d && first_year(*d) != 0) return *d;
  for (const std::string* d : in_order)
    if (d && !d->empty()) return *d;
  return {};
}

std::string normalise_space(const std::string& text) {
  std::string out;
  out.reserve(text.size());
  bool space = false;
  for (char c : text) {
    if (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
      space = !out.empty();
    } else {
      if (space) out.push_back(' ');
      space = false;
      out.push_back(c);
    }
  }
  return out;
}

std::string join_authors(const std::vector<std::string>& authors) {
  std::string out;
  std::vector<const std::string*> given;
  for (const auto& a : authors) {
    // One author named twice in a header (a copy of the same <author>) is one author.
    if (std::any_of(given.begin(), given.end(), [&](const std::string* g) { return *g == a; })) continue;
    given.push_back(&a);
    if (!out.empty()) out += kAuthorSeparator;
    out += a;
  }
  return out;
}

bool is_queried_name(const std::string& name) { return name.find('?') != std::string::npos; }

bool is_placeholder_name(const std::string& name) {
  std::string folded;
  icu::UnicodeString::fromUTF8(normalise_space(name)).foldCase().toUTF8String(folded);
  std::string bare;
  for (char c : folded) {
    if (c != '[' && c != ']' && c != '(' && c != ')' && c != '?' && c != '.' && c != ' ') bare += c;
  }
  static const char* const placeholders[] = {"",        "unknown", "nn",      "anonym",
                                             "anonymous", "anon",  "unbekannt", "anonyme",
                                             "inconnu", "ignoto",  "xx",      "x"};
  for (const char* p : placeholders) {
    if (bare == p) return true;
  }
  return false;
}

}  // namespace manicule
