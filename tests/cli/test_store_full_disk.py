"""Archive store on a full disk: whenever `batch` exits 0, the store file alone is whole
(a copy of the file without its log passes SQLite's PRAGMA integrity_check, run by Python's
sqlite3 module, and holds every file of the archive, os.walk), because the job script saves
that file alone; when the log cannot be copied into the store at the end (the disk full
then), `batch` exits 5 and says to keep the two files together. A review found exit 0 with
a store file that, copied alone, was "database disk image is malformed".

The same for `merge` into a new store on that disk: when the log cannot be copied in at the
end, the merge is committed, and the store with its log beside it must stay (opened together
by Python's sqlite3, they hold every play); a review found both removed after that message.

The disk is a small tmpfs (mount(8), as root), tried at sizes from 1.5 to 8 MiB for batch
(1 to 4 MiB for merge), so that the
disk fills at every stage of a run: while files are committed, at the last commit, and
while the log is copied in at the end. Run only where root may mount a tmpfs; elsewhere it
is reported skipped.
"""
import os
import shutil
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

if os.geteuid() != 0:
    print("SKIP: not root, so no small file system can be mounted")
    raise SystemExit(77)

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    storecheck.copy_plays(storecheck.pick_plays(60, min_size=30000, max_size=120000), archive)
    plays = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names)
    disk = os.path.join(tmp, "disk")
    os.makedirs(disk)
    outcomes = []
    for size_kib in range(1536, 8193, 512):
        if subprocess.run(["mount", "-t", "tmpfs", "-o", "size=%dk" % size_kib, "tmpfs", disk]).returncode != 0:
            print("SKIP: a tmpfs cannot be mounted here (a container without the right?)")
            raise SystemExit(77)
        try:
            store = os.path.join(disk, "share.sqlite")
            p = mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--threads", "1", "--quiet"],
                          check=False)
            if p.returncode == 0:
                alone = os.path.join(tmp, "alone.sqlite")
                shutil.copy(store, alone)
                check = storecheck.integrity(alone)
                db = sqlite3.connect(alone)
                held = sorted(r[0] for r in db.execute("SELECT path FROM files"))
                db.close()
                os.remove(alone)
                mtest.check(check == "ok" and held == plays and not os.path.exists(store + "-wal"),
                            "%d KiB, exit 0: the store alone says %r and holds %d of %d plays"
                            % (size_kib, check, len(held), len(plays)))
                outcomes.append("whole")
            else:
                # (a full disk said as such, with what to do, never as a piece of the SQL written)
                mtest.check(p.returncode == 5 and "disk is full" in p.stderr and "run the command again" in p.stderr
                            and "INSERT" not in p.stderr and "COMMIT" not in p.stderr,
                            "%d KiB: exit %d, %s" % (size_kib, p.returncode, p.stderr))
                if "could not be copied into it" in p.stderr:
                    mtest.check("keep the two files together" in p.stderr, "%d KiB: %s" % (size_kib, p.stderr))
                    outcomes.append("log kept")
                else:
                    outcomes.append("full while reading")
        finally:
            subprocess.run(["umount", disk])
    print("outcomes by size:", outcomes)
    mtest.check("whole" in outcomes, "no size was large enough for the archive: %r" % outcomes)

    # merge into a new store on the small disk
    shard = os.path.join(tmp, "shard.sqlite")
    mtest.run(["batch", archive, "--store", shard, "--unit", "speaker", "--quiet"])
    merge_outcomes = []
    for size_kib in range(1024, 4097, 256):
        subprocess.run(["mount", "-t", "tmpfs", "-o", "size=%dk" % size_kib, "tmpfs", disk], check=True)
        try:
            out = os.path.join(disk, "merged.sqlite")
            p = mtest.run(["merge", out, shard], check=False)
            if p.returncode == 0:
                merge_outcomes.append("whole")
            elif "could not be copied into it" in p.stderr:
                # Committed: the two files together hold the merge.
                both = os.path.exists(out) and os.path.exists(out + "-wal")
                held = []
                if both:  # read as copies on a disk with room (SQLite adds a file beside them)
                    together = os.path.join(tmp, "together.sqlite")
                    shutil.copy(out, together)
                    shutil.copy(out + "-wal", together + "-wal")
                    held = sorted(r[0] for r in storecheck.rows(together, "SELECT path FROM files"))
                    for name in os.listdir(tmp):
                        if name.startswith("together.sqlite"):
                            os.remove(os.path.join(tmp, name))
                mtest.check(p.returncode == 5 and "keep the two files together" in p.stderr and both and held == plays,
                            "merge, %d KiB: exit %d, store and log there: %r, %d of %d plays held; %s"
                            % (size_kib, p.returncode, both, len(held), len(plays), p.stderr))
                merge_outcomes.append("log kept")
            else:
                mtest.check(p.returncode == 5 and "disk is full" in p.stderr and not os.path.exists(out),
                            "merge, %d KiB: exit %d, %s" % (size_kib, p.returncode, p.stderr))
                merge_outcomes.append("full before the commit")
        finally:
            subprocess.run(["umount", disk])
    print("merge outcomes by size:", merge_outcomes)

    # A store on a file system mounted read-only (mount -o remount,ro): said as such, not as
    # a missing permission, for the store and for a new one in that folder (exit 5).
    subprocess.run(["mount", "-t", "tmpfs", "-o", "size=8m", "tmpfs", disk], check=True)
    try:
        on_disk = os.path.join(disk, "kept.sqlite")
        mtest.run(["batch", archive, "--store", on_disk, "--unit", "speaker", "--quiet"])
        subprocess.run(["mount", "-o", "remount,ro", disk], check=True)
        for store, says in ((on_disk, "it is on a read-only file system"),
                            (os.path.join(disk, "new.sqlite"), "the folder %s is on a read-only file system" % disk)):
            p = mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"], check=False)
            mtest.check(p.returncode == 5 and says in p.stderr and "permission" not in p.stderr,
                        "a store on a read-only file system: exit %d, %s" % (p.returncode, p.stderr))
    finally:
        subprocess.run(["umount", disk])
    mtest.check("log kept" in merge_outcomes, "no size let the merge commit but not copy its log in: %r" % merge_outcomes)

mtest.done()
