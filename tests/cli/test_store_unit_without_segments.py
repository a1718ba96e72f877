"""A batch says how many of the files it read hold no segment of the unit asked for, and
asks whether the unit is the one meant when none does (a store of novels read with
--unit speaker held nothing, and the batch said only "93 read", exit 0). The analysis of
such a store names the unit; analyse-store given --unit says that the unit is the store's;
a segment without a word, left out under --min-tokens 0 too, is said to hold none.

Reference: lxml counts each file's segments by TEI P5's encoding of the units, as README's
"Using it" gives them: a speaker's speeches are `sp` elements with `@who` (TEI P5
7.2.2), a letter a `div[@type='letter']` or, in a text whose header describes a letter by
`correspDesc` (TEI P5 2.4.6), the whole body. The files are the invented ferry edition in
examples/ (a play and letters).
"""
import os
import random
import re
import shutil
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from invented_letters import write_letters, zipf_words  # noqa: E402
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

# A re-run that reads only a file without letters into a store holding letters counts it,
# but asks nothing: the store's other files hold segments of the unit (the store's
# segments table, read with sqlite3).
store = os.path.join(tmp, "letters-only-letter.sqlite")
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), letters_only)
held = storecheck.rows(store, "SELECT count(*) FROM segments")[0][0]
proc = mtest.run(["batch", letters_only, "--store", store, "--unit", "letter", "--quiet"])
notes = [line for line in proc.stderr.splitlines() if "hold no segment" in line]
mtest.check(held > 0 and len(notes) == 1 and "1 of the 1 file(s) read" in notes[0] and "unit meant" not in notes[0],
            "a re-run reading one play into a store of %d letters: %r" % (held, notes))
os.remove(os.path.join(letters_only, "ferry-play.xml"))

# The analysis of such a store names the unit it lacks, and analyse-store given --unit (the
# unit is the store's, read by batch) says where the unit comes from rather than CLI11's
# "not expected" (exit 2, README's usage error).
proc = mtest.run(["analyse-store", "--store", os.path.join(tmp, "letters-only-speaker.sqlite")], check=False)
mtest.check(proc.returncode == 4 and "hold no segment of --unit speaker" in proc.stderr,
            "analysing a store without a segment of its unit: exit %d, %s" % (proc.returncode, proc.stderr))
proc = mtest.run(["analyse-store", "--store", os.path.join(tmp, "both-letter.sqlite"), "--unit", "letter"], check=False)
mtest.check(proc.returncode == 2 and "batch --unit" in proc.stderr and "--list-settings" in proc.stderr,
            "analyse-store --unit: exit %d, %s" % (proc.returncode, proc.stderr))

# A segment without a word is left out under any --min-tokens, 0 too; the note says so
# rather than "shorter than the minimum of 0 words". lxml counts the letters whose text is
# empty (TEI P5 div[@type='letter'] of invented letters, one of them empty).
empty_letters = os.path.join(tmp, "empty-letter")
os.makedirs(empty_letters)
rng = random.Random(7)
path = write_letters(empty_letters, "short.xml", [("L%d" % k, "p%d" % (k % 2), "Writer %d" % (k % 2),
                                                    zipf_words(rng, 60, {}) if k else []) for k in range(4)])
empty = sum(1 for d in etree.parse(path).iter("{%s}div" % NS["t"]) if not "".join(d.itertext()).split())
store = os.path.join(tmp, "empty-letter.sqlite")
mtest.run(["batch", empty_letters, "--store", store, "--unit", "letter", "--quiet"])
proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "0"], check=False)
expected = "%d segment(s) left out, shorter than the minimum of 1 word: they hold none" % empty
mtest.check(empty == 1 and expected in proc.stderr, "--min-tokens 0 with an empty letter: %s; expected %r"
            % (proc.stderr, expected))

mtest.done()
