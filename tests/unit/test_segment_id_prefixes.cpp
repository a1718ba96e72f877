// Unit tests for segment_id_prefixes (core/segment_id_prefixes.h): worked examples of its
// documented rule, written out by hand. A unique stem stays; files of one name get the
// shortest end of their path, in whole names, that tells the group apart; the whole path
// where nothing shorter does; and the result is well-formed UTF-8 (U+FFFD for a Latin-1
// byte, as the Unicode Standard's chapter 3.9 substitution gives for a lone 0xE9).
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "core/segment_id_prefixes.h"

using manicule::segment_id_prefixes;
using Paths = std::vector<std::string>;

TEST_CASE("segment id prefixes: unique stems stay", "[segment_id_prefixes]") {
  CHECK(segment_id_prefixes({"archive/ferry-letters.xml", "archive/plays/ferry-play.xml", "notes.v2.xml"}) ==
        Paths{"ferry-letters", "ferry-play", "notes.v2"});
  CHECK(segment_id_prefixes({}).empty());
}

TEST_CASE("segment id prefixes: one name in several folders", "[segment_id_prefixes]") {
  // Sibling folders: one folder name is enough; the file of another name keeps its stem.
  CHECK(segment_id_prefixes({"archive/1850/letters.xml", "archive/1851/letters.xml", "archive/index.xml"}) ==
        Paths{"1850/letters", "1851/letters", "index"});
  // The folders' own names repeat: two names are not enough, three are (for all three files).
  CHECK(segment_id_prefixes({"a/vol1/letters.xml", "b/vol1/letters.xml", "b/vol2/letters.xml"}) ==
        Paths{"a/vol1/letters", "b/vol1/letters", "b/vol2/letters"});
  // A file given without a folder is its whole path.
  CHECK(segment_id_prefixes({"letters.xml", "1850/letters.xml"}) == Paths{"letters", "1850/letters"});
  // Spellings of a path that differ only before the names compared: the whole paths.
  CHECK(segment_id_prefixes({"/data/letters.xml", "data/letters.xml"}) == Paths{"/data/letters", "data/letters"});
}

TEST_CASE("segment id prefixes: well-formed UTF-8", "[segment_id_prefixes]") {
  CHECK(segment_id_prefixes({"caf\xE9/letters.xml", "tea/letters.xml"}) ==
        Paths{"caf\xEF\xBF\xBD/letters", "tea/letters"});
}

TEST_CASE("segment id prefixes: paths alike but for the extension", "[segment_id_prefixes]") {
  // x.xml and x.tei in one folder: the names with their extension, with as many folder
  // names as the group's other ends have.
  CHECK(segment_id_prefixes({"c/x.xml", "c/x.tei", "c/y.xml"}) == Paths{"c/x.xml", "c/x.tei", "y"});
  CHECK(segment_id_prefixes({"1850/x.xml", "1851/x.xml", "1851/x.tei"}) ==
        Paths{"1850/x", "1851/x.xml", "1851/x.tei"});
  // Names alike once their bytes that are not UTF-8 are read as U+FFFD: numbered in byte
  // order of the paths (0xFE before 0xFF), the first without a number.
  CHECK(segment_id_prefixes({"a\xFF.xml", "a\xFE.xml"}) ==
        Paths{"a\xEF\xBF\xBD.xml~2", "a\xEF\xBF\xBD.xml"});
  // An end made for one group that another group's stem gives too (names ending .tei.xml,
  // common in TEI projects): the first in path order keeps it, the other takes the
  // shortest end of its path, with its extension, that no file has.
  CHECK(segment_id_prefixes({"c/x.tei", "c/x.xml", "c/x.tei.xml", "d/x.tei.xml"}) ==
        Paths{"c/x.tei", "c/x.xml", "x.tei.xml", "d/x.tei"});
  CHECK(segment_id_prefixes({"c/x.xml", "c/x.tei", "d/c/x.xml.xml", "e/x.xml.xml"}) ==
        Paths{"c/x.xml", "c/x.tei", "x.xml.xml", "e/x.xml"});
}
