"""Letter senders given by a pointer into their own file (`<persName ref="#p1">`), where two
files give one id to two people.

An xml:id is unique in its document alone (W3C xml:id 1.0), so "#p1" of one edition and
"#p1" of another need not be one person. The senders were pooled into one candidate, so
that Anna Brink's letters and Kit Dunnock's stood for one hand. docs/attribution.md: where
one id names people of different names in different files, each name is a candidate of its
own, labelled by the first file (by stem) that gives it, "brink#p1"; a name the same in
every file is one person. Reference: lxml reads each letter's sender pointer and name (the
editions are invented and valid by jing); the candidates expected follow from them by that
rule, for `attribute` on the files and for `analyse-store --attribute` over a store, and
the annotation written into an edition points each candidate at its own file's person.
"""
import json
import os
import random
import shutil
import sys
import unicodedata

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from invented_letters import write_letters, zipf_words  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import NS, jing_errors  # noqa: E402

tmp = mtest.scratch_folder("manicule-sender-ids-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
rng = random.Random(20261205)
ANNA = {"the": 1.6, "of": 0.6, "which": 3.0}
KIT = {"and": 1.8, "so": 3.0, "then": 2.5}


def letters(prefix, count, key, name, bias):
    return [("%s%d" % (prefix, k + 1), key, name, zipf_words(rng, 450, bias)) for k in range(count)]


paths = [
    # Anna Brink is p1 of her own edition, which also keeps one letter signed "Unknown"
    write_letters(archive, "brink.xml", letters("b", 3, "p1", "Anna Brink", ANNA)
                  + letters("q", 1, "unknown", "Unknown", ANNA)),
    # and Kit Dunnock p1 of his
    write_letters(archive, "dunnock.xml", letters("d", 3, "p1", "Kit Dunnock", KIT)),
    # while a third edition gives Anna Brink the same id as the first
    write_letters(archive, "wren.xml", letters("w", 2, "p1", "Anna Brink", ANNA)),
    # and a fourth ascribes a letter to her with a query ("[Anna Brink?]": a conjecture)
    write_letters(archive, "lark.xml", letters("c", 1, "p1", "[Anna Brink?]", ANNA)),
]
invalid = {p: e for p, e in jing_errors(mtest.SCHEMA, paths).items() if e}
mtest.check(not invalid, "the invented editions are not valid TEI: %r" % invalid)

# lxml: each letter's sender pointer and name (its correspDesc, named by @decls).
senders = {}  # segment id -> (pointer, name)
for path in paths:
    root = etree.parse(path).getroot()
    stem = os.path.splitext(os.path.basename(path))[0]
    for div in root.iter("{%s}div" % NS["tei"]):
        desc = root.xpath("//tei:correspDesc[@xml:id=$id]", namespaces=NS, id=div.get("decls")[1:])[0]
        pers = desc.find("tei:correspAction/tei:persName", NS)
        senders[stem + "#" + div.get("{http://www.w3.org/XML/1998/namespace}id")] = (pers.get("ref"), pers.text)
# The rule: a pointer whose names differ between files (among the letters the edition is
# sure of) is labelled per name by the first file (by stem) that gives that name; a
# placeholder ("Unknown") is no sender, and a queried name ("[Anna Brink?]") a conjecture,
# which takes the label of the same name without its query marks.
def queried(name):
    return "?" in name


def plain(name):
    return name.replace("[", "").replace("]", "").replace("?", "")


names_of = {}
for segment, (pointer, name) in senders.items():
    if name != "Unknown" and not queried(name):
        names_of.setdefault(pointer, {}).setdefault(name, set()).add(segment.split("#")[0])


def label_of(pointer, name):
    return min(names_of[pointer][plain(name)]) + pointer if len(names_of[pointer]) > 1 else pointer


expected = {label_of(p, n) for p, n in senders.values() if n != "Unknown" and not queried(n)}
conjectures = {s: label_of(p, n) for s, (p, n) in senders.items() if queried(n)}
mtest.check(expected == {"brink#p1", "dunnock#p1"} and conjectures == {"lark#c1": "brink#p1"},
            "the rule gives %r and %r" % (sorted(expected), conjectures))

# On the files.
doc = json.loads(mtest.run(["attribute", "--unit", "letter", "--min-tokens", "200", "--format", "json"] + paths).stdout)
for result in doc["attributions"]:
    got = {c["candidate"] for c in result["candidates"]}
    mtest.check(got == expected, "attribute ranked %r for %s; the rule gives %r" % (sorted(got), result["segment"],
                                                                                   sorted(expected)))
mtest.check(sorted(r["segment"] for r in doc["attributions"]) == ["brink#q1", "lark#c1"],
            "questioned: %r" % doc["attributions"])
for result in doc["attributions"]:
    mtest.check(result.get("edition_conjecture", "") == conjectures.get(result["segment"], ""),
                "%s: the edition's conjecture given as %r, the rule gives %r" % (
                    result["segment"], result.get("edition_conjecture"), conjectures.get(result["segment"])))
said = json.dumps(doc)
mtest.check("sender #p1 names different people" in said, "no warning that #p1 names two people: " + said[:2000])

# The same editions named with a '#' in their file names ("ed#brink.xml"; a segment id is
# "ed#brink#b1"): the files are still told apart by their whole names.
hashed = os.path.join(tmp, "hashed")
os.makedirs(hashed)
hashed_paths = [shutil.copy(p, os.path.join(hashed, "ed#" + os.path.basename(p))) for p in paths]
doc = json.loads(mtest.run(["attribute", "--unit", "letter", "--min-tokens", "200", "--format", "json"]
                           + hashed_paths).stdout)
got = {c["candidate"] for result in doc["attributions"] for c in result["candidates"]}
mtest.check(got == {"ed#" + label for label in expected}, "with '#' in the file names: %r" % sorted(got))

# Over a store.
store = os.path.join(tmp, "letters.sqlite")
mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])
mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--attribute"])
run, _ = storecheck.latest_analysis(store)
stored = {c for (c,) in storecheck.rows(store, "SELECT DISTINCT candidate FROM attributions WHERE run_id = ?", (run,))}
mtest.check(stored == expected, "analyse-store --attribute ranked %r; the rule gives %r" % (sorted(stored), sorted(expected)))

# Written into Anna Brink's edition: each candidate points at its own file's person.
mtest.run(["annotate", "--unit", "letter", "--min-tokens", "200", "--attribute", "--in-place"] + paths)
root = etree.parse(paths[0]).getroot()
pointers = {s.text: s.get("corresp") for s in root.xpath("//tei:fs[@type='candidateDistance']/tei:f[@name='candidate']"
                                                         "/tei:string", namespaces=NS)}
mtest.check(pointers.get("brink#p1") == "#p1" and pointers.get("dunnock#p1") == "dunnock.xml#p1",
            "candidate pointers in brink.xml: %r" % pointers)
# and the notes name each by the name its letters give (lxml: the persName), beside its label
notes = " ".join(n.text or "" for n in root.iter("{%s}note" % NS["tei"]) if "dunnock#p1" in (n.text or ""))
mtest.check("Kit Dunnock (dunnock#p1)" in notes and "Anna Brink (brink#p1)" in notes,
            "the notes do not name the candidates: %r" % notes[:600])
errors = jing_errors(mtest.SCHEMA, [paths[0]])[paths[0]]
mtest.check(not errors, "tei_all (jing) rejects the annotated edition: %s" % errors)

# One person written in different ways in different files: letter case beyond ASCII, a
# decomposed letter, doubled or no-break spaces, a closing full stop. docs/attribution.md:
# names are compared in NFC, case-folded, with white space runs made one and the full stops,
# commas, colons and semicolons that end them dropped. The reference: Python's
# unicodedata.normalize("NFC") and str.casefold() (Unicode full case folding, which for
# the letters used here agrees with the simple folding; Unicode CaseFolding.txt).
variants = os.path.join(tmp, "variants")
os.makedirs(variants)
VANE = {"the": 1.6, "of": 0.6, "which": 3.0}
spellings = [("vane.xml", "v", "\u00c4nne Vane"), ("vane-copyist.xml", "w", "\u00c4NNE VANE."),
             ("vane-draft.xml", "x", "A\u0308nne\u00a0 Vane"), ("moss.xml", "m", "Kit Moss")]
variant_paths = [write_letters(variants, f, letters(prefix, 2, "p1", name, VANE if "oss" not in name else KIT))
                 for f, prefix, name in spellings]
variant_paths.append(write_letters(variants, "zz-unsigned.xml", letters("u", 1, "unknown", "Unknown", VANE)))
invalid = {p: e for p, e in jing_errors(mtest.SCHEMA, variant_paths).items() if e}
mtest.check(not invalid, "the invented editions are not valid TEI: %r" % invalid)


def reference_key(name):
    key = " ".join(unicodedata.normalize("NFC", name).casefold().split())
    return key.rstrip(".,;: ")


stems_of = {}  # reference key -> stems giving it (lxml: each letter's persName)
for path in variant_paths:
    root = etree.parse(path).getroot()
    for pers in root.iterfind(".//tei:correspAction/tei:persName", NS):
        if pers.text != "Unknown":
            stems_of.setdefault(reference_key(pers.text), set()).add(os.path.splitext(os.path.basename(path))[0])
expected = {min(stems) + "#p1" for stems in stems_of.values()} if len(stems_of) > 1 else {"#p1"}
mtest.check(expected == {"moss#p1", "vane#p1"}, "the reference gives %r" % sorted(expected))
doc = json.loads(mtest.run(["attribute", "--unit", "letter", "--min-tokens", "200", "--format", "json"]
                           + variant_paths).stdout)
got = {c["candidate"] for result in doc["attributions"] for c in result["candidates"]}
mtest.check(got == expected, "one person spelt variously: candidates %r, the reference gives %r" % (sorted(got),
                                                                                                  sorted(expected)))

mtest.done()
