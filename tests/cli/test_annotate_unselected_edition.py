"""`annotate` over several editions, one of which holds nothing of the unit.

The invented play and letters annotated together with `--unit letter --in-place`: the play
has no letter (lxml: no div[@type='letter']), so it must stay byte for byte as it was
(hashlib), be named on stderr, and not be given as a place the letters' results point
into; the letters are annotated and still valid against tei_all (jing). Before, the play
got an empty listAnnotation, which tei_all rejects ("element listAnnotation incomplete").
"""
import hashlib
import os
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from standoff_check import jing_errors  # noqa: E402
from lxml import etree  # noqa: E402

TEI = "http://www.tei-c.org/ns/1.0"


def digest(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


with tempfile.TemporaryDirectory() as tmp:
    play = shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), tmp)
    letters = shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), tmp)
    mtest.check(not etree.parse(play).xpath("//tei:div[@type='letter']", namespaces={"tei": TEI}),
                "the example play holds a letter")
    before = digest(play)
    proc = mtest.run(["annotate", "--unit", "letter", "--min-tokens", "200", "--in-place", play, letters])
    mtest.check(digest(play) == before, "the play without letters was rewritten")
    mtest.check(play + ": no segment of this unit in it: left as it was" in proc.stderr
                and "wrote " + play not in proc.stderr, "the play's fate on stderr: %s" % proc.stderr)
    mtest.check(digest(letters) != digest(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")),
                "the letters were not annotated")
    desc = "".join(etree.parse(letters).find(".//{%s}appInfo/{%s}application/{%s}desc" % (TEI, TEI, TEI)).itertext())
    mtest.check("ferry-play.xml" not in desc and "Results point into: this document (SHA-256 %s" %
                digest(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")) in desc,
                "the letters' results said to point into the play: %r" % desc[-200:])
    errors = jing_errors(mtest.SCHEMA, [letters])
    mtest.check(not any(errors.values()), "tei_all (jing) rejects the annotated letters: %s" % errors)
mtest.done()
