"""A merge stopped part way by SIGTERM (a cluster's time limit, a cancel) or Ctrl-C.

docs/store.md: a merge stopped part way leaves OUT as it was, or, when this merge created
it, removes it. The new store used to stay behind, empty, with its log. The input is a
store of all the plays (large enough that its merge takes a few tenths of a second); the
signal is sent once OUT exists, after a pause, and again with a longer pause where a merge
finished first. References: os.listdir for what is left beside OUT, Python's sqlite3 for
OUT's tables before and after (storecheck.logical_tables), SQLite's PRAGMA integrity_check,
and the shell's exit status of a process ended by the signal (128 + its number).

A stop that lands after the merge is committed (while OUT is being closed) finds the merge
kept: OUT then holds it, as an uninterrupted merge does, and the message says so; it used
to say "left as it was" (or "nothing merged") of a store that held the merge. The test
hook MANICULE_TEST_PAUSE_AFTER_COMMIT holds the run at that moment, so that a stop lands
there every time. OUT must then hold every play (and the letters, where it held them) by
its path and SHA-256 (os.walk and hashlib over the files), each content read, checked with
Python's sqlite3 reading the store with its log beside it, as any SQLite reader takes it in,
and SQLite's PRAGMA integrity_check.
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


def files_on_disk(folder):
    """{(path, SHA-256)} of the TEI files under `folder` (os.walk, hashlib): what a store
    read from it holds in its files table."""
    return {(os.path.join(d, n), storecheck.sha256_of(os.path.join(d, n)))
            for d, _, names in os.walk(folder) for n in names if n.endswith((".xml", ".tei"))}


def held_files(path):
    """(the files table's (path, sha256) pairs, the contents read ok) of the store at
    `path`, read with its log beside it, as any SQLite reader takes it in."""
    files = set(storecheck.rows(path, "SELECT path, sha256 FROM files"))
    contents = {r[0] for r in storecheck.rows(path, "SELECT sha256 FROM readings WHERE status = 'ok'")}
    return files, contents


# What a merge of the plays' store must hold: every play with its SHA-256, each content read;
# into a store holding the letters, those too.
plays = files_on_disk(storecheck.GERDRACOR)
examples = files_on_disk(os.path.join(mtest.ROOT, "examples"))
merged_new_tables = (plays, {sha for _, sha in plays})
merged_kept_tables = (plays | examples, {sha for _, sha in plays | examples})
STORED = "interrupted after the merge was stored"


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


def merge_stopped_after_commit(out, sig):
    """Runs `merge OUT plays.sqlite` held after its commit (the test hook), sends `sig`
    then; returns (exit code, stderr)."""
    env = dict(os.environ, MANICULE_TEST_PAUSE_AFTER_COMMIT="20")
    proc = subprocess.Popen([mtest.BIN, "merge", out, big], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                            text=True, env=env)
    err = ""
    for line in proc.stderr:
        err += line
        if "pausing after committing" in line:
            proc.send_signal(sig)
            break
    rest = proc.communicate(timeout=60)[1]
    return -proc.returncode + 128 if proc.returncode < 0 else proc.returncode, err + rest


def check_kept(out, expected_tables, sig, code, err, where):
    """A stop after the commit: OUT holds the merge (read with its log beside it), and says so."""
    mtest.check(code == 128 + sig, "a merge %s stopped by %s after its commit exited %d: %s" % (where, sig.name, code, err))
    mtest.check(STORED in err and "as it was" not in err and "nothing merged" not in err,
                "the merge %s stopped after its commit said: %r" % (where, err))
    mtest.check(os.path.exists(out) and held_files(out) == expected_tables and
                storecheck.integrity(out) == "ok",
                "a merge %s stopped after its commit does not hold the merge" % where)


for sig in (signal.SIGTERM, signal.SIGINT):
    # A new OUT: removed with the files SQLite keeps beside it.
    landed = False
    for attempt, pause in enumerate((0.05, 0.02, 0.1, 0.01, 0.15, 0.005, 0.03)):
        out = os.path.join(tmp, "new-%d-%d.sqlite" % (sig, attempt))
        code, err = stopped_merge(out, sig, pause)
        if code == 0:  # the merge finished before the signal: try again, sooner or later
            continue
        if STORED in err:  # it landed after the commit: the merge is kept (checked), try sooner
            check_kept(out, merged_new_tables, sig, code, err, "that created its store")
            continue
        landed = True
        mtest.check(code == 128 + sig, "a merge stopped by %s exited %d: %s" % (sig.name, code, err))
        left = [n for n in os.listdir(tmp) if n.startswith(os.path.basename(out))]
        mtest.check(left == [], "a merge that created %s and was stopped left %r" % (out, left))
        mtest.check("removed" in err, "the stopped merge did not say that it removed the new store: %r" % err)
        break
    mtest.check(landed, "no %s landed while a merge ran, before its commit, in seven tries" % sig.name)

    # An existing OUT: as it was before the merge, whole.
    landed = False
    for attempt, pause in enumerate((0.05, 0.02, 0.1, 0.01, 0.15, 0.005, 0.03)):
        out = os.path.join(tmp, "kept-%d-%d.sqlite" % (sig, attempt))
        mtest.run(["merge", out, small])
        before = storecheck.logical_tables(out)
        code, err = stopped_merge(out, sig, pause)
        if code == 0:
            continue
        if STORED in err:
            check_kept(out, merged_kept_tables, sig, code, err, "into a store")
            continue
        landed = True
        mtest.check(code == 128 + sig, "a merge into an existing store stopped by %s exited %d: %s" % (sig.name, code, err))
        mtest.check(storecheck.logical_tables(out) == before and storecheck.integrity(out) == "ok",
                    "a stopped merge changed the store it merged into")
        mtest.check("left as it was" in err, "the stopped merge did not say the store is as it was: %r" % err)
        break
    mtest.check(landed, "no %s landed while a merge into a store ran, before its commit, in seven tries" % sig.name)

    # Stopped after the commit, every time (the test hook): the merge is kept, and said to be.
    out = os.path.join(tmp, "after-commit-new-%d.sqlite" % sig)
    code, err = merge_stopped_after_commit(out, sig)
    check_kept(out, merged_new_tables, sig, code, err, "that created its store")
    out = os.path.join(tmp, "after-commit-kept-%d.sqlite" % sig)
    mtest.run(["merge", out, small])
    code, err = merge_stopped_after_commit(out, sig)
    check_kept(out, merged_kept_tables, sig, code, err, "into a store")

mtest.done()
