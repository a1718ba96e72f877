"""Archive store: one content analysed under two paths is said so.

A file copied into another folder of an archive is the same content (SHA-256, Python's
hashlib) under two paths. Both copies' segments are measured, each the other's nearest at
distance 0 (scipy's cosine distance of two equal rows), and they count twice in the
features' means; an editor who did not mean the copy cannot tell from the results. The
analysis must say which paths hold one content. An archive without a copy gets no such note.
"""
import os
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402
from standoff_check import NS  # noqa: E402

tmp = mtest.scratch_folder("manicule-store-copies-")
letters = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
archive = os.path.join(tmp, "archive")
for folder in ("kept", "copied"):
    os.makedirs(os.path.join(archive, folder))
original = shutil.copy(letters, os.path.join(archive, "kept", "ferry-letters.xml"))
copy = shutil.copy(letters, os.path.join(archive, "copied", "letters-again.xml"))
mtest.check(storecheck.sha256_of(original) == storecheck.sha256_of(copy), "the copy is not the same content")

store = os.path.join(tmp, "archive.sqlite")
mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])
proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"])
notes = [line for line in proc.stderr.splitlines() if "under more than one path" in line]
mtest.check(len(notes) == 1 and original in notes[0] and copy in notes[0] and notes[0].count(" = ") == 1,
            "no note naming the two paths of one content: %s" % proc.stderr)
# What the note warns of: each copied letter's nearest segment is its copy, at distance 0.
_, tables = storecheck.latest_analysis(store)
firsts = {segment: (neighbour, distance) for segment, rank, neighbour, distance in tables["neighbours"] if rank == 1}
# (lxml: the letter divs of the two copies)
letter_divs = sum(len(etree.parse(p).getroot().xpath("//tei:div[@type='letter']", namespaces=NS)) for p in (original, copy))
mtest.check(len(firsts) == letter_divs and all(d < 1e-12 and n.split("#")[1] == s.split("#")[1] for s, (n, d) in firsts.items()),
            "the copies are not each other's nearest at distance 0: %r" % sorted(firsts.items())[:3])

# Forty copies of one content (hashlib: one SHA-256 for all): the note names two paths and
# counts the others, rather than one line of every path (a review: 24,000 characters for
# 500 copies, in the run's stored notes too).
many = os.path.join(tmp, "many")
for i in range(40):
    os.makedirs(os.path.join(many, "c%02d" % i))
    shutil.copy(letters, os.path.join(many, "c%02d" % i, "ferry-letters.xml"))
digests = {storecheck.sha256_of(os.path.join(many, "c%02d" % i, "ferry-letters.xml")) for i in range(40)}
many_store = os.path.join(tmp, "many.sqlite")
mtest.run(["batch", many, "--store", many_store, "--unit", "letter", "--quiet"])
proc = mtest.run(["analyse-store", "--store", many_store, "--min-tokens", "200"])
notes = [line for line in proc.stderr.splitlines() if "under more than one path" in line]
mtest.check(len(digests) == 1 and len(notes) == 1 and notes[0].count(" = ") == 1 and "and 38 more" in notes[0]
            and len(notes[0]) < 600, "the note of 40 copies: %r" % notes[:1])

# With the copy gone, no such note.
os.remove(copy)
mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"])
proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"])
mtest.check("under more than one path" not in proc.stderr, "a note of copies where none is left: " + proc.stderr)

mtest.done()
