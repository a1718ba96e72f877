"""Archive store: a stop signal (SIGTERM, as a cluster's time limit sends, or SIGINT) that
arrives after a batch has read its last file, while it commits, reports and closes the
store, must still leave the store whole in its one file once the process has ended: the
job-array script of the README then copies that file alone (examples/slurm-batch.sh). A
batch killed there by the signal's default action leaves its last commits in the log beside
the store, and a copy of the store without them holds nothing (seen in test_slurm_script,
a few times in a hundred: "no such table: runs").

Each round runs a batch over 3 plays on one reading thread and sends the signal 0 to 11 ms
(a millisecond more each round) after the run reports its third and last file, so that
across the rounds it lands while the batch ends, while the store is being closed, and
after; then it waits for the process and copies the store without its log. The store must
be closed whatever the moment: no log left beside it, and a copy that holds the run and
the 3 files. The exit code is 0 (the signal came once the run was over), 128 + the signal
(the run answered it), or death by the signal once the store was closed and nothing was
left to lose. Before the store was closed under the signal's watch, this test failed in
10 of 10 runs (the log left beside the store at 1 ms); since, it passes. Outside
references: SQLite (Python's sqlite3 module) reading the copy, PRAGMA integrity_check.
"""
import os
import shutil
import signal
import sqlite3
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

ROUNDS = 12

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(3, min_size=30000, max_size=60000), archive)
    for round_number in range(ROUNDS):
        stop = signal.SIGTERM if round_number % 2 == 0 else signal.SIGINT
        delay = round_number * 0.001
        store = os.path.join(tmp, "store-%d.sqlite" % round_number)
        code, reported, _ = storecheck.run_stopped(
            [mtest.BIN, "batch", archive, "--store", store, "--unit", "speaker", "--threads", "1", "--verbose",
             "--quiet"], 3, stop, delay=delay)
        where = "round %d (%s %d ms after the last file)" % (round_number, stop.name, round(delay * 1000))
        mtest.check(reported == 3, "%s: the run reported %d files of 3" % (where, reported))
        mtest.check(code in (0, 128 + stop, -stop), "%s: exit code %d" % (where, code))
        mtest.check(not os.path.exists(store + "-wal"), "%s: the store's log was left beside it" % where)
        copy = os.path.join(tmp, "copy-%d.sqlite" % round_number)
        shutil.copyfile(store, copy)  # the store's file alone, as the job-array script saves it
        db = sqlite3.connect(copy)
        try:
            runs = db.execute("SELECT status, files_read FROM runs WHERE kind = 'batch'").fetchall()
            files = db.execute("SELECT count(*) FROM files").fetchone()[0]
        except sqlite3.DatabaseError as e:
            runs, files = "unreadable: %s" % e, 0
        db.close()
        mtest.check(runs in ([("done", 3)], [("interrupted", 3)]), "%s: the copy's batch runs: %r" % (where, runs))
        mtest.check(files == 3, "%s: the copy holds %d files of 3" % (where, files))
        mtest.check(storecheck.integrity(copy) == "ok", "%s: PRAGMA integrity_check fails on the copy" % where)

mtest.done()
