"""`annotate --unit letter --attribute --verify`: the notes for people name every letter so
that an editor can find it, and never show a conjectured sender as known. Checked against
the invented edition examples/ferry-letters.xml as lxml reads it, without our own code:
- a letter's sender is the text of correspDesc/correspAction[@type='sent']/persName, its
  correspDesc the one its @decls names (TEI P5 2.4.6); the sender is only conjectured
  where that persName has @cert other than "high" (TEI P5 att.global.responsibility, 21.1.2)
  or @evidence="conjecture";
- every letter with a sender is named "Name (ID)", or "Name (ID, conjectured)" when
  conjectured, wherever a note names it: in its own profile note, in the neighbour lists of
  the others, in its attribution and verification notes; a letter without a sender by its
  id alone;
- no sender's name stands in a note without an identifier after it: the letter's id, or,
  for a candidate, the person pointer (@ref, with the person's persName from listPerson);
  and no pointer stands without the person's name before it;
- the annotated edition still validates against tei_all.rng (jing).
"""
import os
import re
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import NS, PARSER, jing_errors  # noqa: E402

TEI = "{http://www.tei-c.org/ns/1.0}"
XML_ID = "{http://www.w3.org/XML/1998/namespace}id"
LETTERS = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
tmp = mtest.scratch_folder()

# --- the edition, read with lxml -------------------------------------------------------------
edition = etree.parse(LETTERS)
person_name = {p.get(XML_ID): p.find(TEI + "persName").text.strip()
               for p in edition.iter(TEI + "person") if p.find(TEI + "persName") is not None}
sender = {}  # correspDesc id -> (name or "", ref or "", conjectured)
for desc in edition.iter(TEI + "correspDesc"):
    sent = [a for a in desc.iter(TEI + "correspAction") if a.get("type") == "sent"]
    pers = sent[0].find(TEI + "persName") if sent else None
    if pers is None:
        sender[desc.get(XML_ID)] = ("", "", False)
        continue
    cert = pers.get("cert")
    conjectured = (cert is not None and cert != "high") or pers.get("evidence") == "conjecture"
    sender[desc.get(XML_ID)] = ("".join(pers.itertext()).strip(), pers.get("ref") or "", conjectured)
letters = {div.get(XML_ID): sender.get((div.get("decls") or "").lstrip("#"), ("", "", False))
           for div in edition.iter(TEI + "div") if div.get("type") == "letter"}
expected = {}  # letter id -> how a note must name it
for lid, (name, _, conjectured) in letters.items():
    expected[lid] = "%s (%s%s)" % (name, lid, ", conjectured" if conjectured else "") if name else lid
# The edition this test was written for has each kind: a sure sender, a conjectured one, a
# placeholder name without @ref, and no sender.
mtest.check(any(c for _, _, c in letters.values()), "no conjectured sender in the edition")
mtest.check(any(n and not r for n, r, _ in letters.values()), "no sender without @ref in the edition")
mtest.check(any(not n for n, _, _ in letters.values()), "no letter without a sender in the edition")

# --- the run -------------------------------------------------------------------------------
out = os.path.join(tmp, "annotated.xml")
mtest.run(["annotate", "--unit", "letter", "--min-tokens", "200", "--attribute", "--verify",
           "--resamples", "20", "--iterations", "40", "--output", out, LETTERS])
errors = jing_errors(mtest.SCHEMA, [out])
mtest.check(not any(errors.values()), "tei_all (jing) rejects the annotated edition: %s" % errors)
tree = etree.parse(out, PARSER)
annotations = tree.findall(".//tei:standOff[@type='stylometry']//tei:annotation", NS)
notes = {}  # annotation id -> its note for people (the caution is the same everywhere)
for ann in annotations:
    for note in ann.findall("tei:note", NS):
        if note.get("type") != "caution":
            notes[ann.get(XML_ID)] = (ann, note.text or "")

# Each letter's own notes name it as expected.
for ann, text in notes.values():
    target = ann.get("target").lstrip("#")
    if target not in letters:
        continue
    if ann.find("tei:ptr[@type='profile']", NS) is not None:
        mtest.check(text.startswith("Style profile of the letter %s: " % expected[target]),
                    "profile note of %s does not name it %r: %s" % (target, expected[target], text[:120]))
    elif "-attr-" in ann.get(XML_ID):
        mtest.check(text.startswith("Candidates for the letter %s" % expected[target]),
                    "attribution note of %s does not name it %r: %s" % (target, expected[target], text[:120]))
    else:
        mtest.check(text.startswith("General Impostors verification (Koppel & Winter 2014) of the letter %s against "
                                    % expected[target]),
                    "verification note of %s does not name it %r: %s" % (target, expected[target], text[:140]))

# Every letter with a sender is named "Name (ID)" / "Name (ID, conjectured)" somewhere.
everything = "\n".join(text for _, text in notes.values())
for lid, (name, _, conjectured) in letters.items():
    if name:
        mtest.check(expected[lid] in everything, "no note names %s as %r" % (lid, expected[lid]))
        if conjectured:  # never as if its sender were known
            mtest.check("%s (%s)" % (name, lid) not in everything,
                        "a note names %s as if %s were its known sender" % (lid, name))

# The candidates: "Name (#ref)" with the person's name from listPerson.
by_id = {e.get(XML_ID): e for e in tree.iter() if e.get(XML_ID)}
candidate_form = {"#" + pid: "%s (#%s)" % (n, pid) for pid, n in person_name.items()}
for ann, text in notes.values():
    if "-attr-" not in ann.get(XML_ID) and "-verif-" not in ann.get(XML_ID):
        continue
    fs = by_id[ann.find("tei:ptr[@type='result']", NS).get("target").lstrip("#")]
    named = [s.text for s in fs.iterfind(".//tei:f[@name='candidate']/tei:string", NS)]
    for c in named:
        mtest.check(c in candidate_form and candidate_form[c] in text,
                    "%s: candidate %s not named %r: %s" % (ann.get(XML_ID), c, candidate_form.get(c), text[:200]))

# Nothing else: once the expected letter labels and candidate forms are taken out, no
# sender's name, no letter id and no person pointer is left in any note.
for aid, (_, text) in notes.items():
    rest = text
    for form in sorted(list(expected.values()) + list(candidate_form.values()), key=len, reverse=True):
        rest = rest.replace(form, "\x00")
    for name in sorted(set(n for n, _, _ in letters.values() if n) | set(person_name.values())):
        mtest.check(not re.search(r"\b%s\b" % re.escape(name), rest),
                    "%s: the name %r stands without an id: %s" % (aid, name, text[:200]))
    for lid in letters:
        mtest.check(not re.search(r"\b%s\b" % re.escape(lid), rest),
                    "%s: letter %s is not named %r: %s" % (aid, lid, expected[lid], text[:200]))
    mtest.check("#" not in rest, "%s: a pointer without the person's name: %s" % (aid, text[:200]))

# A conjectured sender named without @ref is named as the edition writes it in the note
# of its letter's attribution, not in the folded form the candidates are keyed by.
conjectured = [(lid, name, ref) for lid, (name, ref, c) in letters.items() if c and ref]
mtest.check(conjectured, "no conjectured sender with @ref in the edition")
lid, name, ref = conjectured[0]
with open(LETTERS, encoding="utf-8") as f:
    source = f.read()
marked = re.search(r'<persName ref="%s"[^>]*cert="[^"]*"[^>]*>' % re.escape(ref), source)
mtest.check(marked is not None, "the conjectured persName of %s is not written as expected" % lid)
unreferenced = os.path.join(tmp, "no-ref.xml")
with open(unreferenced, "w", encoding="utf-8") as f:
    f.write(source.replace(marked.group(0), marked.group(0).replace(' ref="%s"' % ref, ""), 1))
out = os.path.join(tmp, "no-ref-annotated.xml")
mtest.run(["annotate", "--unit", "letter", "--min-tokens", "200", "--attribute", "--resamples", "20",
           "--output", out, unreferenced])
said = [n.text or "" for a in etree.parse(out, PARSER).iterfind(".//tei:annotation", NS)
        if a.get("target") == "#" + lid and "-attr-" in (a.get(XML_ID) or "")
        for n in a.findall("tei:note", NS) if n.get("type") != "caution"]
mtest.check(len(said) == 1 and ("The edition conjectures %s." % name) in said[0],
            "%s's attribution note does not give the conjecture as written (%r): %r" % (lid, name, said))

mtest.done()
