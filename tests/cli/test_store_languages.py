"""Archive store: an analysis over segments in more than one language says so, with the
segments of each language, and says it again when a later run reuses it; one over a single
language does not.

Three German plays (gerdracor) and three English novels (eltec-eng), one segment each
(--unit whole), all well over the 1,500 words an analysis takes by default. Each file's
language is read here with lxml from its xml:lang (XML 1.0, section 2.12: the attribute
is inherited, so the root's applies to its text). Two copies of the plays are written with
other spellings of German on the root: "ger", the ISO 639-2 bibliographic code, and
"de-AT", a BCP 47 tag with a region (RFC 5646); both are German, "de" by its primary
subtag (ISO 639-1), and must be counted with the other German play.
"""
import os
import re
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

XML_LANG = "{http://www.w3.org/XML/1998/namespace}lang"
PLAYS = ["schiller-die-raeuber.xml", "lessing-emilia-galotti.xml", "buechner-dantons-tod.xml"]
NOVELS = ["ENG18400_Trollope.xml", "ENG18471_Bronte.xml", "ENG18610_Eliot.xml"]
NOTE = re.compile(r"note: the segments analysed are in (\d+) languages \(([^)]*)\)")

tmp = mtest.scratch_folder()
plays = [os.path.join(mtest.CORPORA, "gerdracor", name) for name in PLAYS]
novels = [os.path.join(mtest.CORPORA, "eltec-eng", name) for name in NOVELS]


def root_language(path):
    return etree.parse(path).getroot().get(XML_LANG)


# The corpora as this test takes them: German plays and English novels by their root's xml:lang.
for path in plays:
    mtest.check(root_language(path) == "de", "%s: xml:lang %r, expected de" % (path, root_language(path)))
for path in novels:
    mtest.check(root_language(path) == "en", "%s: xml:lang %r, expected en" % (path, root_language(path)))

# The second and third play under other spellings of German.
respelled = []
for path, tag in zip(plays[1:], ["ger", "de-AT"]):
    tree = etree.parse(path)
    tree.getroot().set(XML_LANG, tag)
    copy = os.path.join(tmp, tag + "-" + os.path.basename(path))
    tree.write(copy, xml_declaration=True, encoding="utf-8")
    respelled.append(copy)


def analyse(name, files, *extra, reused=False):
    """Runs batch --analyse over `files` into the store `name` (new, unless `reused`, when
    the analysis must come back unchanged from it); returns its notes' language counts ({}
    when it gives none) and the number of segments measured."""
    store = os.path.join(tmp, name + ".sqlite")
    mtest.check(os.path.exists(store) == reused, "%s: the store %s" % (name, "is missing" if reused else "exists"))
    proc = mtest.run(["batch"] + files + ["--store", store, "--unit", "whole", "--analyse", "--quiet"] + list(extra))
    mtest.check(("(unchanged, reused)" in proc.stdout) == reused,
                "%s: reused %s expected, got %r" % (name, reused, proc.stdout))
    measured = re.search(r"(\d+) segment\(s\) measured", proc.stdout + proc.stderr)
    mtest.check(measured is not None, "%s: no analysis line in %r" % (name, proc.stdout + proc.stderr))
    notes = NOTE.findall(proc.stderr)
    mtest.check(len(notes) <= 1, "%s: the languages note given %d times" % (name, len(notes)))
    if not notes:
        return {}, int(measured.group(1))
    count, listed = notes[0]
    languages = {}
    for part in listed.split(", "):
        language, segments = part.rsplit(" ", 1)
        languages[language] = int(segments)
    mtest.check(int(count) == len(languages), "%s: the note says %s languages but lists %r" % (name, count, languages))
    return languages, int(measured.group(1))


# Both languages: the note lists each with its segments (one a file here), most first.
languages, measured = analyse("mixed", plays[:1] + novels[:2])
mtest.check(measured == 3, "mixed: %d segments measured, expected 3" % measured)
mtest.check(languages == {"en": 2, "de": 1}, "mixed: languages %r, expected en 2, de 1" % languages)
# Run again over the same files, the stored analysis is reused and says the same.
languages, measured = analyse("mixed", plays[:1] + novels[:2], reused=True)
mtest.check(measured == 3 and languages == {"en": 2, "de": 1},
            "mixed, reused: %d measured, languages %r; expected 3, en 2, de 1" % (measured, languages))

# Three spellings of German count as one language.
languages, measured = analyse("respelled", plays[:1] + respelled + novels)
mtest.check(measured == 6, "respelled: %d segments measured, expected 6" % measured)
mtest.check(languages == {"de": 3, "en": 3}, "respelled: languages %r, expected de 3, en 3" % languages)

# One language, by the files chosen or by the filter: no note.
languages, measured = analyse("german", plays[:1] + respelled)
mtest.check(measured == 3 and languages == {}, "german: %d measured, note %r; expected 3 and none" % (measured, languages))
languages, measured = analyse("filtered", plays + novels, "--language", "en")
mtest.check(measured == 3 and languages == {}, "filtered: %d measured, note %r; expected 3 and none" % (measured, languages))

mtest.done()
