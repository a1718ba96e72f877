"""Archive store: a stop signal (SIGTERM, as a cluster's time limit sends, or SIGINT) that
arrives after a batch has read its last file, while it commits, reports and closes the
store, must still leave the store whole in its one file once the process has ended: the
job-array script of the README then copies that file alone (examples/slurm-batch.sh). A
batch killed there by the signal's default action leaves its last commits in the log beside
the store, and a copy of the store without them holds nothing (seen in test_slurm_script,
a few times in a hundred: "no such table: runs").

Each round runs a batch over 3 plays on one reading thread, sends the signal as soon as
the run reports its third and last file, waits for the process, and copies the store
without its log. The window after the last file is a few milliseconds wide, so the signal
lands inside it in some rounds and before it in others; every round must give exit code 0
or 128 + the signal, no log left behind, and a copy that holds the run and the 3 files.
Outside references: SQLite (Python's sqlite3 module) reading the copy, PRAGMA
integrity_check.
"""
import os
import shutil
import signal
import sqlite3
import subprocess
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
        store = os.path.join(tmp, "store-%d.sqlite" % round_number)
        proc = subprocess.Popen([mtest.BIN, "batch", archive, "--store", store, "--unit", "speaker", "--threads", "1",
                                 "--verbose", "--quiet"], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
        reported = 0
        for line in proc.stderr:
            if storecheck.reports_a_file(line):
                reported += 1
                if reported == 3:
                    proc.send_signal(stop)
        code = proc.wait()
        proc.stderr.close()
        where = "round %d (%s)" % (round_number, stop.name)
        mtest.check(reported == 3, "%s: the run reported %d files of 3" % (where, reported))
        mtest.check(code in (0, 128 + stop), "%s: exit code %d, expected 0 or %d" % (where, code, 128 + stop))
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
