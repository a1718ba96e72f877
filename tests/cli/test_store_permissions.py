"""A store the user may not write is refused up front, naming why, and left as it was.

SQLite opens a file it may not write read-only without a word, and the first write then
failed as "disk I/O error" or "attempt to write a readonly database". Two cases, each for
batch, analyse-store and merge (which writes runs and results into the store, or reads a
shard): the store file itself is read-only (chmod 0444); the file may be written but its
folder allows no new file, where SQLite must create its log (FILE-wal, SQLite's WAL
documentation), also when the store is named through a link from a folder that does. Each must exit 5 (cannot write) with a message naming the store and the
cause, and leave the store's bytes unchanged (hashlib). The premise is checked with
coreutils' test -w and test -w on the folder, run as the same user (tests/pylib/as_nobody.py).
"""
import hashlib
import os
import shutil
import stat
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
import as_nobody  # noqa: E402
import storecheck  # noqa: E402

WRITABLE = stat.S_IRUSR | stat.S_IWUSR | stat.S_IRGRP | stat.S_IWGRP | stat.S_IROTH | stat.S_IWOTH  # 0666


def digest(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


tmp = tempfile.mkdtemp(prefix="manicule-permissions-")
try:
    manicule = as_nobody.runner(tmp)
    archive = os.path.join(tmp, "plays")
    storecheck.copy_plays(storecheck.pick_plays(3), archive)
    for root, folders, files in os.walk(archive):
        os.chmod(root, as_nobody.OPEN)
        for name in files:
            os.chmod(os.path.join(root, name), 0o644)
    original = os.path.join(tmp, "original.sqlite")
    mtest.run(["batch", archive, "--store", original, "--unit", "speaker", "--quiet"])

    # The store read-only, in a folder the user may write.
    open_folder = os.path.join(tmp, "open")
    os.makedirs(open_folder)
    os.chmod(open_folder, stat.S_IRWXU | stat.S_IRWXG | stat.S_IRWXO)
    read_only = os.path.join(open_folder, "read-only.sqlite")
    shutil.copy(original, read_only)
    os.chmod(read_only, 0o444)
    # A writable store in a folder that allows no new file.
    closed_folder = os.path.join(tmp, "closed")
    os.makedirs(closed_folder)
    in_closed = os.path.join(closed_folder, "archive.sqlite")
    shutil.copy(original, in_closed)
    os.chmod(in_closed, WRITABLE)
    os.chmod(closed_folder, 0o555)  # no new file, for the owner too
    # A link to that store from a folder that allows new files: SQLite follows it and
    # writes its log beside the file it leads to.
    linked = os.path.join(open_folder, "linked.sqlite")
    os.symlink(in_closed, linked)

    mtest.check(manicule("test", "-w", read_only, command=False).returncode != 0,
                "the user may write the read-only store: the test means nothing")
    mtest.check(manicule("test", "-w", in_closed, command=False).returncode == 0
                and manicule("test", "-w", closed_folder, command=False).returncode != 0,
                "the store in the closed folder is not writable, or its folder is")

    merged = os.path.join(open_folder, "merged.sqlite")
    closed_cause = "archive.sqlite-wal) beside the store, and the folder %s allows no new file" % closed_folder
    for store, cause in ((read_only, "no permission to write it"), (in_closed, closed_cause), (linked, closed_cause)):
        before = digest(store)
        for args in (["batch", archive, "--store", store, "--unit", "speaker", "--quiet"],
                     ["analyse-store", "--store", store, "--min-tokens", "200"],
                     ["merge", merged, store]):
            p = manicule(*args)
            mtest.check(p.returncode == 5 and ("cannot write the store " + store) in p.stderr and cause in p.stderr,
                        "%s on %s: exit %d, %s" % (args[0], os.path.basename(store), p.returncode, p.stderr))
            mtest.check(digest(store) == before and not os.path.exists(store + "-wal"),
                        "%s changed %s or left a log beside it" % (args[0], store))
        mtest.check(not os.path.exists(merged), "merge left a new store behind after its input failed")
finally:
    for root, folders, files in os.walk(tmp):
        os.chmod(root, stat.S_IRWXU)
    shutil.rmtree(tmp)

mtest.done()
