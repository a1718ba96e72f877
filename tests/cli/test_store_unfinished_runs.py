"""Archive store: partial work is named before it is analysed, and a stop during an analysis
says what it left.

1. A shard's batch stopped by SIGINT after one file (its run 'interrupted' in the runs
   table, read with Python's sqlite3 module, the SQLite library itself): `analyse-store` on
   the shard names that run and its counters as the table holds them; `merge` names the
   shard's unfinished run on stderr and records it in the merge run's parameters (JSON read
   by Python's json module); `analyse-store` on the merged store names the merge, and
   `merge --exact` refuses the shard (it would remove the files the shard has not read). Once the
   shard's batch has been run again to the end and merged again, neither store has a note.
2. Ctrl-C during `analyse-store` on a terminal (a pseudo-terminal from Python's pty module,
   so that the progress display draws): ended by SIGINT (130 in a shell), the progress line cleared (ECMA-48 EL,
   ESC [ K, after a carriage return) and the stop named; the runs table gains no analysis.
3. SIGTERM after the analysis is committed, while the store is still open (held there by the
   test hook MANICULE_TEST_PAUSE_AFTER_COMMIT): the analysis is kept, and the message says
   so with the run id that the runs table (Python's sqlite3, the log beside the store taken
   in) gives it, where it used to say that no analysis was stored.
Before these were written, both analyses ran in silence on the partial store, and the stop
left the progress line standing with no message (a review found both).
"""
import json
import os
import pty
import select
import shutil
import signal
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402


def runs_of(store):
    db = storecheck.connect(store)
    try:
        return db.execute("SELECT run_id, kind, status, files_found, files_read, parameters FROM runs ORDER BY run_id").fetchall()
    finally:
        db.close()


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(16, min_size=60000, max_size=160000), archive)
    shard = os.path.join(tmp, "shard-1-of-2.sqlite")
    batch = ["batch", archive, "--store", shard, "--shard", "1/2", "--unit", "speaker", "--threads", "1"]
    code, reported, _ = storecheck.run_stopped([mtest.BIN] + batch + ["--verbose"], 1, signal.SIGINT)
    runs = runs_of(shard)
    mtest.check(code == 130 and runs[-1][2] == "interrupted",
                "the shard's batch stopped after one file: exit %d, runs %r" % (code, runs))
    run_id, _, _, found, read, _ = runs[-1]
    said = "batch run %d" % run_id
    proc = mtest.run(["analyse-store", "--store", shard, "--min-tokens", "100"], check=False)
    mtest.check(said in proc.stderr and "interrupted after %d of %d file(s)" % (read, found) in proc.stderr,
                "analyse-store on the stopped shard (run %d: %d of %d files): %s" % (run_id, read, found, proc.stderr))

    merged = os.path.join(tmp, "archive.sqlite")
    proc = mtest.run(["merge", merged, shard])
    mtest.check(shard in proc.stderr and said in proc.stderr, "merge of the stopped shard says nothing: " + proc.stderr)
    merge_runs = [r for r in runs_of(merged) if r[1] == "merge"]
    parameters = json.loads(merge_runs[-1][5])
    mtest.check(len(parameters.get("input_unfinished", [])) == 1 and said in parameters["input_unfinished"][0],
                "the merge run's parameters: %r" % parameters)
    # --exact removes what no input holds: with an input that has not read its whole share,
    # that would be the rest of the share. Refused (exit 4), OUT as it was (hashlib).
    kept_sha = storecheck.sha256_of(merged)
    proc = mtest.run(["merge", "--exact", merged, shard], check=False)
    mtest.check(proc.returncode == 4 and "--exact would remove" in proc.stderr and storecheck.sha256_of(merged) == kept_sha,
                "merge --exact of an unfinished shard: exit %d, %s" % (proc.returncode, proc.stderr))
    proc = mtest.run(["analyse-store", "--store", merged, "--min-tokens", "100"], check=False)
    mtest.check("merge run %d" % merge_runs[-1][0] in proc.stderr and shard in proc.stderr,
                "analyse-store on the merged store says nothing of the stopped shard: " + proc.stderr)

    # Completed and merged again: nothing left to say.
    mtest.run(batch + ["--quiet"])
    mtest.check(runs_of(shard)[-1][2] == "done", "the shard's batch again: %r" % (runs_of(shard)[-1],))
    proc = mtest.run(["analyse-store", "--store", shard, "--min-tokens", "100"])
    mtest.check(said not in proc.stderr, "a completed shard still noted: " + proc.stderr)
    proc = mtest.run(["merge", merged, shard])
    mtest.check(said not in proc.stderr, "merging the completed shard still notes: " + proc.stderr)
    proc = mtest.run(["analyse-store", "--store", merged, "--min-tokens", "100"])
    mtest.check("unfinished" not in proc.stderr and said not in proc.stderr,
                "the merged store still noted after the shard was completed: " + proc.stderr)

    # A share's run interrupted, then the whole archive read to the end: that run covers the
    # share's (the same settings and inputs, no narrower share), so nothing is left to say.
    wide = os.path.join(tmp, "wide.sqlite")
    code, _, _ = storecheck.run_stopped([mtest.BIN, "batch", archive, "--store", wide, "--shard", "1/2", "--unit",
                                         "speaker", "--threads", "1", "--verbose"], 1, signal.SIGINT)
    mtest.check(code == 130 and runs_of(wide)[-1][2] == "interrupted", "the share's run: %r" % (runs_of(wide)[-1],))
    mtest.run(["batch", archive, "--store", wide, "--unit", "speaker", "--quiet"])
    proc = mtest.run(["analyse-store", "--store", wide, "--min-tokens", "100"])
    mtest.check("was interrupted" not in proc.stderr, "a share's run covered by a whole run still noted: " + proc.stderr)
    # A run that found nothing to read records nothing, unless it settles an unfinished one:
    # every file stored, a --verify-hashes run interrupted, then the plain command, which
    # reads nothing, is recorded complete and the note goes (it once stayed for good).
    # Hashing known files is quick, so the stop is made certain to come part way: the run's
    # messages (80 files' worth) go into a small pipe that is not read until it is full.
    many = os.path.join(tmp, "many")
    for copy in range(5):
        for name in os.listdir(archive):
            os.makedirs(os.path.join(many, "copy-%d" % copy), exist_ok=True)
            shutil.copy(os.path.join(archive, name), os.path.join(many, "copy-%d" % copy, name))
    hashing = os.path.join(tmp, "hashing.sqlite")
    mtest.run(["batch", many, "--store", hashing, "--unit", "speaker", "--quiet"])
    code, filled, messages = storecheck.run_stopped_when_blocked(
        [mtest.BIN, "batch", many, "--store", hashing, "--unit", "speaker", "--threads", "1", "--verify-hashes",
         "--verbose"], signal.SIGINT)
    mtest.check(filled and code == 130 and runs_of(hashing)[-1][2] == "interrupted",
                "the hashing run: pipe filled %s, exit %d, %r" % (filled, code, runs_of(hashing)[-1]))
    runs_before = len(runs_of(hashing))
    proc = mtest.run(["batch", many, "--store", hashing, "--unit", "speaker", "--quiet"])
    last = runs_of(hashing)[-1]
    proc = mtest.run(["analyse-store", "--store", hashing, "--min-tokens", "100"])
    mtest.check(len(runs_of(hashing)) > runs_before and last[1:3] == ("batch", "done") and last[4] == 0
                and "was interrupted" not in proc.stderr,
                "after the plain re-run: runs %r, %s" % (runs_of(hashing)[runs_before - 1:], proc.stderr))

    # Ctrl-C while analyse-store draws its progress on a terminal.
    whole = os.path.join(tmp, "whole.sqlite")
    mtest.run(["batch", archive, "--store", whole, "--unit", "speaker", "--quiet"])
    analyses_before = [r for r in runs_of(whole) if r[1] == "analysis"]
    pid, fd = pty.fork()
    if pid == 0:
        os.execv(mtest.BIN, [mtest.BIN, "analyse-store", "--store", whole, "--min-tokens", "1", "--neighbours", "50",
                             "--ranks", "1-5000", "--pca", "--recompute"])
    seen, sent = b"", False
    while True:
        ready, _, _ = select.select([fd], [], [], 60)
        if not ready:
            break
        try:
            data = os.read(fd, 4096)
        except OSError:  # the child has ended and closed the terminal
            break
        if not data:
            break
        seen += data
        if not sent and b"analysis" in seen:
            os.kill(pid, signal.SIGINT)
            sent = True
    _, status = os.waitpid(pid, 0)
    os.close(fd)
    text = seen.decode("utf-8", "replace")
    mtest.check(sent and os.WIFEXITED(status) is False and os.WTERMSIG(status) == signal.SIGINT,
                "analyse-store stopped by Ctrl-C: status %r, output %r" % (status, text[-300:]))
    mtest.check("\r\x1b[Kmanicule: interrupted: no analysis stored" in text,
                "the stop left no message after a cleared line: %r" % text[-300:])
    mtest.check([r for r in runs_of(whole) if r[1] == "analysis"] == analyses_before,
                "a stopped analysis left a run behind")
    mtest.check(storecheck.integrity(whole) == "ok", "PRAGMA integrity_check fails after the stop")

    # SIGTERM once the analysis is committed: it is kept, and said to be.
    env = dict(os.environ, MANICULE_TEST_PAUSE_AFTER_COMMIT="20")
    proc = subprocess.Popen([mtest.BIN, "analyse-store", "--store", whole, "--min-tokens", "1", "--recompute",
                             "--quiet"], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True, env=env)
    err = ""
    for line in proc.stderr:
        err += line
        if "pausing after committing" in line:
            proc.send_signal(signal.SIGTERM)
            break
    err += proc.communicate(timeout=60)[1]
    analyses = [r for r in runs_of(whole) if r[1] == "analysis"]
    newest = analyses[-1] if analyses else None
    mtest.check(proc.returncode == -signal.SIGTERM, "analyse-store stopped after its commit: %r, %r" % (proc.returncode, err))
    mtest.check(len(analyses) == len(analyses_before) + 1 and newest[2] == "done",
                "an analysis stopped after its commit is not in the runs table as done: %r" % analyses[-2:])
    mtest.check(newest is not None and ("interrupted after analysis run %d was stored" % newest[0]) in err and
                "no analysis stored" not in err, "the stop after the commit said: %r" % err)
    mtest.check(storecheck.integrity(whole) == "ok", "PRAGMA integrity_check fails after the stop after the commit")

mtest.done()
