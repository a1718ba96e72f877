"""A file whose name is not UTF-8 (Linux file names are bytes; an old archive's may be in
Latin-1, here "caf\\xe9-letters.xml") is read like any other: its JSON output is JSON, the
edition written back is well-formed and valid TEI, and the store takes it. Where its name
becomes text (segment ids, paths in JSON), the ill-formed byte reads as U+FFFD.

Outside references: Python's strict UTF-8 decoder and json module (RFC 8259 text must be
UTF-8), Python's UTF-8 decoder with errors="replace" for what the name reads as (the
Unicode Standard's U+FFFD substitution of maximal subparts, chapter 3.9), lxml for
well-formedness and jing with tei_all.rng for validity. Before, every JSON output stopped
with an internal error (exit 70) and annotate refused to write.
"""
import json
import os
import shutil
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

EXAMPLE = os.path.join(mtest.ROOT, "examples", "ferry-letters.xml")
NAME = b"caf\xe9-letters.xml"
STEM_AS_TEXT = b"caf\xe9-letters".decode("utf-8", errors="replace")  # "caf\ufffd-letters"
mtest.check(STEM_AS_TEXT == "caf\ufffd-letters", "Python reads the stem as %r" % STEM_AS_TEXT)

tmp = tempfile.mkdtemp(prefix="manicule-names-")
folder = os.path.join(tmp, "letters")
os.makedirs(folder)
latin1 = os.path.join(os.fsencode(folder), NAME)
shutil.copy(EXAMPLE, latin1)
common = ["--unit", "letter", "--min-tokens", "200"]


def run(*args):
    """Runs manicule with byte arguments; stdout and stderr as bytes."""
    return subprocess.run([os.fsencode(mtest.BIN)] + [a if isinstance(a, bytes) else a.encode() for a in args],
                          capture_output=True, timeout=300)


def json_of(proc, what):
    mtest.check(proc.returncode == 0, "%s: exit %d, %s" % (what, proc.returncode, proc.stderr.decode(errors="replace")))
    try:
        return json.loads(proc.stdout.decode("utf-8"))
    except (UnicodeDecodeError, ValueError) as e:
        mtest.fail("%s: not JSON in UTF-8: %s" % (what, e))


doc = json_of(run("segments", latin1, "--format", "json", "--unit", "letter"), "segments --format json")
ids = [s["segment"] for s in doc["segments"]]
mtest.check(ids and all(i.startswith(STEM_AS_TEXT + "#") for i in ids), "segment ids %r" % ids[:3])
mtest.check(doc["segments"][0]["file"] == latin1.decode("utf-8", errors="replace"),
            "the file as JSON text: %r" % doc["segments"][0]["file"])
for command in ("distances", "attribute"):
    json_of(run(command, latin1, "--format", "json", *common), command + " --format json")

# Written back: well-formed, valid against tei_all, the ids as above.
annotated = os.path.join(tmp, "annotated.xml")
proc = run("annotate", latin1, "--output", annotated, *common)
mtest.check(proc.returncode == 0 and os.path.exists(annotated), "annotate: exit %d, %s"
            % (proc.returncode, proc.stderr.decode(errors="replace")))
tree = etree.parse(annotated)
strings = {s.text for s in tree.iter("{http://www.tei-c.org/ns/1.0}string")}
mtest.check(any(t and t.startswith(STEM_AS_TEXT + "#") for t in strings), "no segment id in the standoff")
jing = subprocess.run(["jing", mtest.SCHEMA, annotated], capture_output=True, text=True)
mtest.check(jing.returncode == 0, "jing on the annotated edition: " + jing.stdout[-2000:])

# The store: the path kept as its bytes (SQLite stores what it is given), the analysis
# made, and its segment ids as above.
store = os.path.join(tmp, "letters.sqlite")
proc = run("batch", folder, "--store", store, "--analyse", "--quiet", *common)
mtest.check(proc.returncode == 0, "batch: exit %d, %s" % (proc.returncode, proc.stderr.decode(errors="replace")))
db = sqlite3.connect(store)
db.text_factory = bytes
paths = [r[0] for r in db.execute("SELECT path FROM files")]
segments = [r[0].decode("utf-8") for r in db.execute("SELECT segment FROM analysis_segments")]
db.close()
mtest.check(paths == [latin1], "stored paths %r" % paths)
mtest.check(segments and all(s.startswith(STEM_AS_TEXT + "#") for s in segments), "analysed ids %r" % segments[:3])

shutil.rmtree(tmp)
mtest.done()
