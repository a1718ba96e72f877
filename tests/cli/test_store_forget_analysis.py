"""Archive store: docs/store.md's commands that remove one analysis do so, and only that.

A review at scale found each analysis adding about 20 MB to a store and no documented way
to remove one. docs/store.md now shows an sqlite3 script (after the marker
`<!-- forget-analysis -->`); run here as printed, by the sqlite3 shell, with the store's
name and the run's id put in, on a store holding three analyses of ten plays (one with
--pca, so that every table of an analysis holds its rows but attributions: no play has a
questioned segment). Checked with Python's sqlite3: no row of that run
is left in any table that has a run_id column (found from sqlite_master, not from the
script); the other analyses' rows are as they were; PRAGMA integrity_check; the file is
smaller after VACUUM (os.path.getsize); a batch run's id given to the script removes
nothing; and analyse-store asking the removed question again makes a new run.
"""
import os
import re
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

with open(os.path.join(mtest.ROOT, "docs", "store.md"), encoding="utf-8") as f:
    doc = f.read()
block = re.search(r"<!-- forget-analysis -->\n```sh\n(.*?)```", doc, re.S)
mtest.check(block is not None, "docs/store.md shows no script to remove an analysis")
script = block.group(1) if block else ""


def run_tables(path):
    """{table: rows} of every table with a run_id column, each row led by its run_id."""
    db = sqlite3.connect(path)
    names = [n for (n,) in db.execute("SELECT name FROM sqlite_master WHERE type = 'table'")
             if any(c[1] == "run_id" for c in db.execute("PRAGMA table_info(%s)" % n))]
    out = {n: sorted(db.execute("SELECT run_id, * FROM %s" % n), key=repr) for n in names}
    db.close()
    return out


def forget(store, run, cwd):
    mtest.check("archive.sqlite" in script and ".parameter set :run 4" in script,
                "the script no longer names archive.sqlite and run 4: %r" % script)
    text = script.replace("archive.sqlite", store).replace(".parameter set :run 4", ".parameter set :run %d" % run)
    subprocess.run(["bash", "-c", text], check=True, capture_output=True, text=True, cwd=cwd)


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "plays")
    storecheck.copy_plays(storecheck.pick_plays(10), archive)
    store = os.path.join(tmp, "plays.sqlite")
    mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"])
    asked = [["--min-tokens", "300", "--pca"], ["--min-tokens", "300", "--neighbours", "3"], ["--min-tokens", "500"]]
    runs = []
    for args in asked:
        out = mtest.run(["analyse-store", "--store", store, "--quiet", "--attribute"] + args).stdout
        runs.append(int(re.search(r"analysis run (\d+)", out).group(1)))
    before = run_tables(store)
    size_before = os.path.getsize(store)
    mtest.check(all(any(r[0] == runs[0] for r in rows) for t, rows in before.items() if t not in ("attributions", "readings")),
                "the first analysis is not in every table: %r" % {t: len(r) for t, r in before.items()})

    forget(store, runs[0], tmp)
    after = run_tables(store)
    left = {t: [r for r in rows if r[0] == runs[0]] for t, rows in after.items()}
    mtest.check(not any(left.values()), "rows of the removed run left: %r" % {t: len(r) for t, r in left.items() if r})
    others = {t: [r for r in rows if r[0] != runs[0]] for t, rows in before.items()}
    mtest.check(others == after, "the other runs' rows changed")
    mtest.check(storecheck.integrity(store) == "ok" and os.path.getsize(store) < size_before,
                "after the removal: %s, %d bytes against %d" % (storecheck.integrity(store), os.path.getsize(store),
                                                               size_before))
    batch_run = storecheck.last_run(store, "batch")["run_id"]
    forget(store, batch_run, tmp)
    mtest.check(run_tables(store) == after, "the script given a batch run's id removed something")
    out = mtest.run(["analyse-store", "--store", store, "--quiet", "--attribute"] + asked[0]).stdout
    mtest.check("reused" not in out and int(re.search(r"analysis run (\d+)", out).group(1)) > max(runs),
                "the removed question asked again: %r" % out)

mtest.done()
