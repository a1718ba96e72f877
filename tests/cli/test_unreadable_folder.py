"""A folder below an input that cannot be listed is never left out in silence. A batch run
over an archive goes on with the rest, as it does past a file that fails: it names the
folder, exits 1 (some files failed), records the folder with the run, and keeps in the store
the files stored from there before; before, it took them for removed and deleted them (2
of 3 letters gone, exit 0). The other commands stop with exit 3 naming the folder.

The permission is taken away with chmod (POSIX: listing a folder needs its read and search
permission); the command runs as user 65534 (tests/pylib/as_nobody.py). The files the store
should keep are listed with os.walk before the chmod.
"""
import json
import os
import shutil
import sqlite3
import stat
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
import as_nobody  # noqa: E402

TEI = ('<TEI xmlns="http://www.tei-c.org/ns/1.0"><teiHeader><fileDesc><titleStmt><title>{title}</title>'
       '</titleStmt><publicationStmt><p>invented</p></publicationStmt><sourceDesc><p>invented</p></sourceDesc>'
       '</fileDesc></teiHeader><text><body><div type="chapter"><p>{text}</p></div></body></text></TEI>\n')
OPEN = stat.S_IRWXU | stat.S_IRGRP | stat.S_IXGRP | stat.S_IROTH | stat.S_IXOTH  # 0755

tmp = tempfile.mkdtemp(prefix="manicule-unlisted-")
os.chmod(tmp, OPEN)
archive = os.path.join(tmp, "letters")
hidden = os.path.join(archive, "1852")
os.makedirs(hidden)
for folder, name, text in [(archive, "to-the-printer.xml", "The proofs are late again."),
                           (hidden, "from-the-harbour.xml", "The ship sails on Thursday."),
                           (hidden, "from-the-mill.xml", "The wheel turns slowly now.")]:
    with open(os.path.join(folder, name), "w", encoding="utf-8") as f:
        f.write(TEI.format(title=name, text=text))
for folder in (archive, hidden):
    os.chmod(folder, stat.S_IRWXU | stat.S_IRWXG | stat.S_IRWXO)  # the store's user writes beside them
store_folder = os.path.join(tmp, "store")
os.makedirs(store_folder)
os.chmod(store_folder, stat.S_IRWXU | stat.S_IRWXG | stat.S_IRWXO)
store = os.path.join(store_folder, "letters.sqlite")

manicule = as_nobody.runner(tmp)


def stored_paths():
    db = sqlite3.connect(store)
    try:
        paths = sorted(r[0] for r in db.execute("SELECT path FROM files"))
        return paths, db.execute("SELECT count(*) FROM runs").fetchone()[0]
    finally:
        db.close()


expected = sorted(os.path.join(d, f) for d, _, fs in os.walk(archive) for f in fs if f.endswith(".xml"))
p = manicule("batch", archive, "--store", store, "--unit", "chapter", "--quiet")
mtest.check(p.returncode == 0, "first batch: exit %d, %s" % (p.returncode, p.stderr))
before, runs_before = stored_paths()
mtest.check(before == expected, "first batch stored %r, os.walk found %r" % (before, expected))

os.chmod(hidden, 0)
try:
    p = manicule("batch", archive, "--store", store, "--unit", "chapter", "--quiet")
    mtest.check(p.returncode == 1,
                "re-run with an unreadable folder: exit 1 expected, got %d (%s)" % (p.returncode, p.stderr))
    mtest.check(hidden in p.stderr and "cannot list the folder" in p.stderr and "denied" in p.stderr,
                "the message names the folder and the reason: " + p.stderr)
    after, runs_after = stored_paths()
    mtest.check(after == expected, "the store lost files under the unreadable folder: %r" % after)
    mtest.check(runs_after == runs_before + 1,
                "the re-run is not recorded: %d runs, %d before" % (runs_after, runs_before))
    db = sqlite3.connect(store)
    status, parameters = db.execute("SELECT status, parameters FROM runs ORDER BY run_id DESC LIMIT 1").fetchone()
    db.close()
    recorded = [f["path"] for f in json.loads(parameters).get("unlisted_folders", [])]
    mtest.check(status == "done" and recorded == [hidden], "the run records %s, %r" % (status, recorded))
    p = manicule("segments", archive, "--unit", "chapter")
    mtest.check(p.returncode == 3 and hidden in p.stderr and p.stdout == "",
                "segments over the archive: exit 3 naming the folder, nothing printed: %d %s"
                % (p.returncode, p.stderr))
finally:
    os.chmod(hidden, OPEN)
    shutil.rmtree(tmp)

mtest.done()
