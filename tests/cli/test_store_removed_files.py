"""Archive store: files that leave the store are named, and a folder renamed reads as moved.

A review renamed a folder of 773 plays and deleted another: the run said "773 no longer
found" and nothing else; --verbose named only the files hashed, the runs table kept no
trace of the paths, and the files' rows were gone. Now, checked against os.walk before and
after (the paths that left) and hashlib (whose content is still in the archive): the
summary counts the files gone whose content is now under another path; --verbose names
every path that left ("removed: PATH"), in path order; and the run's parameters keep them
(`$.removed`, read with Python's sqlite3 and json modules).
"""
import json
import os
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402


def walk(folder):
    return sorted(os.path.join(d, n) for d, _, names in os.walk(folder) for n in names)



with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    names = storecheck.pick_plays(9)
    storecheck.copy_plays(names[:5], os.path.join(archive, "moving"))
    storecheck.copy_plays(names[5:], os.path.join(archive, "going"))
    store = os.path.join(tmp, "archive.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"])
    before = walk(archive)
    digest_before = {p: storecheck.sha256_of(p) for p in before}

    shutil.move(os.path.join(archive, "moving"), os.path.join(archive, "moved"))
    shutil.rmtree(os.path.join(archive, "going"))
    after = walk(archive)
    gone = sorted(set(before) - set(after))
    kept_contents = {storecheck.sha256_of(p) for p in after}
    # the paths gone whose content (as hashed before) the archive still holds somewhere
    moved = [p for p in gone if digest_before[p] in kept_contents]
    mtest.check(len(gone) == 9 and len(moved) == 5, "the archive changed as meant: %d gone, %d moved"
                % (len(gone), len(moved)))

    proc = mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet", "--verbose"])
    mtest.check("; %d no longer found (%d of them with their content now under another path: moved or renamed?)"
                % (len(gone), len(moved)) in proc.stdout, "the summary: %r" % proc.stdout)
    named = [l[len("removed: "):] for l in proc.stderr.splitlines() if l.startswith("removed: ")]
    mtest.check(named == gone, "--verbose names %r, gone: %r" % (named, gone))
    db = sqlite3.connect(store)
    parameters = json.loads(db.execute("SELECT parameters FROM runs ORDER BY run_id DESC LIMIT 1").fetchone()[0])
    held = sorted(r[0] for r in db.execute("SELECT path FROM files"))
    db.close()
    mtest.check(parameters.get("removed") == gone and held == after,
                "the run keeps %r; the store holds %r" % (parameters.get("removed"), held))

mtest.done()
