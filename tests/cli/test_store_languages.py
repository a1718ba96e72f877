"""Archive store: an analysis over segments in more than one language says so, with the
segments of each language, and says it again when a later run reuses it; one over a single
language does not.

Three German plays (gerdracor) and three English novels (eltec-eng), one segment each
(--unit whole), all well over the 1,500 words an analysis takes by default. Each file's
language is read here with lxml from its xml:lang (XML 1.0, section 2.12: the attribute
is inherited, so the root's applies to its text). Two copies of the plays are written with
other spellings of German on the root: "ger", the ISO 639-2 bibliographic code, and
"de-AT", a BCP 47 tag with a region (RFC 5646); both are German, "de" by its primary
subtag (ISO 639-1), and must be counted with the other German play. Two more copies give
their text an xml:lang that cannot be read as a tag ("de_AT"): they take the root's, German.
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
# Other spellings of the same language range reuse that analysis: tags are read without
# regard to case (RFC 5646, section 2.1.1), and "eng" (ISO 639-2) is "en" (ISO 639-1).
for spelling in ("EN", "eng"):
    languages, measured = analyse("filtered", plays + novels, "--language", spelling, reused=True)
    mtest.check(measured == 3 and languages == {}, "--language %s: %d measured, note %r" % (spelling, measured, languages))

# A text whose xml:lang cannot be read as a tag ("de_AT": '_' is no BCP 47 separator, RFC
# 5646 section 2.1) takes its file's language, the root's (docs/store.md): two plays so
# written are German under --language de, and no segment is of unknown language.
unreadable = []
for path in (plays[0], plays[2]):
    tree = etree.parse(path)
    text = tree.getroot().find("{http://www.tei-c.org/ns/1.0}text")
    text.set(XML_LANG, "de_AT")
    copy = os.path.join(tmp, "de_AT-" + os.path.basename(path))
    tree.write(copy, xml_declaration=True, encoding="utf-8")
    mtest.check(root_language(copy) == "de", "%s: the root's xml:lang is %r" % (copy, root_language(copy)))
    unreadable.append(copy)
languages, measured = analyse("unreadable-tag", unreadable + novels[:1])
mtest.check(measured == 3 and languages == {"de": 2, "en": 1},
            "a text tagged de_AT: %d measured, languages %r; expected 3, de 2, en 1" % (measured, languages))
languages, measured = analyse("unreadable-tag-de", unreadable + novels[:1], "--language", "de")
mtest.check(measured == 2 and languages == {}, "--language de over texts tagged de_AT: %d measured, note %r"
            % (measured, languages))

# A play stripped of every xml:lang (lxml; it has no langUsage either) is of unknown
# language: the note counts the known languages and gives the unknown ones apart.
unknown = os.path.join(tmp, "untagged-" + PLAYS[0])
tree = etree.parse(plays[0])
for element in tree.iter():
    element.attrib.pop(XML_LANG, None)
tree.write(unknown, xml_declaration=True, encoding="utf-8")
mtest.check(not etree.parse(unknown).xpath("//@xml:lang|//*[local-name()='langUsage']"),
            "the untagged copy still names a language")
proc = mtest.run(["batch", unknown, plays[1], novels[0], "--store", os.path.join(tmp, "unknown.sqlite"), "--unit",
                  "whole", "--analyse", "--quiet"])
mtest.check("in 2 languages (de 1, en 1; 1 of unknown language)" in proc.stderr,
            "a segment of unknown language beside two known: %r" % proc.stderr)

# Only the segments measured count. Under word pairs, an English text of one word holds no
# pair (n-grams of a one-word text: none), so the feature table sets it aside: the two
# German plays alone are analysed, and no languages note may count the English one. The
# one-word text is invented here; its word count is checked with lxml.
one_word = os.path.join(tmp, "farewell.xml")
with open(one_word, "w", encoding="utf-8") as f:
    f.write('<TEI xmlns="http://www.tei-c.org/ns/1.0" xml:lang="en"><teiHeader><fileDesc><titleStmt><title>A card'
            '</title></titleStmt><publicationStmt><p>Invented for a test.</p></publicationStmt><sourceDesc><p>None.'
            '</p></sourceDesc></fileDesc></teiHeader><text><body><p>Farewell</p></body></text></TEI>')
words = "".join(etree.parse(one_word).getroot().find("{http://www.tei-c.org/ns/1.0}text").itertext()).split()
mtest.check(words == ["Farewell"], "the one-word text holds %r" % words)
languages, measured = analyse("word-pairs", plays[:2] + [one_word], "--features", "word-ngram", "--n", "2",
                              "--min-tokens", "1")
mtest.check(measured == 2, "word pairs: %d segments measured, expected the 2 plays" % measured)
mtest.check(languages == {}, "word pairs: the note counts a segment set aside: %r" % languages)

mtest.done()
