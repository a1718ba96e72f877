// What to tell a user whose xpath: unit found nothing because an element name in it has no
// prefix. Apart from xpath_units.h (defined in xpath_units.cpp, beside the step reading it
// shares), so that the command line, which sees no libxml2 header, can say it too.
#pragma once
#include <string>

namespace manicule {

// For a unit that found no segment: when it is an xpath: unit with a location step, outside
// predicates and string literals, whose node test is an element name without a prefix
// ("//lg", "//div/tei:p": a name outside any namespace, never TEI's), a clause saying to
// write tei:NAME for the first such name; else "".
std::string unprefixed_name_hint(const std::string& unit);

}  // namespace manicule
