"""Archive store: many failing files are counted past a screenful, and all are findable.

A review's archive held 761 files cut short: every run, `nothing changed` and `-q` ones
included, printed all 761 `manicule: failed:` lines, and the run's summary scrolled off the
terminal. Here 25 invented letters are cut short (malformed XML; lxml refuses each, the
outside reference) beside three whole ones: a batch names the first ten in path order
(Python's sorted over the paths, which is byte order for these ASCII names), then one line
with how many more and where they are all listed; that query, run by Python's sqlite3,
lists all 25; `--verbose` names all 25 with their reasons; a run that finds nothing
changed counts them the same way; and twenty failing files are all named.
"""
import os
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
from lxml import etree  # noqa: E402

LETTER = ('<TEI xmlns="http://www.tei-c.org/ns/1.0"><teiHeader><fileDesc><titleStmt><title>Letter %d</title>'
          '</titleStmt><publicationStmt><p>invented</p></publicationStmt><sourceDesc><p>invented</p></sourceDesc>'
          '</fileDesc></teiHeader><text><body><div type="letter" xml:id="L%d"><p>The tide came in at %d and '
          'the ferry waited at the quay.</p></div></body></text></TEI>')

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "letters")
    os.makedirs(archive)
    broken = []
    for i in range(28):
        path = os.path.join(archive, "letter-%02d.xml" % i)
        text = LETTER % (i, i, i)
        if i >= 3:
            text = text[:len(text) // 2]  # cut short
            broken.append(path)
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
    refused = 0
    for path in broken:
        try:
            etree.parse(path)
        except etree.XMLSyntaxError:
            refused += 1
    mtest.check(refused == 25, "lxml refuses %d of the 25 cut files" % refused)

    store = os.path.join(tmp, "letters.sqlite")
    query = "SELECT path, error FROM file_list WHERE status = 'failed'"
    for run in ("first", "nothing changed"):
        proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
        lines = [l for l in proc.stderr.splitlines() if l.startswith("manicule: failed: ")]
        named = [l[len("manicule: failed: "):].split(":")[0] for l in lines]
        mtest.check(proc.returncode == 1 and named == sorted(broken)[:10],
                    "%s run: exit %d, %d failure line(s), named %r" % (run, proc.returncode, len(lines), named))
        more = [l for l in proc.stderr.splitlines() if "more failing file(s) not named here" in l]
        mtest.check(len(more) == 1 and "note: 15 more" in more[0] and query in more[0],
                    "%s run: the line of the others %r" % (run, more))
    db = sqlite3.connect(store)
    listed = sorted(path for path, _ in db.execute(query))
    db.close()
    mtest.check(listed == sorted(broken), "the query the line gives lists %d of the 25" % len(listed))
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet", "--verbose"], check=False)
    reasons = [l for l in proc.stderr.splitlines() if l.startswith("manicule: failed: ")]
    mtest.check(len(reasons) == 25 and all(":1:" in l for l in reasons),
                "--verbose: %d failure line(s): %r" % (len(reasons), reasons[:2]))

    # Twenty failing are all named, with no count of others (the bound is "past twenty").
    for path in sorted(broken)[20:]:
        os.remove(path)
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
    named = [l for l in proc.stderr.splitlines() if l.startswith("manicule: failed: ")]
    mtest.check(len(named) == 20 and "not named here" not in proc.stderr,
                "twenty failing: %d named, %r" % (len(named), proc.stderr[-300:]))

mtest.done()
