"""A batch says how many of the files it read hold no segment of the unit asked for, and
asks whether the unit is the one meant when none does (a store of novels read with
--unit speaker held nothing, and the batch said only "93 read", exit 0).

Reference: lxml counts each file's segments by TEI P5's encoding of the units, as README's
"Using it" gives them: a speaker's speeches are `sp` elements with `@who` (TEI P5
7.2.2), a letter a `div[@type='letter']` or, in a text whose header describes a letter by
`correspDesc` (TEI P5 2.4.6), the whole body. The files are the invented ferry edition in
examples/ (a play and letters).
"""
import os
import re
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

NS = {"t": "http://www.tei-c.org/ns/1.0"}
UNIT_XPATH = {"speaker": "//t:text//t:sp[@who]",
              "letter": "//t:text//t:div[@type='letter']|//t:teiHeader//t:correspDesc"}

tmp = mtest.scratch_folder("manicule-unit-without-segments-")
both = os.path.join(tmp, "both")
letters_only = os.path.join(tmp, "letters-only")
for folder, names in ((both, ("ferry-letters.xml", "ferry-play.xml")), (letters_only, ("ferry-letters.xml",))):
    os.makedirs(folder)
    for name in names:
        shutil.copy(os.path.join(mtest.ROOT, "examples", name), folder)


def files_without(folder, unit):
    paths = [os.path.join(folder, n) for n in sorted(os.listdir(folder))]
    return sum(1 for p in paths if not etree.parse(p).xpath(UNIT_XPATH[unit], namespaces=NS)), len(paths)


said_anything = False
for folder in (both, letters_only):
    for unit in ("speaker", "letter"):
        empty, read = files_without(folder, unit)
        store = os.path.join(tmp, "%s-%s.sqlite" % (os.path.basename(folder), unit))
        proc = mtest.run(["batch", folder, "--store", store, "--unit", unit, "--quiet"])
        notes = [line for line in proc.stderr.splitlines() if "hold no segment" in line]
        if not empty:
            mtest.check(notes == [], "%s, --unit %s: lxml finds a segment in every file, yet %r" % (folder, unit, notes))
            continue
        said_anything = True
        expected = "%d of the %d file(s) read hold no segment of --unit %s" % (empty, read, unit)
        mtest.check(len(notes) == 1 and expected in notes[0],
                    "%s, --unit %s: %r, lxml gives %r" % (folder, unit, notes, expected))
        asks = bool(re.search(r"is it the unit meant\?", notes[0]))
        mtest.check(asks == (empty == read), "%s, --unit %s: asks whether the unit is meant: %r" % (folder, unit, notes))
        # A re-run reads nothing, so it has nothing to say of the files.
        again = mtest.run(["batch", folder, "--store", store, "--unit", unit, "--quiet"])
        mtest.check("hold no segment" not in again.stderr, "a re-run that read nothing: %r" % again.stderr)
mtest.check(said_anything, "lxml finds no file without segments: the test shows nothing")

mtest.done()
