"""Archive store: `batch --verify-hashes`, the archive's fixity check, checks the store too.

docs/store.md calls a run with --verify-hashes the fixity check it is. A review overwrote one
page of a good store's segments table: every file's hash still matched the store's, and
the run said "93 hashed and known, 0 failing", exit 0, over a store whose segments could no
longer be read. Here a store of eight plays gets one leaf page of its segments table (found
with SQLite's dbstat table, Python's sqlite3 module) overwritten with random bytes; Python's
sqlite3 then finds it damaged (PRAGMA quick_check, the outside reference), and the run must
refuse it (exit 3, the store named as damaged) and leave its bytes as they were (hashlib).
The undamaged store passes the same run with exit 0.
"""
import os
import random
import shutil
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402



with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(8), archive)
    good = os.path.join(tmp, "good.sqlite")
    common = ["--unit", "speaker", "--quiet"]
    mtest.run(["batch", archive, "--store", good] + common)

    db = sqlite3.connect(good)
    page_size = db.execute("PRAGMA page_size").fetchone()[0]
    leaves = [r[0] for r in db.execute("SELECT pageno FROM dbstat WHERE name = 'segments' AND pagetype = 'leaf'")]
    db.close()
    mtest.check(len(leaves) >= 2, "the segments table has %d leaf page(s)" % len(leaves))
    damaged = os.path.join(tmp, "damaged.sqlite")
    shutil.copy(good, damaged)
    with open(damaged, "r+b") as f:
        f.seek((leaves[len(leaves) // 2] - 1) * page_size)  # dbstat counts pages from 1
        f.write(random.Random(7).randbytes(page_size))
    db = sqlite3.connect(damaged)
    try:
        reference = db.execute("PRAGMA quick_check").fetchone()[0]
    except sqlite3.DatabaseError as e:
        reference = str(e)
    db.close()
    mtest.check(reference != "ok", "SQLite finds the overwritten page whole: %r" % reference)
    # (Python's sqlite3 reading it leaves no log beside it: nothing was written.)
    before = storecheck.sha256_of(damaged)

    proc = mtest.run(["batch", archive, "--store", damaged, "--verify-hashes"] + common, check=False)
    mtest.check(proc.returncode == 3 and ("the store %s is damaged" % damaged) in proc.stderr
                and proc.stderr.count("\n") == 1,
                "batch --verify-hashes over a damaged store: exit %d, %r" % (proc.returncode, proc.stderr))
    mtest.check(storecheck.sha256_of(damaged) == before, "the refused run changed the damaged store's bytes")

    proc = mtest.run(["batch", archive, "--store", good, "--verify-hashes"] + common, check=False)
    mtest.check(proc.returncode == 0 and "8 hashed and known" in proc.stdout,
                "batch --verify-hashes over the whole store: exit %d, %s %s" % (proc.returncode, proc.stdout, proc.stderr))

mtest.done()
