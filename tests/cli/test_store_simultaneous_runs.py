"""Archive store: runs started at the same moment on one store never all refuse.

The issue's rule for two runs on one store at once: either both work or the second refuses
with a clear message. Two processes opening one store together could each hold the shared
lock the other's exclusive lock waited for, and then both refused (about 1 pair in 10 here).
Pairs of commands are started together, many times over: two merges reading the same three
shards, a batch re-run beside an analysis of its store, and two batches creating one new
store. In no pair may both refuse; a refusal must be exit 5 with the store named as in use;
and every store made must hold each file of the archive once. Outside references: os.walk
for the archive's files, hashlib for their SHA-256, SQLite's own PRAGMA integrity_check.
"""
import os
import subprocess
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

PAIRS = 25


def started_together(first, second, cwd):
    """Runs two manicule commands at once; returns their (exit code, stderr) pairs."""
    procs = [subprocess.Popen([mtest.BIN] + args, cwd=cwd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                              text=True) for args in (first, second)]
    # communicate, not wait then read: a run held on a full pipe would hold the other's lock.
    outcomes = []
    for p in procs:
        _, err = p.communicate(timeout=300)
        outcomes.append((p.returncode, err))
    return outcomes


def check_pair(outcomes, what):
    refused = [err for code, err in outcomes if code != 0]
    mtest.check(len(refused) < 2, "%s: both refused: %r" % (what, refused))
    for code, err in outcomes:
        if code != 0:
            mtest.check(code == 5 and "is in use by another program" in err,
                        "%s: a refusal without the clear message (exit %d): %s" % (what, code, err))
    return len(refused)


def check_holds_archive(store, expected, what):
    files = storecheck.logical_tables(store)["files"]
    paths = [row[0] for row in files]
    mtest.check(len(paths) == len(set(paths)), "%s: a file stored twice" % what)
    held = {row[0]: row[4] for row in files}
    mtest.check(held == expected, "%s: files %d, expected %d (or their SHA-256 differ)" % (what, len(held), len(expected)))
    mtest.check(storecheck.integrity(store) == "ok", "%s: integrity_check failed" % what)


tmp = mtest.scratch_folder()
archive = "archive"
storecheck.copy_plays(storecheck.pick_plays(12), os.path.join(tmp, archive))
expected = {}
for folder, _, names in os.walk(os.path.join(tmp, archive)):
    for name in names:
        full = os.path.join(folder, name)
        expected[os.path.relpath(full, tmp)] = storecheck.sha256_of(full)
mtest.check(len(expected) == 12, "archive has %d files" % len(expected))

common = ["--unit", "speaker", "--quiet", "--threads", "1"]
shards = []
for k in (1, 2, 3):
    shards.append("shard-%d-of-3.sqlite" % k)
    mtest.run(["batch", archive, "--store", shards[-1], "--shard", "%d/3" % k] + common, cwd=tmp)

refusals = 0
for i in range(PAIRS):
    outs = ["merged-a-%d.sqlite" % i, "merged-b-%d.sqlite" % i]
    outcomes = started_together(["merge", outs[0]] + shards, ["merge", outs[1]] + shards, tmp)
    refusals += check_pair(outcomes, "two merges of the same shards, pair %d" % i)
    for out, (code, _) in zip(outs, outcomes):
        if code == 0:
            check_holds_archive(os.path.join(tmp, out), expected, out)

store = "one.sqlite"
mtest.run(["batch", archive, "--store", store] + common, cwd=tmp)
for i in range(PAIRS):
    outcomes = started_together(["batch", archive, "--store", store] + common,
                                ["analyse-store", "--store", store, "--min-tokens", "500"], tmp)
    refusals += check_pair(outcomes, "a batch re-run beside an analysis, pair %d" % i)
check_holds_archive(os.path.join(tmp, store), expected, store)

for i in range(PAIRS):
    new_store = "new-%d.sqlite" % i
    outcomes = started_together(["batch", archive, "--store", new_store] + common,
                                ["batch", archive, "--store", new_store] + common, tmp)
    refusals += check_pair(outcomes, "two batches creating one store, pair %d" % i)
    check_holds_archive(os.path.join(tmp, new_store), expected, new_store)

print("%d of %d pairs had one run refused" % (refusals, 3 * PAIRS))
mtest.done()
