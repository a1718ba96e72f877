"""Archive store: a file that cannot be read at all (a link to nothing) is a failing file
everywhere, and, as it was, no change.

A review found three faults with such a file in an archive: every analysis said "1 file(s)
in the store were not read with these settings (run batch with them)", which batch could not
mend; the file passed every header filter, so that --author of no stored author said "none
of the stored files passing the filter was read with these settings" instead of that none
passes the filter; and every re-run of batch read it again, recorded a run and rewrote the
store, where docs/store.md promises that an unchanged archive writes nothing (a backup sees
no change). References: os.symlink makes the link to nothing (os.path.exists is False for
it); the store's bytes are compared with hashlib and its time with os.stat; the files the
analysis took are compared with os.walk's list of the archive's readable files.
"""
import os
import shutil
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-unreadable-")
archive = os.path.join(tmp, "archive")
os.makedirs(archive)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), archive)
dangling = os.path.join(archive, "dangling.xml")
os.symlink(os.path.join(tmp, "nowhere", "letters.xml"), dangling)
mtest.check(os.path.islink(dangling) and not os.path.exists(dangling), "the link is not a link to nothing")
readable = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names
                  if os.path.exists(os.path.join(d, n)))

store = os.path.join(tmp, "archive.sqlite")
first = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
mtest.check(first.returncode == 1 and dangling in first.stderr, "batch: exit %d, %s" % (first.returncode, first.stderr))

# (a) the analysis counts it as failing, and says nothing of settings
proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200"])
mtest.check("not read with these settings" not in proc.stderr and "1 file(s) stored as failed" in proc.stderr,
            "analyse-store notes: %s" % proc.stderr)
_, tables = storecheck.latest_analysis(store)
mtest.check(sorted({row[1] for row in tables["segments"]}) == readable, "the analysis took %r" % tables["segments"][:1])

# (b) a header filter passes it by, as it passes by any file without a header
proc = mtest.run(["analyse-store", "--store", store, "--min-tokens", "200", "--author", "Nobody Atall"], check=False)
mtest.check(proc.returncode == 4 and "none of the 2 stored file(s) passes the filter" in proc.stderr,
            "--author of no one: exit %d, %s" % (proc.returncode, proc.stderr))

# (c) a re-run over the archive as it was writes nothing (the readable file's time is made
# older than the first run first, so that no rule for files changed within a clock tick of
# being read applies; then that run is repeated once to settle it)
old = time.time() - 3600
os.utime(readable[0], (old, old))
mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
before = (storecheck.sha256_of(store), os.stat(store).st_mtime_ns)
time.sleep(0.05)
again = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
mtest.check(again.returncode == 1 and dangling in again.stderr, "the re-run: exit %d, %s" % (
    again.returncode, again.stderr))
mtest.check((storecheck.sha256_of(store), os.stat(store).st_mtime_ns) == before, "the re-run rewrote the store")

# The link's target come back: the file is read (the open is tried, not assumed).
os.makedirs(os.path.join(tmp, "nowhere"))
shutil.copy(readable[0], os.path.join(tmp, "nowhere", "letters.xml"))
back = mtest.run(["batch", archive, "--store", store, "--unit", "letter", "--quiet"], check=False)
row = storecheck.rows(store, "SELECT sha256, read_error FROM files WHERE path = ?", (dangling,))
mtest.check(back.returncode == 0 and row == [(storecheck.sha256_of(readable[0]), None)],
            "the target back: exit %d, %s, stored %r" % (back.returncode, back.stderr, row))

mtest.done()
