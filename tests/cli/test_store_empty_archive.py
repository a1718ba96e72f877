"""Archive store: an input that holds no TEI file at all, where the store holds files from
it (an archive whose mount failed leaves an empty mount point), is refused with exit 4
and the store kept byte for byte (SHA-256 by Python's hashlib, storecheck.sha256_of): the run removed every stored
file, and a job array's merge then emptied the merged store too. The files back in place,
the next run reads none of them again (its report: each is unchanged or hashed and known)
and the files table (read with Python's sqlite3) holds what os.walk finds. A
--folder removed from the archive is still taken at its word: its files are removed (the
files table against os.walk). The empty folder given in another spelling than the
stored paths' is refused alike. A --shard whose last file was deleted, under an input that holds
other files, loses that file (it was refused as an archive not mounted).
"""
import hashlib
import os
import shutil
import sqlite3
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402

tmp = mtest.scratch_folder("manicule-empty-archive-")
archive = os.path.join(tmp, "archive")
os.makedirs(os.path.join(archive, "sea"))
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), archive)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), os.path.join(archive, "sea"))
store = os.path.join(tmp, "archive.sqlite")
common = ["--store", store, "--unit", "letter", "--quiet"]
mtest.run(["batch", archive] + common)



def stored(path):
    db = sqlite3.connect(path)
    try:
        return sorted(r[0] for r in db.execute("SELECT path FROM files"))
    finally:
        db.close()


on_disk = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names)
away = os.path.join(tmp, "away")
shutil.move(archive, away)
os.makedirs(archive)  # the empty mount point
before = storecheck.sha256_of(store)
p = mtest.run(["batch", archive] + common, check=False)
mtest.check(p.returncode == 4 and "is the archive mounted?" in p.stderr and "holds 2 file(s)" in p.stderr
            and storecheck.sha256_of(store) == before, "an empty archive folder: exit %d, %s" % (p.returncode, p.stderr))
# The same archive given in another spelling (the store holds absolute paths): refused alike.
# The guard compared the spelling as given, and the run emptied the store.
for spelling in ("archive", "./archive", "archive/"):
    p = mtest.run(["batch", spelling] + common, check=False, cwd=tmp)
    mtest.check(p.returncode == 4 and "is the archive mounted?" in p.stderr and storecheck.sha256_of(store) == before,
                "an empty archive folder spelled %s: exit %d, %s" % (spelling, p.returncode, p.stderr))
os.rmdir(archive)
shutil.move(away, archive)
p = mtest.run(["batch", archive] + common)
paths = stored(store)
mtest.check(paths == on_disk and "2 file(s): 0 read," in p.stdout,
            "back in place: %r, %s" % (paths, p.stdout))

# Two inputs, one of them emptied (its mount failed, the other fine): refused the same way,
# naming the empty one; the store as it was.
second = os.path.join(tmp, "second")
os.makedirs(second)
shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-play.xml"), second)
two = os.path.join(tmp, "two.sqlite")
mtest.run(["batch", archive, second, "--store", two, "--unit", "letter", "--quiet"])
kept = os.path.join(tmp, "kept")
shutil.move(second, kept)
os.makedirs(second)
before = storecheck.sha256_of(two)
p = mtest.run(["batch", archive, second, "--store", two, "--unit", "letter", "--quiet"], check=False)
mtest.check(p.returncode == 4 and "found under %s, where the store holds 1 file(s)" % second in p.stderr
            and storecheck.sha256_of(two) == before, "one of two inputs empty: exit %d, %s" % (p.returncode, p.stderr))

# A sub-folder removed, named by --folder: its file goes from the store.
shutil.rmtree(os.path.join(archive, "sea"))
p = mtest.run(["batch", archive, "--folder", "sea"] + common)
paths = stored(store)
left = sorted(os.path.join(d, n) for d, _, names in os.walk(archive) for n in names)
mtest.check(paths == left, "after removing the folder sea: the store holds %r, os.walk finds %r" % (paths, left))

# A share whose last file was deleted, under an input that still holds other shares' files,
# is no archive missing: the file goes from the share's store. Which file lies in which
# share is worked out here by the documented rule, 1 + (first 8 bytes of SHA-256 of the
# path below the input, big-endian) mod N, with hashlib.
shared = os.path.join(tmp, "shared")
os.makedirs(shared)
share_of = {}
for i in range(12):
    name = "letters-%02d.xml" % i
    shutil.copy(os.path.join(mtest.ROOT, "examples", "ferry-letters.xml"), os.path.join(shared, name))
    share_of[name] = 1 + int(hashlib.sha256(name.encode()).hexdigest()[:16], 16) % 12
alone = sorted(n for n in share_of if list(share_of.values()).count(share_of[n]) == 1)
mtest.check(alone and len(set(share_of.values())) < 12, "no share of 12 holds exactly one of the files: %r" % share_of)
lonely = alone[0]
share = "%d/12" % share_of[lonely]
share_store = os.path.join(tmp, "share.sqlite")
mtest.run(["batch", shared, "--store", share_store, "--unit", "letter", "--quiet", "--shard", share])
mtest.check(stored(share_store) == [os.path.join(shared, lonely)], "share %s holds %r" % (share, stored(share_store)))
os.remove(os.path.join(shared, lonely))
p = mtest.run(["batch", shared, "--store", share_store, "--unit", "letter", "--quiet", "--shard", share], check=False)
mtest.check(p.returncode == 0 and stored(share_store) == [],
            "the share's last file deleted, 11 others left: exit %d, store holds %r, %s"
            % (p.returncode, stored(share_store), p.stderr))

mtest.done()
