"""Archive store: what a re-run reads, failing files, vanished files, two runs at once.

12 plays (some runs also with one reading thread, which reads on the calling thread, the
largest file first). A re-run over the unchanged archive opens no file and writes nothing (the
store's bytes by hashlib, its time and its runs table as they were); after one play's text is
changed, exactly that play is read again (the runs table counts, --verbose names it);
a play only touched (new time, same bytes) is hashed and not parsed; a malformed file is
recorded with its error, the run goes on and exits 1, also on the next run (which does
not read it again); a deleted file leaves the files table. A store held by another
connection is refused with exit code 5 and a clear message; two batch runs started at
once either both finish or the second refuses, and the store ends as a clean run's.
analyse-store --list-settings counts the files read under each settings as os.walk finds
them (not the contents stored, which an edit makes one more) and tells counts this version
reuses from those keyed otherwise (another version's).
Outside references: Python's hashlib for SHA-256, lxml for the malformed file being
malformed, SQLite's own exclusive lock held through Python's sqlite3 module, os.path.relpath
for the paths relative to the folder named.
"""
import os
import re
import shutil
import subprocess
import sys
import tempfile
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "pylib"))
import mtest  # noqa: E402
import storecheck  # noqa: E402
from lxml import etree  # noqa: E402


def batch(store, archive, expect=0, threads=None):
    # threads "1": files are read on the calling thread, not by workers (another code path,
    # held to the same expectations).
    extra = ["--threads", threads] if threads else []
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--verbose", "--quiet"] + extra,
                     check=False)
    mtest.check(proc.returncode == expect, "batch exited %d, expected %d: %s" % (proc.returncode, expect, proc.stderr[-800:]))
    named = [line.split(": ", 1)[1] for line in proc.stderr.splitlines() if line.startswith(("read: ", "failed: "))]
    return storecheck.last_run(store), named, proc


def unchanged_rerun(store, archive, files, failing, expect=0, threads=None):
    """A re-run with nothing to do: no file opened, nothing written (docs/store.md), and the
    summary says so. Returns the run's stderr."""
    before = (storecheck.sha256_of(store), os.stat(store).st_mtime_ns)
    last_before = storecheck.last_run(store)
    last_after, named, proc = batch(store, archive, expect=expect, threads=threads)
    mtest.check(last_after == last_before, "a re-run with nothing to do recorded a run: %r" % last_after)
    mtest.check(named == [], "a re-run with nothing to do opened %r" % named)
    after = (storecheck.sha256_of(store), os.stat(store).st_mtime_ns)
    mtest.check(after == before, "a re-run with nothing to do changed the store (SHA-256, time) from %r to %r: %s"
                % (before, after, proc.stdout))
    mtest.check(not os.path.exists(store + "-wal"), "a re-run with nothing to do left its log behind")
    expected = "nothing changed: %d file(s) as stored, %d failing; no batch run recorded" % (files, failing)
    mtest.check(expected in proc.stdout, "the summary of a re-run with nothing to do: %r" % proc.stdout)
    return proc.stderr


with tempfile.TemporaryDirectory() as tmp:
    archive = os.path.join(tmp, "archive")
    paths = storecheck.copy_plays(storecheck.pick_plays(12), archive)
    store = os.path.join(tmp, "s.sqlite")

    run, named, _ = batch(store, archive)
    mtest.check(run["files_read"] == 12 and len(named) == 12, "first run read %d files" % run["files_read"])

    # On one thread the files are read in the order the readers are given them: largest
    # first (sizes from os.path.getsize, ties in path order), so that with more threads
    # none is left reading a long file alone at the end.
    _, one_thread, _ = batch(os.path.join(tmp, "one-thread.sqlite"), archive, threads="1")
    by_size = sorted(sorted(paths), key=lambda p: -os.path.getsize(p))
    mtest.check([os.path.basename(p) for p in one_thread] == [os.path.basename(p) for p in by_size],
                "one thread read in the order %r, expected largest first %r" % (one_thread, by_size))

    unchanged_rerun(store, archive, files=12, failing=0)

    # Change one play's text: a word more in its first paragraph; keep its time as it was.
    changed = paths[3]
    stat = os.stat(changed)
    with open(changed, encoding="utf-8") as f:
        text = f.read()
    body = text.index("<body")
    cut = text.index("<p>", body) + 3
    with open(changed, "w", encoding="utf-8") as f:
        f.write(text[:cut] + "Zusatzwort " + text[cut:])
    os.utime(changed, ns=(stat.st_atime_ns, stat.st_mtime_ns + 1000))
    run, named, _ = batch(store, archive)
    mtest.check(run["files_read"] == 1 and named == [changed],
                "after changing one play: read %d, named %r" % (run["files_read"], named))
    files = {r[0]: r for r in storecheck.logical_tables(store)["files"]}
    mtest.check(files[changed][4] == storecheck.sha256_of(changed), "stored SHA-256 of the changed play (hashlib)")

    # Touch another: same bytes, new time -> hashed, not parsed; with reading workers and
    # with one thread. The new time lies ten seconds back, so that the touched file is not
    # racily clean (docs/store.md) and hashed again by the following run.
    for touched, threads in ((paths[7], None), (paths[8], "1")):
        back = time.time() - 10
        os.utime(touched, (back, back))
        run, named, _ = batch(store, archive, threads=threads)
        mtest.check(run["files_read"] == 0 and run["files_hashed"] == 1 and named == [],
                    "after touching one play (threads %s): read %d, hashed %d"
                    % (threads, run["files_read"], run["files_hashed"]))

    # Racily clean (the reasoning behind git's index, racy-git.txt): a file written just
    # before a run, then changed again to the same size and given back the same time, must
    # not pass for unchanged. Its time was not trusted by the run after the first write.
    racy = paths[5]
    with open(racy, "rb") as f:
        data = f.read()
    with open(racy, "wb") as f:
        f.write(data)  # same bytes, new time: hashed, not parsed
    first_write = os.stat(racy)
    run, named, _ = batch(store, archive)
    mtest.check(run["files_read"] == 0 and named == [], "after rewriting one play unchanged: read %d" % run["files_read"])
    at = re.compile(rb">[A-Za-z]").search(data, data.index(b"<body")).start() + 1  # a letter of the text
    swapped = data[:at] + (b"X" if data[at:at + 1] != b"X" else b"Y") + data[at + 1:]
    with open(racy, "wb") as f:
        f.write(swapped)
    os.utime(racy, ns=(first_write.st_atime_ns, first_write.st_mtime_ns))
    mtest.check(os.stat(racy).st_size == first_write.st_size, "the second write changed the size")
    run, named, _ = batch(store, archive)
    mtest.check(run["files_read"] == 1 and named == [racy],
                "a play changed twice within one time stamp: read %d, named %r" % (run["files_read"], named))
    back = time.time() - 10  # no longer racily clean: hashed by the next run, then trusted by its time
    os.utime(racy, (back, back))

    # A malformed file: recorded, the run goes on, exit code 1; the next run still says so
    # without reading it again.
    broken = os.path.join(archive, "zz-broken.xml")
    with open(paths[0], encoding="utf-8") as f:
        text = f.read()
    with open(broken, "w", encoding="utf-8") as f:
        f.write(text[: len(text) // 2])
    back = time.time() - 10  # not racily clean, so that the next run has nothing to do
    os.utime(broken, (back, back))
    try:
        etree.parse(broken)
        mtest.fail("lxml parsed the truncated file")
    except etree.XMLSyntaxError:
        pass
    run, named, proc = batch(store, archive, expect=1)
    mtest.check(run["files_read"] == 1 and run["files_failed"] == 1 and named == [broken],
                "with a broken file: read %d, failed %d, named %r" % (run["files_read"], run["files_failed"], named))
    mtest.check("zz-broken.xml" in proc.stderr, "the failure is not named on stderr")
    db = storecheck.connect(store)
    status, error = db.execute("SELECT status, error FROM file_list WHERE path = ?", (broken,)).fetchone()
    db.close()
    mtest.check(status == "failed" and "zz-broken.xml" in error, "file_list says %r %r" % (status, error))
    err = unchanged_rerun(store, archive, files=13, failing=1, expect=1, threads="1")
    mtest.check("zz-broken.xml" in err, "the re-run with the broken file does not name it on stderr: %r" % err)

    # A deleted file leaves the files table.
    os.remove(broken)
    run, named, _ = batch(store, archive)
    paths_stored = {r[0] for r in storecheck.logical_tables(store)["files"]}
    mtest.check(broken not in paths_stored and len(paths_stored) == 12, "files after deleting: %d" % len(paths_stored))

    # Another connection holds the store: refused at once, exit code 5, a clear message.
    holder = storecheck.connect(store)
    holder.execute("PRAGMA locking_mode = EXCLUSIVE")
    holder.execute("BEGIN EXCLUSIVE")
    proc = mtest.run(["batch", archive, "--store", store, "--unit", "speaker", "--quiet"], check=False)
    holder.rollback()
    holder.close()
    mtest.check(proc.returncode == 5 and "in use by another program" in proc.stderr,
                "a held store: exit %d, %s" % (proc.returncode, proc.stderr))

    # Two runs at once on a fresh store: each finishes or refuses cleanly.
    fresh = os.path.join(tmp, "fresh.sqlite")
    clean = os.path.join(tmp, "clean.sqlite")
    args = ["batch", archive, "--unit", "speaker", "--quiet", "--store", fresh]
    first = subprocess.Popen([mtest.BIN] + args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    second = subprocess.Popen([mtest.BIN] + args, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    outcomes = []
    for proc in (first, second):
        err = proc.communicate()[1]
        outcomes.append(proc.returncode)
        mtest.check(proc.returncode == 0 or (proc.returncode == 5 and "in use" in err),
                    "a run beside another exited %d: %s" % (proc.returncode, err))
    mtest.check(0 in outcomes, "neither of two runs at once finished: %r" % outcomes)
    mtest.run(["batch", archive, "--unit", "speaker", "--quiet", "--store", fresh])
    mtest.run(["batch", archive, "--unit", "speaker", "--quiet", "--store", clean])
    a, b = storecheck.logical_tables(fresh), storecheck.logical_tables(clean)
    mtest.check(a == b, "two runs at once left another store than a clean run: " + storecheck.diff_summary(a, b))

    # Relative paths (what shards and --folder go by) are those os.path.relpath gives,
    # however the folder is spelled on the command line (with a trailing slash, a "."
    # inside, or a path relative to the working folder that climbs with "..").
    nested = os.path.join(tmp, "nested")
    storecheck.copy_plays(storecheck.pick_plays(3), nested, subfolder_every=2)
    spellings = [nested, nested + "/", os.path.join(tmp, ".", "nested"), os.path.relpath(nested)]
    for k, spelling in enumerate(spellings):
        spelled_store = os.path.join(tmp, "spelled%d.sqlite" % k)
        mtest.run(["batch", spelling, "--store", spelled_store, "--unit", "speaker", "--quiet"])
        rows = storecheck.logical_tables(spelled_store)["files"]
        mtest.check(len(rows) == 3, "folder spelled %r: %d files" % (spelling, len(rows)))
        for path, relative in ((r[0], r[1]) for r in rows):
            expected = os.path.relpath(path, spelling).replace(os.sep, "/")
            mtest.check(relative == expected, "folder spelled %r: %s stored as %r, os.path.relpath has %r"
                        % (spelling, path, relative, expected))

    # A --folder that names nothing on disk and nothing stored: exit 4 (README: nothing
    # selected), the folder named, and the store's bytes as they were (SHA-256): no run.
    folder_store = os.path.join(tmp, "folder.sqlite")
    mtest.run(["batch", nested, "--store", folder_store, "--unit", "speaker", "--quiet"])
    before = storecheck.sha256_of(folder_store)
    proc = mtest.run(["batch", nested, "--store", folder_store, "--unit", "speaker", "--quiet", "--folder",
                      "no-such-folder"], check=False)
    mtest.check(proc.returncode == 4 and "--folder no-such-folder" in proc.stderr,
                "a --folder naming nothing: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.check(storecheck.sha256_of(folder_store) == before, "a --folder naming nothing changed the store")
    never = os.path.join(tmp, "never-made.sqlite")
    proc = mtest.run(["batch", nested, "--store", never, "--unit", "speaker", "--quiet", "--folder", "no-such-folder"],
                     check=False)
    mtest.check(proc.returncode == 4 and not [n for n in os.listdir(tmp) if n.startswith("never-made")],
                "a --folder naming nothing left a new store behind: exit %d, %r" % (proc.returncode, os.listdir(tmp)))
    # A folder removed from the archive, with files stored from it: the run removes them (exit 0).
    sub = sorted(d for d in os.listdir(nested) if os.path.isdir(os.path.join(nested, d)))[0]
    in_sub = len([f for f in os.listdir(os.path.join(nested, sub)) if f.endswith(".xml")])
    moved = os.path.join(tmp, "moved-away")
    shutil.move(os.path.join(nested, sub), moved)
    proc = mtest.run(["batch", nested, "--store", folder_store, "--unit", "speaker", "--quiet", "--folder", sub],
                     check=False)
    rows = storecheck.logical_tables(folder_store)["files"]
    mtest.check(proc.returncode == 0 and in_sub > 0 and len(rows) == 3 - in_sub,
                "a removed folder's %d file(s) left the store: exit %d, %d rows" % (in_sub, proc.returncode, len(rows)))
    shutil.move(moved, os.path.join(nested, sub))

    # --list-settings: each settings the store holds, the files read under it (counted here
    # with SQL), and whether this manicule would reuse its counts. Counts keyed otherwise
    # (as by an earlier version: the key is rewritten here through sqlite3) are said to be
    # read again by batch, and the next batch does read every file again.
    listed = os.path.join(tmp, "listed.sqlite")
    option_sets = [["--unit", "speaker"],
                   ["--unit", "whole", "--preset", "diplomatic", "--keep", "note", "--no-fold", "--long-s"],
                   ["--unit", "speaker", "--joint-speech", "drop", "--features", "char-ngram", "--n", "3",
                    "--keep-numbers", "--drop", "quote"]]
    for options in option_sets:
        mtest.run(["batch", nested, "--store", listed, "--quiet"] + options)

    def settings_listing():
        lines = mtest.run(["analyse-store", "--store", listed, "--list-settings"]).stdout.splitlines()
        mtest.check(lines[0].split("\t")[:3] == ["settings", "files", "reader"], "listing header: %r" % lines[0])
        return {int(l.split("\t")[0]): l.split("\t") for l in lines[1:]}

    # One play edited after it was read, then read again under the first settings only: its
    # old content stays stored there too, but the archive holds three files (os.walk), whose
    # present contents the first settings hold all of and the others two of.
    on_disk = [os.path.join(d, f) for d, _, fs in os.walk(nested) for f in fs if f.endswith(".xml")]
    edited = sorted(on_disk)[0]
    with open(edited, "a", encoding="utf-8") as f:
        f.write("<!-- edited -->\n")
    mtest.run(["batch", nested, "--store", listed, "--quiet"] + option_sets[0])
    rows = settings_listing()
    expected = {1: len(on_disk), 2: len(on_disk) - 1, 3: len(on_disk) - 1}
    mtest.check(len(on_disk) == 3 and {i: int(r[1]) for i, r in rows.items()} == expected and
                all(r[2] == "this version" for r in rows.values()),
                "the listing of three settings over %d files: %r" % (len(on_disk), rows))
    db = storecheck.connect(listed)
    db.execute("UPDATE settings SET key = 'keyed by another version' WHERE settings_id = 2")
    db.commit()
    db.close()
    rows = settings_listing()
    mtest.check(rows[2][2].startswith("another version") and rows[1][2] == rows[3][2] == "this version",
                "after the key changed: %r" % rows)
    proc = mtest.run(["analyse-store", "--store", listed, "--settings", "2", "--min-tokens", "10"], check=False)
    mtest.check("settings 2 were read by another version of manicule" in proc.stderr,
                "analyse-store on another version's counts says nothing: %s" % proc.stderr)
    proc = mtest.run(["analyse-store", "--store", listed, "--settings", "1", "--min-tokens", "10"], check=False)
    mtest.check("another version" not in proc.stderr, "this version's counts said to be another's: %s" % proc.stderr)
    # Features the settings did not count: refused (usage), with the batch options that count
    # them, n included; followed as printed (after settings 1's own options), they work.
    asked = ["--features", "word-ngram", "--n", "2"]
    proc = mtest.run(["analyse-store", "--store", listed, "--settings", "1", "--min-tokens", "10"] + asked, check=False)
    advice = proc.stderr.split("count those asked with batch ")[-1].split(" (")[0].split()
    mtest.check(proc.returncode == 2 and advice == asked, "features not counted: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.run(["batch", nested, "--store", listed, "--quiet"] + option_sets[0] + advice)
    proc = mtest.run(["analyse-store", "--store", listed, "--min-tokens", "10"] + asked, check=False)
    mtest.check(proc.returncode == 0, "the advice followed, analyse-store: exit %d, %s" % (proc.returncode, proc.stderr))
    mtest.run(["batch", nested, "--store", listed, "--quiet"] + option_sets[1])
    run = storecheck.last_run(listed)
    mtest.check(run["files_read"] == 3, "the settings of another version were reused: %r" % run)

mtest.done()
