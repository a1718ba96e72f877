"""Archive store: a batch run killed with SIGKILL at several points and started again ends
with exactly the tables of an uninterrupted run (no duplicate, no missing row).

30 plays of 120-300 KB, one transaction per 3 files. The victim run prints each file it
finishes (--verbose) and reads on one thread (--threads 1), so that this test, on the
other core, sees each line while the rest of the run is still ahead: with both cores
reading 20 small plays, the run could end before the kill arrived on a loaded CI machine
(seen once). (The uninterrupted reference run reads on all cores: the tables must not
depend on it.) The victim is killed right after it finished its 1st, 4th, 6th, 5th and
2nd file (each time started again on the same store, so it resumes from what the previous
one committed, and the kills land inside and between transactions), then once right at
the start; then stopped by SIGINT and by SIGTERM, which must keep every file the run
reported and record the run as interrupted; and finally allowed to finish. Outside references: SQLite's
PRAGMA integrity_check and Python's hashlib for every stored SHA-256.
"""
import os
import signal
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402


def killed_after(args, files_done):
    """Runs manicule, kills it with SIGKILL once it reported `files_done` files; returns
    how many it had reported."""
    proc = subprocess.Popen([mtest.BIN] + args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    seen = 0
    if files_done > 0:
        for line in proc.stderr:
            if storecheck.reports_a_file(line):
                seen += 1
                if seen >= files_done:
                    break
    proc.send_signal(signal.SIGKILL)
    proc.wait()
    proc.stderr.close()
    return seen


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(30, min_size=120000, max_size=300000), archive)
    args = ["batch", archive, "--unit", "speaker", "--commit-every", "3", "--verbose", "--quiet"]

    reference = os.path.join(tmp, "reference.sqlite")
    mtest.run(args + ["--store", reference])
    expected = storecheck.logical_tables(reference)
    mtest.check(len(expected["files"]) == 30, "the reference run stored %d files" % len(expected["files"]))

    victim = os.path.join(tmp, "victim.sqlite")
    kills = 0
    for point in (1, 4, 6, 5, 2, 0):
        killed_after(args + ["--store", victim, "--threads", "1"], point)
        kills += 1
        if os.path.exists(victim):
            mtest.check(storecheck.integrity(victim) == "ok", "store damaged after kill at file %d" % point)
    # Ctrl-C (SIGINT) after 3 files, then SIGTERM after 2 more: unlike SIGKILL, the run keeps
    # every file it reported, records itself as interrupted and exits as a shell reports
    # that signal (128 + its number: 130, 143).
    for sig, after in ((signal.SIGINT, 3), (signal.SIGTERM, 2)):
        db = storecheck.connect(victim)
        stored_before = db.execute("SELECT count(*) FROM files").fetchone()[0]
        db.close()
        code, reported, rest = storecheck.run_stopped([mtest.BIN] + args + ["--store", victim, "--threads", "1"],
                                                      after, sig)
        mtest.check(code == 128 + sig and "interrupted" in rest, "%s: exit %d, %s" % (sig.name, code, rest))
        db = storecheck.connect(victim)
        stored_after = db.execute("SELECT count(*) FROM files").fetchone()[0]
        db.close()
        run = storecheck.last_run(victim)
        status, files_read = run["status"], run["files_read"]
        mtest.check(stored_after == stored_before + reported and status == "interrupted" and files_read == reported,
                    "%s after %d files: %d files stored before, %d after, run %s with %d read"
                    % (sig.name, reported, stored_before, stored_after, status, files_read))
        kills += 1

    final = mtest.run(args + ["--store", victim])
    got = storecheck.logical_tables(victim)
    mtest.check(got == expected, "after %d kills: %s" % (kills, storecheck.diff_summary(got, expected)))
    mtest.check(storecheck.integrity(victim) == "ok", "PRAGMA integrity_check fails after the final run")

    for path, _, _, _, sha, _ in got["files"]:
        mtest.check(sha == storecheck.sha256_of(path), "stored SHA-256 of %s differs from hashlib" % path)

    db = storecheck.connect(victim)
    statuses = [r[0] for r in db.execute("SELECT status FROM runs WHERE kind = 'batch' ORDER BY run_id")]
    duplicates = db.execute(
        "SELECT count(*) FROM (SELECT sha256, ordinal FROM segments GROUP BY settings_id, sha256, ordinal "
        "HAVING count(*) > 1)").fetchone()[0]
    db.close()
    mtest.check(statuses[-1] == "done" and "running" not in statuses,
                "run statuses after kills and a finished run: %r" % statuses)
    mtest.check(statuses.count("interrupted") >= 5, "fewer kills landed inside a run than planned: %r" % statuses)
    mtest.check(duplicates == 0, "%d duplicate segment keys" % duplicates)
    # Work was resumed, not redone: the final run read fewer files than the archive holds.
    last = storecheck.last_run(victim)
    mtest.check(last["files_read"] < 30, "the final run read %d files: nothing was kept" % last["files_read"])

mtest.done()
