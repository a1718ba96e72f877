"""A merge stopped part way by SIGTERM (a cluster's time limit, a cancel) or Ctrl-C.

docs/store.md: a merge stopped part way leaves OUT as it was, or, when this merge created
it, removes it. The new store used to stay behind, empty, with its log. The input is a
store of all the plays (large enough that its merge takes a few tenths of a second); the
signal is sent once OUT exists, after a pause, and again with a longer pause where a merge
finished first. References: os.listdir for what is left beside OUT, Python's sqlite3 for
OUT's tables before and after (storecheck.logical_tables), SQLite's PRAGMA integrity_check,
and the shell's exit status of a process ended by the signal (128 + its number).
"""
import os
import signal
import subprocess
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-merge-stopped-")
big = os.path.join(tmp, "plays.sqlite")
mtest.run(["batch", storecheck.GERDRACOR, "--store", big, "--unit", "speaker", "--quiet"])
small = os.path.join(tmp, "few.sqlite")
mtest.run(["batch", os.path.join(mtest.ROOT, "examples"), "--store", small, "--unit", "letter", "--quiet"])


def stopped_merge(out, sig, pause):
    """Runs `merge OUT plays.sqlite`, sends `sig` `pause` seconds after OUT exists; returns
    (exit code, stderr)."""
    proc = subprocess.Popen([mtest.BIN, "merge", out, big], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    while not os.path.exists(out) and proc.poll() is None:
        time.sleep(0.001)
    time.sleep(pause)
    if proc.poll() is None:
        proc.send_signal(sig)
    _, err = proc.communicate()
    return -proc.returncode + 128 if proc.returncode < 0 else proc.returncode, err


for sig in (signal.SIGTERM, signal.SIGINT):
    # A new OUT: removed with the files SQLite keeps beside it.
    landed = False
    for attempt, pause in enumerate((0.05, 0.02, 0.1, 0.01, 0.15)):
        out = os.path.join(tmp, "new-%d-%d.sqlite" % (sig, attempt))
        code, err = stopped_merge(out, sig, pause)
        if code == 0:  # the merge finished before the signal: try again, sooner or later
            continue
        landed = True
        mtest.check(code == 128 + sig, "a merge stopped by %s exited %d: %s" % (sig.name, code, err))
        left = [n for n in os.listdir(tmp) if n.startswith(os.path.basename(out))]
        mtest.check(left == [], "a merge that created %s and was stopped left %r" % (out, left))
        mtest.check("removed" in err, "the stopped merge did not say that it removed the new store: %r" % err)
        break
    mtest.check(landed, "no %s landed while a merge ran in five tries" % sig.name)

    # An existing OUT: as it was before the merge, whole.
    landed = False
    for attempt, pause in enumerate((0.05, 0.02, 0.1, 0.01, 0.15)):
        out = os.path.join(tmp, "kept-%d-%d.sqlite" % (sig, attempt))
        mtest.run(["merge", out, small])
        before = storecheck.logical_tables(out)
        code, err = stopped_merge(out, sig, pause)
        if code == 0:
            continue
        landed = True
        mtest.check(code == 128 + sig, "a merge into an existing store stopped by %s exited %d: %s" % (sig.name, code, err))
        mtest.check(storecheck.logical_tables(out) == before and storecheck.integrity(out) == "ok",
                    "a stopped merge changed the store it merged into")
        mtest.check("left as it was" in err, "the stopped merge did not say the store is as it was: %r" % err)
        break
    mtest.check(landed, "no %s landed while a merge into a store ran in five tries" % sig.name)

mtest.done()
