"""One archive batched under several spellings of its folder (archive, ./archive, its
absolute path, as a curator does from another working directory or a script) stays one
archive in the store: the latest spelling replaces the earlier rows of the same files, and
no content is read again; a file deleted meanwhile leaves the store whatever the spelling;
and a store that already holds a file twice so is analysed with the file once; several
spellings in one run store and read each file once. Before, each spelling added its own rows, so the store held every
file two or three times and an analysis found each segment nearest to its own copy, at
distance 0.

Outside references: os.path.samefile (the system's own identity of two paths: device and
inode) says no two stored rows name one file; os.path.join of the spelling and the names
os.listdir finds gives the paths stored (docs/store.md, "Tables": the latest spelling
replaces the row); hashlib gives each file's SHA-256; lxml and re give the letters the
analysis must measure, once each, with their words (tests/pylib/reading_text.py).
"""
import itertools
import os
import re
import shutil
import sqlite3
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from reading_text import letter_words  # noqa: E402

MIN_TOKENS = 200
NEIGHBOURS = 5  # batch --help and docs/store.md: --neighbours, 5 by default


def analysis_of(store, run):
    """{segment: (path, sha256, tokens)} of analysis run `run`, its neighbours per segment and
    how many lie at distance 0 (Python's sqlite3)."""
    db = sqlite3.connect(store)
    segments = {r[0]: r[1:] for r in db.execute(
        "SELECT segment, path, sha256, tokens FROM analysis_segments WHERE run_id = ?", (run,))}
    per_segment = dict(db.execute("SELECT segment, count(*) FROM neighbours WHERE run_id = ? GROUP BY segment", (run,)))
    zero = db.execute("SELECT count(*) FROM neighbours WHERE run_id = ? AND distance = 0", (run,)).fetchone()[0]
    db.close()
    return segments, per_segment, zero


def check_analysis(store, run, letters, where, cwd, what, whole_path=False):
    """The analysis (of a run from the folder `cwd`) measures each letter of `letters`
    ("stem#id": words, lxml) with at least MIN_TOKENS words once, with as many words, from
    the file at `where` (os.path.samefile, hashlib), each with NEIGHBOURS neighbours, none at
    distance 0. Segment ids begin with the
    file's stem or, with `whole_path`, its stored path without ".xml" (docs/store.md: for
    stored files of one name that no shorter end of their path tells apart)."""
    segments, per_segment, zero = analysis_of(store, run)
    by_letter = {sid.split("#", 1)[1]: row for sid, row in segments.items()}
    # reference: lxml and re (reading_text.letter_words)
    want = {sid.split("#", 1)[1]: len(words) for sid, words in letters.items() if len(words) >= MIN_TOKENS}
    mtest.check(len(want) >= 2 and len(by_letter) == len(segments) and {lid: row[2] for lid, row in by_letter.items()} == want,
                "%s: the analysis measured %r, lxml gives %r" % (what, sorted(segments.items()), sorted(want.items())))
    # reference: os.path (splitext, basename) for the ids, os.path.samefile and hashlib for the file
    prefix = (lambda path: os.path.splitext(path)[0]) if whole_path else (
        lambda path: os.path.splitext(os.path.basename(path))[0])
    mtest.check(all(sid == prefix(row[0]) + "#" + sid.split("#", 1)[1] for sid, row in segments.items()),
                "%s: segment ids %r" % (what, sorted(segments)))
    digest = storecheck.sha256_of(where)
    mtest.check(all(os.path.samefile(os.path.join(cwd, path), where) and sha == digest
                    for path, sha, _ in segments.values()),
                "%s: analysed paths and contents %r, the file is %s (sha256 %s)"
                % (what, sorted({row[:2] for row in segments.values()}), where, digest))
    # reference: batch --help's default of 5 neighbours, and lxml's letters
    mtest.check(per_segment == {sid: min(NEIGHBOURS, len(want) - 1) for sid in segments} and zero == 0,
                "%s: neighbours per segment %r, %d at distance 0" % (what, per_segment, zero))


def example_archive(tmp):
    """tmp/archive holding the two example files."""
    archive = os.path.join(tmp, "archive")
    os.makedirs(archive)
    for name in ("ferry-letters.xml", "ferry-play.xml"):
        shutil.copy(os.path.join(mtest.ROOT, "examples", name), archive)
    return archive


with tempfile.TemporaryDirectory() as tmp:
    archive = example_archive(tmp)
    names = sorted(os.listdir(archive))
    on_disk = len(names)
    letters = letter_words(os.path.join(archive, "ferry-letters.xml"))  # the play holds no letter
    store = os.path.join(tmp, "archive.sqlite")

    def batch(spelling):
        """Runs batch --analyse on `spelling`; returns (the process, the stored paths, the
        files it read); checks the stored rows and the analysis it reports."""
        proc = subprocess.run([os.path.abspath(mtest.BIN), "batch", spelling, "--store", store, "--unit", "letter",
                               "--min-tokens", str(MIN_TOKENS), "--analyse"], capture_output=True, text=True, cwd=tmp)
        mtest.check(proc.returncode == 0, "batch %s: exit %d, %s" % (spelling, proc.returncode, proc.stderr))
        db = sqlite3.connect(store)
        rows = sorted(db.execute("SELECT path, sha256 FROM files"))
        read = db.execute("SELECT files_read FROM runs WHERE kind = 'batch' ORDER BY run_id DESC LIMIT 1"
                          ).fetchone()[0]
        db.close()
        paths = [path for path, _ in rows]
        # reference: os.path.join and os.listdir; the rows are under this run's spelling
        mtest.check(paths == sorted(os.path.join(spelling, name) for name in names),
                    "after %s the store holds %r, os.path.join of the spelling and os.listdir %r"
                    % (spelling, paths, sorted(os.path.join(spelling, name) for name in names)))
        # reference: hashlib
        mtest.check(all(sha == storecheck.sha256_of(os.path.join(tmp, path)) for path, sha in rows),
                    "after %s stored SHA-256s %r differ from hashlib's" % (spelling, rows))
        # The analysis the run reports, a new one or one stored before for the same question.
        run = int(re.search(r"analysis run (\d+)", proc.stdout).group(1))
        check_analysis(store, run, letters, os.path.join(archive, "ferry-letters.xml"), tmp, "after " + spelling)
        return proc, paths, read

    proc, paths, read = batch("archive")
    mtest.check(read == on_disk, "first run: read %d, stored %r" % (read, paths))
    for spelling in ("./archive", archive, "archive/"):
        proc, paths, read = batch(spelling)
        same = [(a, b) for a, b in itertools.combinations(paths, 2) if os.path.samefile(os.path.join(tmp, a),
                                                                                          os.path.join(tmp, b))]
        mtest.check(not same, "after %s two rows name one file: %r" % (spelling, same))
        mtest.check(read == 0, "after %s %d file(s) were read again" % (spelling, read))
    # A run under a new spelling says so in its report.
    proc, _, _ = batch("./archive")
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
    proc = subprocess.run([os.path.abspath(mtest.BIN), "analyse-store", "--store", store, "--min-tokens",
                           str(MIN_TOKENS), "--recompute"], capture_output=True, text=True, cwd=tmp)
    mtest.check(proc.returncode == 0,
                "an analysis over a file stored twice: exit %d, %s" % (proc.returncode, proc.stderr))
    check_analysis(store, storecheck.last_run(store, "analysis")["run_id"], letters,
                   os.path.join(archive, "ferry-letters.xml"), tmp, "an analysis over a file stored twice",
                   whole_path=True)

# A file deleted between two runs that spell the folder differently (`archive`, then
# `./archive`) leaves the store all the same, and the analysis with it. Before, the gone
# file's row was kept, as its path did not begin with the new spelling, and the next
# analysis still measured the deleted file. What is on disk is what os.path.exists says.
with tempfile.TemporaryDirectory() as tmp:
    archive = example_archive(tmp)
    store = os.path.join(tmp, "archive.sqlite")

    def run_batch(spelling):
        return subprocess.run([os.path.abspath(mtest.BIN), "batch", spelling, "--store", store, "--unit", "letter",
                               "--min-tokens", "200", "--analyse"], capture_output=True, text=True, cwd=tmp)

    first = run_batch("archive")
    os.remove(os.path.join(archive, "ferry-play.xml"))
    proc = run_batch("./archive")
    stored = sorted(r[0] for r in storecheck.rows(store, "SELECT path FROM files"))
    analysed = {r[1] for r in storecheck.latest_analysis(store)[1]["segments"]}
    mtest.check(first.returncode == 0 and proc.returncode == 0, "the two runs: exit %d and %d, %s"
                % (first.returncode, proc.returncode, proc.stderr))
    gone = [p for p in stored + sorted(analysed) if not os.path.exists(os.path.join(tmp, p))]
    # reference: os.path.exists, and os.path.join of the new spelling and os.listdir
    mtest.check(not gone and stored == sorted(os.path.join("./archive", name) for name in os.listdir(archive))
                and analysed == {"./archive/ferry-letters.xml"},
                "after deleting a file and respelling the folder the store holds %r, the analysis %r; gone from "
                "disk: %r; os.listdir: %r" % (stored, sorted(analysed), gone, os.listdir(archive)))
    mtest.check("1 no longer found" in proc.stdout, "the report names the file gone: " + proc.stdout)

# Several spellings of one folder in ONE run (archive, ./archive, archive/../archive): each
# file is stored and read once, under the spelling given first, and a note says so (a
# review found each stored once per spelling, read as many times). os.listdir gives the files.
with tempfile.TemporaryDirectory() as tmp:
    archive = example_archive(tmp)
    store = os.path.join(tmp, "once.sqlite")
    proc = subprocess.run([os.path.abspath(mtest.BIN), "batch", "archive", "./archive", "archive/../archive", "--store",
                           store, "--unit", "letter", "--quiet"], capture_output=True, text=True, cwd=tmp)
    stored = sorted(r[0] for r in storecheck.rows(store, "SELECT path FROM files"))
    files = sorted(os.listdir(archive))
    mtest.check(proc.returncode == 0 and stored == [os.path.join("archive", n) for n in files]
                and "2 file(s): 2 read" in proc.stdout,
                "three spellings in one run: exit %d, stored %r, %s" % (proc.returncode, stored, proc.stdout))
    mtest.check("the inputs reach %d file(s) a second time" % (2 * len(files)) in proc.stderr,
                "the note of files reached twice: %r" % proc.stderr)

mtest.done()
