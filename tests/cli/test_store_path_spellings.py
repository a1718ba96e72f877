"""One archive batched under several spellings of its folder (archive, ./archive, its
absolute path, as a curator does from another working directory or a script) stays one
archive in the store: the latest spelling replaces the earlier rows of the same files, and
no content is read again; a file deleted meanwhile leaves the store whatever the spelling;
and a store that already holds a file twice so is analysed with the file once. Before, each spelling added its own rows, so the store held every
file two or three times and an analysis found each segment nearest to its own copy, at
distance 0.

Outside references: os.path.samefile (the system's own identity of two paths: device and
inode) says no two stored rows name one file, and os.walk counts the files.
"""
import itertools
import os
import shutil
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402

with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    for name in ("ferry-letters.xml", "ferry-play.xml"):
        shutil.copy(os.path.join(mtest.ROOT, "examples", name), archive)
    on_disk = sum(len([f for f in fs if f.endswith(".xml")]) for _, _, fs in os.walk(archive))
    store = os.path.join(tmp, "archive.sqlite")

    def batch(spelling):
        proc = subprocess.run([os.path.abspath(mtest.BIN), "batch", spelling, "--store", store, "--unit", "letter",
                               "--min-tokens", "200", "--analyse"], capture_output=True, text=True, cwd=tmp)
        mtest.check(proc.returncode == 0, "batch %s: exit %d, %s" % (spelling, proc.returncode, proc.stderr))
        db = sqlite3.connect(store)
        paths = [r[0] for r in db.execute("SELECT path FROM files ORDER BY path")]
        read = db.execute("SELECT files_read FROM runs WHERE kind = 'batch' ORDER BY run_id DESC LIMIT 1"
                          ).fetchone()[0]
        run = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
        zero = db.execute("SELECT count(*) FROM neighbours WHERE run_id = ? AND distance = 0", (run,)).fetchone()[0]
        db.close()
        return proc, paths, read, zero

    proc, paths, read, zero = batch("archive")
    mtest.check(read == on_disk and len(paths) == on_disk, "first run: read %d, stored %r" % (read, paths))
    for spelling in ("./archive", archive, "archive/"):
        proc, paths, read, zero = batch(spelling)
        mtest.check(len(paths) == on_disk, "after %s the store holds %r, %d files on disk" % (spelling, paths, on_disk))
        same = [(a, b) for a, b in itertools.combinations(paths, 2) if os.path.samefile(os.path.join(tmp, a),
                                                                                          os.path.join(tmp, b))]
        mtest.check(not same, "after %s two rows name one file: %r" % (spelling, same))
        mtest.check(read == 0, "after %s %d file(s) were read again" % (spelling, read))
        mtest.check(zero == 0, "after %s the analysis has %d neighbours at distance 0" % (spelling, zero))
    # A run under a new spelling says so in its report.
    proc, _, _, _ = batch("./archive")
    mtest.check("%d now under another spelling of their path" % on_disk in proc.stdout,
                "the report of a respelled run: " + proc.stdout)
    # ... and does not also say that the store now holds the files twice (it said both, for
    # files older than the run's two seconds of racy cleanness, made so here with os.utime).
    older = os.path.join(tmp, "older")
    shutil.copytree(archive, older)
    an_hour_ago = os.stat(older).st_mtime - 3600
    for name in os.listdir(older):
        os.utime(os.path.join(older, name), (an_hour_ago, an_hour_ago))
    older_store = os.path.join(tmp, "older.sqlite")
    for spelling in ("older", "./older"):
        proc = subprocess.run([os.path.abspath(mtest.BIN), "batch", spelling, "--store", older_store, "--unit",
                               "letter"], capture_output=True, text=True, cwd=tmp)
    mtest.check(proc.returncode == 0 and "%d now under another spelling of their path" % on_disk in proc.stdout
                and "twice" not in proc.stderr, "a respelled run of older files: exit %d, %s %s"
                % (proc.returncode, proc.stdout, proc.stderr))

    # A store that already holds one file under two spellings, as runs before this rule
    # left it (made here by copying a row with sqlite3): an analysis takes the file once.
    db = sqlite3.connect(store)
    db.execute("INSERT INTO files (path, relative_path, stem, size, mtime_ns, sha256, read_error) "
               "SELECT 'archive/' || relative_path, relative_path, stem, size, mtime_ns, sha256, read_error "
               "FROM files WHERE path LIKE './archive/%'")
    db.commit()
    rows = [r[0] for r in db.execute("SELECT path FROM files")]
    db.close()
    mtest.check(len(rows) == 2 * on_disk, "the copied rows: %r" % rows)
    proc = subprocess.run([os.path.abspath(mtest.BIN), "analyse-store", "--store", store, "--min-tokens", "200",
                           "--recompute"], capture_output=True, text=True, cwd=tmp)
    db = sqlite3.connect(store)
    run = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    zero = db.execute("SELECT count(*) FROM neighbours WHERE run_id = ? AND distance = 0", (run,)).fetchone()[0]
    files_in_analysis = db.execute("SELECT count(DISTINCT path) FROM analysis_segments WHERE run_id = ?",
                                   (run,)).fetchone()[0]
    db.close()
    mtest.check(proc.returncode == 0 and zero == 0 and files_in_analysis == 1,
                "an analysis over a file stored twice: exit %d, %d neighbours at distance 0, %d file(s) (%s)"
                % (proc.returncode, zero, files_in_analysis, proc.stderr))

# A file deleted between two runs that spell the folder differently (`archive`, then
# `./archive`) leaves the store all the same, and the analysis with it. Before, the gone
# file's row was kept, as its path did not begin with the new spelling, and the next
# analysis still measured the deleted file. What is on disk is what os.path.exists says.
with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    for name in ("ferry-letters.xml", "ferry-play.xml"):
        shutil.copy(os.path.join(mtest.ROOT, "examples", name), archive)
    store = os.path.join(tmp, "archive.sqlite")

    def run_batch(spelling):
        return subprocess.run([os.path.abspath(mtest.BIN), "batch", spelling, "--store", store, "--unit", "letter",
                               "--min-tokens", "200", "--analyse"], capture_output=True, text=True, cwd=tmp)

    first = run_batch("archive")
    os.remove(os.path.join(archive, "ferry-play.xml"))
    proc = run_batch("./archive")
    db = sqlite3.connect(store)
    stored = [r[0] for r in db.execute("SELECT path FROM files")]
    run = db.execute("SELECT max(run_id) FROM runs WHERE kind = 'analysis' AND status = 'done'").fetchone()[0]
    analysed = {r[0] for r in db.execute("SELECT DISTINCT path FROM analysis_segments WHERE run_id = ?", (run,))}
    db.close()
    mtest.check(first.returncode == 0 and proc.returncode == 0, "the two runs: exit %d and %d, %s"
                % (first.returncode, proc.returncode, proc.stderr))
    gone = [p for p in stored + sorted(analysed) if not os.path.exists(os.path.join(tmp, p))]
    mtest.check(not gone and len(stored) == 1, "after deleting a file and respelling the folder the store "
                "holds %r, the analysis %r; gone from disk: %r" % (stored, sorted(analysed), gone))
    mtest.check("1 no longer found" in proc.stdout, "the report names the file gone: " + proc.stdout)

mtest.done()
