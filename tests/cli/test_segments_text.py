"""`segments --show-text`: the TSV text column of each letter of the invented ferry edition
is the letter's text as lxml reads it, without the elements README.md lists as left out
by the reading preset (their tails kept), with white space normalised as XPath 1.0's
normalize-space() does (runs of space, tab, CR and LF as one space, none at the ends;
a space also where the language changes, as the tokenizer starts a new word there).
Before, the edition's line breaks and indentation came out as long runs of spaces. The
JSON output keeps the text as the edition has it: the same characters.
"""
import json
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402
from reading_text import TEI, XML_ID, text_without_left_out  # noqa: E402
def normalize_space(text):  # XPath 1.0 normalize-space(): XML white space only
    for c in "\t\n\r":
        text = text.replace(c, " ")
    return " ".join(w for w in text.split(" ") if w)


letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
expected = {}
for div in etree.parse(letters).getroot().iter(TEI + "div"):
    if div.get("type") == "letter":
        parts = []
        text_without_left_out(div, parts)
        expected["ferry-letters#" + div.get(XML_ID)] = normalize_space("".join(parts))
mtest.check(len(expected) == 12, "lxml finds %d letters" % len(expected))

lines = [l for l in mtest.run(["segments", "--unit", "letter", "--show-text", letters]).stdout.splitlines()
         if not l.startswith("#")]
header = lines[0].split("\t")
rows = {cells[0]: cells[header.index("text")] for cells in (l.split("\t") for l in lines[1:])}
mtest.check(set(rows) == set(expected), "segments %r, lxml %r" % (sorted(rows), sorted(expected)))
# The same characters in the same order, white space aside: a change of language inside a
# letter (<foreign xml:lang="fr">de mystère</foreign>,) starts a new run of text, which the
# column shows with a space before it, where the tokenizer starts a new word too.
for segment, text in sorted(rows.items()):
    mtest.check(text.replace(" ", "") == expected[segment].replace(" ", ""),
                "%s: TSV text\n%r\nlxml, normalised:\n%r" % (segment, text[:300], expected[segment][:300]))
    mtest.check(text == text.strip() and "  " not in text and not any(c in text for c in "\t\n\r"),
                "%s: white space not normalised in %r" % (segment, text[:300]))

doc = json.loads(mtest.run(["segments", "--unit", "letter", "--show-text", "--format", "json", letters]).stdout)
for s in doc["segments"]:
    raw = " ".join(r["text"] for r in s["text"])
    mtest.check("\n" in raw, "%s: the JSON text keeps the edition's line breaks" % s["segment"])
    mtest.check("".join(raw.split()) == expected[s["segment"]].replace(" ", ""),
                "%s: the JSON text has other characters" % s["segment"])

mtest.done()
